/**
 * Running a calc cell: its inputs as data, a type check against
 * declarations of their shapes, then the code in a disposable child process
 * (kernel/sandbox through `RunContext.sandbox`); the answer becomes the
 * cell's value or a table other cells can read.
 *
 * ```
 *  inputs ─▶ inputData (tables as columns, fits as RUN-JSON + estimates + evaluate)
 *     │
 *     ├─▶ checkModule ─▶ sandbox.check ── errors ─▶ CellError at the code's line and column
 *     └─▶ runModule ──▶ sandbox.run ──── stopped ─▶ CellError in plain words
 *                            │
 *                            ▼  value ─▶ CalcOutput (Value) │ columns ─▶ CalcTableOutput (Table)
 * ```
 *
 * @module
 */
import type { CellOutput, NumberColumn, RunContext, Table } from "../../kernel/contract/mod.ts";
import { CellError } from "../../kernel/errors.ts";
import { formatBytes } from "../../kernel/format_bytes.ts";
import { decodeColumn, encodeData } from "../../kernel/sandbox/mod.ts";
import type { Diagnostic, IsolateAnswer } from "../../kernel/sandbox/mod.ts";
import type { Fit } from "../fit/mod.ts";
import type { CalcSpec } from "./spec.ts";
import { type CalcInputData, checkModule, runModule } from "./program.ts";

/** The most input data a calc cell takes (characters of its encoded JSON). */
export const INPUT_LIMIT = 256 * 2 ** 20;

/** What the code printed, kept with the result. */
export interface CalcConsole {
  console: string;
  /** Lines printed past the console limit (counted, not kept). */
  consoleCut: number;
  /** Time of the run in its process (ms). */
  runMs: number;
}

/** Output of a calc cell that gives a value. */
export interface CalcOutput extends CellOutput, CalcConsole {
  type: "Value";
  value: unknown;
}

/** Output of a calc cell that gives a table: a Table other kinds read as any. */
export interface CalcTableOutput extends Table, CalcConsole {
  rowsFiltered: number;
}

/** A Table's data as code sees it. */
function tableData(t: Table): unknown {
  const columns: Record<string, unknown> = {};
  const units: Record<string, string | null> = {};
  for (const c of t.columns) {
    Object.defineProperty(columns, c.name, { value: c.values, enumerable: true });
    Object.defineProperty(units, c.name, { value: c.unit, enumerable: true });
  }
  return { n: t.rows.length, columns, units, rows: Float64Array.from(t.rows) };
}

/** A result with its per-row fields as Float64Array and other typed arrays as arrays. */
function resultData(result: unknown, rows: readonly string[]): unknown {
  if (result === null || typeof result !== "object" || Array.isArray(result)) return result;
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(result)) {
    let d = v;
    if (rows.includes(k) && (Array.isArray(v) || ArrayBuffer.isView(v))) {
      d = Float64Array.from(v as ArrayLike<number>, (x) => x ?? NaN);
    } else if (ArrayBuffer.isView(v)) d = Array.from(v as unknown as ArrayLike<number>);
    Object.defineProperty(out, k, { value: d, enumerable: true });
  }
  return out;
}

/**
 * Each input as the code sees it.
 *
 * @param spec The cell's spec.
 * @param ctx The run context (inputs, and their results through `summaryOf`).
 * @returns The inputs' data, in the order `reads` lists them.
 */
export function inputData(spec: CalcSpec, ctx: RunContext): CalcInputData[] {
  return spec.reads.map(({ cell, as }) => {
    const out = ctx.inputs[cell];
    if (out.type === "Table") return { as, data: tableData(out as Table) };
    const summary = ctx.summaryOf?.(cell) ?? null;
    if (out.type === "Value") return { as, data: (out as CalcOutput).value };
    if (summary === null) throw new CellError(`Input "${cell}" has no result to read`, ["reads"]);
    const data = resultData(summary.result, summary.rows);
    if (out.type !== "Fit") return { as, data };
    const fit = out as Fit;
    const estimates: Record<string, number> = {};
    fit.parameters.forEach((p, j) =>
      Object.defineProperty(estimates, p, { value: fit.estimates[j], enumerable: true })
    );
    (data as Record<string, unknown>).estimates = estimates;
    const m = fit.model;
    return { as, data, model: { rhs: m.rhs, columns: m.columns, parameters: fit.parameters } };
  });
}

/** Character offset in `code` of a 1-based line and column. */
function offsetIn(code: string, line: number, column: number): number {
  let at = 0;
  for (let l = 1; l < line; l++) {
    const nl = code.indexOf("\n", at);
    if (nl < 0) return code.length;
    at = nl + 1;
  }
  return Math.min(at + Math.max(0, column - 1), code.length);
}

/**
 * The checker's first error as a located CellError (with its own "did you
 * mean"): Deno's parser (code 0) and TypeScript's parser errors (1000-1999)
 * read "Syntax error", the rest "Type error".
 */
function typeError(spec: CalcSpec, d: Diagnostic, firstLine: number, more: number): CellError {
  const line = d.line - firstLine + 1;
  const inCode = line >= 1;
  const extra = more > 0 ? ` (and ${more} more error${more === 1 ? "" : "s"})` : "";
  // A type spelled out whole can run to hundreds of characters: name it briefly.
  const message = d.message.replace(/'[^']{60,}'/g, "(this value's type)");
  const what = d.code < 2000 ? "Syntax error" : "Type error";
  return new CellError(
    `${what}: ${message}${extra}`,
    [],
    inCode ? spec.codeOffset + offsetIn(spec.code, line, d.column) : spec.codeOffset,
  );
}

/** The answer of a run that gave no value, as a CellError at the code's line when known. */
function runError(spec: CalcSpec, a: Extract<IsolateAnswer, { ok: false }>): CellError {
  const at = a.line !== null && a.line >= 2
    ? spec.codeOffset + offsetIn(spec.code, a.line - 1, a.column ?? 1)
    : undefined;
  const said = a.why === "threw" ? `The code threw ${a.message}` : `This cell ${a.message}`;
  return new CellError(said, [], at);
}

/**
 * Runs a calc cell.
 *
 * @param spec The cell's spec.
 * @param ctx The run context; needs `sandbox` (the kernel's child processes).
 * @returns Its value, or its table.
 * @throws {CellError} For a type error (at its line and column), a run that
 *   was refused or stopped (in plain words), a value that is not data.
 */
export async function runCalc(
  spec: CalcSpec,
  ctx: RunContext,
): Promise<CalcOutput | CalcTableOutput> {
  const sandbox = ctx.sandbox;
  if (!sandbox) throw new CellError("calc cells cannot run here: no sandbox for user code", []);
  const inputs = inputData(spec, ctx);
  const check = checkModule(spec, inputs);
  const checked = await sandbox.check(check.text);
  if (!checked.ok) {
    const d = checked.diagnostics[0];
    if (d === undefined) throw new CellError(checked.message ?? "The type check failed", []);
    throw typeError(spec, d, check.firstLine, checked.diagnostics.length - 1);
  }
  const data: Record<string, unknown> = {};
  for (const i of inputs) Object.defineProperty(data, i.as, { value: i.data, enumerable: true });
  const input = encodeData(data);
  if (input.length > INPUT_LIMIT) {
    throw new CellError(
      `This cell's inputs come to ${formatBytes(input.length)} as data; a calc cell takes at most ${
        formatBytes(INPUT_LIMIT)
      }: read a smaller table (a where filter) or a fit instead`,
      ["reads"],
    );
  }
  const answer = await sandbox.run({
    program: runModule(spec, inputs),
    input,
    gives: spec.gives,
    memoryMb: spec.memoryMb,
    seconds: spec.seconds,
  });
  if (!answer.ok && answer.why === "stopped") ctx.progress(1); // answered as cancelled
  if (!answer.ok) throw runError(spec, answer);
  const consoleOf: CalcConsole = {
    console: answer.console,
    consoleCut: answer.consoleCut,
    runMs: answer.ms,
  };
  if (spec.gives === "value") return { type: "Value", value: answer.value, ...consoleOf };
  return { ...tableOf(answer.value), ...consoleOf };
}

/** The child's table answer as a Table (columns decoded; no source file). */
function tableOf(v: unknown): Table & { rowsFiltered: number } {
  const t = v as {
    columns: Record<string, unknown>;
    units: Record<string, string>;
    names: string[];
  };
  const columns: NumberColumn[] = [];
  let n = 0;
  for (const name of t.names) {
    const values = decodeColumn(t.columns[name]);
    if (values === null) {
      throw new CellError(`The table's column "${name}" did not come back whole`, []);
    }
    n = values.length;
    let missing = 0;
    for (let i = 0; i < values.length; i++) if (Number.isNaN(values[i])) missing++;
    const unit = Object.hasOwn(t.units, name) ? t.units[name] : null;
    columns.push({ name, type: "number", unit, values, lo: null, missing });
  }
  const rows = new Int32Array(n);
  for (let i = 0; i < n; i++) rows[i] = i + 1;
  return {
    type: "Table",
    columns,
    rows,
    rowsRead: n,
    excluded: [],
    sha256: null,
    source: null,
    rowsFiltered: 0,
  };
}
