/**
 * The `calc` cell kind: TypeScript over declared inputs, type-checked
 * against declarations of their shapes and run in a disposable child process
 * with no permissions, a heap cap and a time limit (kernel/sandbox). It
 * returns any data (inline values show its fields: `@(eol.value.cycle, 0)`)
 * or a table that fits, charts and comparisons read like any other.
 *
 * ```calc end-of-life
 * reads: power
 * ---
 * const { q0, a, b } = power.estimates;
 * return { cycle: Math.pow((q0 - 2000) / a, 1 / b) };
 * ```
 *
 * Options are described in `spec.ts`; the modules made from the code in
 * `program.ts`; the run in `run.ts`.
 *
 * @example
 * ```ts
 * import { calcKind } from "./mod.ts";
 * if (calcKind.kind !== "calc" || calcKind.body !== "code") throw new Error("unexpected");
 * ```
 *
 * @module
 */
import type { CellKind, TemplateContext } from "../../kernel/contract/mod.ts";
import { CALC_OPTIONS, type CalcSpec, parseCalcSpec } from "./spec.ts";
import { type CalcOutput, type CalcTableOutput, runCalc } from "./run.ts";
import { calcDetails, calcLine, type CalcResult, summarizeCalc } from "./result.ts";
import { cellsOf } from "../shared/template_cells.ts";
import { calcHistory } from "./history.ts";

export type { CalcInput, CalcSpec } from "./spec.ts";
export type { CalcOutput, CalcTableOutput } from "./run.ts";
export type { CalcResult } from "./result.ts";

/** The `calc` kind record. */
export const calcKind: CellKind<CalcSpec, CalcOutput | CalcTableOutput, CalcResult> = {
  kind: "calc",
  body: "code",
  output: "Value",
  outputOf: (spec) => spec.gives === "table" ? "Table" : "Value",
  description: "TypeScript over other cells' results, run in a sandbox; gives a value or a table",
  options: CALC_OPTIONS,
  parse: parseCalcSpec,
  inputs: (spec) =>
    spec.reads.map((r) => ({
      name: r.cell,
      accepts: [
        "Table",
        "Fit",
        "Comparison",
        "Diagnostics",
        "Predictions",
        "Value",
        "Ranked",
        "JointFit",
      ],
      path: ["reads"],
      offset: r.offset,
    })),
  // The sandbox process starts while the cell's inputs compute.
  ahead: (spec) => ({ sandboxMb: spec.memoryMb }),
  run: runCalc,
  summary: (out) => summarizeCalc(out),
  line: calcLine,
  details: calcDetails,
  columns: (r) => r.table?.columns.map(({ name, type, unit }) => ({ name, type, unit })) ?? [],
  template: calcTemplate,
  history: calcHistory,
};

/** A new calc: the last fit's estimates and R², read under a name code can use. */
function calcTemplate(ctx: TemplateContext): string {
  const fit = cellsOf(ctx, "Fit").at(-1);
  if (fit === undefined) {
    return "---\n// any TypeScript; `return` gives the cell's value\nreturn { answer: 6 * 7 };\n";
  }
  let as = fit.name.replace(/[^A-Za-z0-9_$]+/g, "_");
  if (!/^[A-Za-z_$]/.test(as)) as = `fit_${as}`;
  const reads = as === fit.name ? fit.name : `${fit.name} as ${as}`;
  return `reads: ${reads}\n---\n// ${as}.estimates holds the fitted parameters; ` +
    `${as}.evaluate({ … }) gives the model at a point\nreturn { ...${as}.estimates, r2: ${as}.r2 };\n`;
}
