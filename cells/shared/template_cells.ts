/**
 * What the kinds' add-cell templates look up in the document at hand: the
 * last cell of an output type, a table's number columns, the table a fit
 * reads and the columns its model names. Each kind's `template` builds a
 * body that runs at once on the document (tested in the browser on the demo).
 *
 * @module
 */
import type { OutputType, TemplateCell, TemplateContext } from "../../kernel/contract/mod.ts";

/**
 * The last cells with an output type, newest last.
 *
 * @param ctx The template context.
 * @param output The output type.
 * @returns The cells, in document order.
 * @example
 * ```ts
 * import { cellsOf } from "./template_cells.ts";
 * const ctx = { cells: [{ name: "t", kind: "table", output: "Table", inputs: [], columns: [], result: null }] } as const;
 * if (cellsOf(ctx, "Table")[0].name !== "t") throw new Error();
 * ```
 */
export function cellsOf(ctx: TemplateContext, output: OutputType): TemplateCell[] {
  return ctx.cells.filter((c) => c.output === output);
}

/** A name a model, a chart axis or a prediction point can write as it is (kernel/expr's identifiers). */
const PLAIN_NAME = /^[A-Za-z_][A-Za-z0-9_]*$/;

/**
 * The number columns a cell offers that a template can write as they are:
 * a column named `flow rate (L/min)` or `2nd_pass` is no expression name,
 * so a template never starts a cell from it (it would fail at once).
 *
 * @param cell The cell (a table), or undefined.
 * @returns Their names.
 * @example
 * ```ts
 * import { numberColumns } from "./template_cells.ts";
 * const col = (name: string, type: "number" | "text" = "number") => ({ name, type, unit: null });
 * const t = { name: "t", kind: "table", output: "Table" as const, inputs: [], result: null,
 *   columns: [col("flow rate (L/min)"), col("T_out"), col("2nd_pass"), col("label", "text")] };
 * if (numberColumns(t).join() !== "T_out") throw new Error(numberColumns(t).join());
 * ```
 */
export function numberColumns(cell: TemplateCell | undefined): string[] {
  return (cell?.columns ?? []).filter((c) => c.type === "number" && PLAIN_NAME.test(c.name))
    .map((c) => c.name);
}

/**
 * The table a new cell of a kind reading `need` number columns starts from:
 * the last table offering that many, else the last table offering most.
 *
 * @param ctx The template context.
 * @param need How many number columns the template writes.
 * @returns The table, or undefined when the document has none.
 */
export function tableFor(ctx: TemplateContext, need: number): TemplateCell | undefined {
  const tables = cellsOf(ctx, "Table");
  return tables.filter((t) => numberColumns(t).length >= need).at(-1) ??
    tables.reduce<TemplateCell | undefined>(
      (best, t) => numberColumns(t).length > numberColumns(best).length ? t : best,
      tables.at(-1),
    );
}

/**
 * The table a cell reads (its first input with output Table).
 *
 * @param ctx The template context.
 * @param cell The reading cell.
 * @returns The table cell, or undefined.
 */
export function tableOf(ctx: TemplateContext, cell: TemplateCell): TemplateCell | undefined {
  return ctx.cells.find((c) => c.output === "Table" && cell.inputs.includes(c.name));
}

/**
 * A fit's response and predictor columns, read from its last result and its table.
 *
 * @param ctx The template context.
 * @param fit The fit cell.
 * @returns The response text and the columns its model names besides the response.
 */
export function fitColumns(
  ctx: TemplateContext,
  fit: TemplateCell,
): { response: string | null; predictors: string[] } {
  const r = fit.result as { model?: unknown; response?: unknown } | null;
  const response = typeof r?.response === "string" ? r.response : null;
  const model = typeof r?.model === "string" ? r.model : "";
  const rhs = model.slice(model.indexOf("=") + 1);
  const words = new Set(rhs.match(/[A-Za-z_][A-Za-z0-9_]*/g) ?? []);
  const predictors = numberColumns(tableOf(ctx, fit)).filter((c) => words.has(c) && c !== response);
  return { response, predictors };
}
