/**
 * The RUN-JSON `result` of a calc cell (RUN-JSON.md, `calc`: `{ "value" }`),
 * and its CLI lines. Our additions: `gives`, `table` (a table's summary, as a
 * table cell's result, when the cell gives one), `console` (what the code
 * printed, at most 64 kB), `console_cut` (lines past that, counted) and
 * `run_ms` (the run in its process).
 *
 * @module
 */
import { summarizeTable, type TableResult } from "../table/summary.ts";
import type { CalcOutput, CalcTableOutput } from "./run.ts";

/** The `calc` result object. */
export interface CalcResult {
  /** The returned value (null when the cell gives a table). */
  value: unknown;
  gives: "value" | "table";
  /** The table's summary when the cell gives a table; null otherwise. */
  table: TableResult | null;
  console: string;
  console_cut: number;
  run_ms: number;
}

/**
 * The result of a calc cell's output.
 *
 * @param out The output.
 * @returns Plain JSON.
 */
export function summarizeCalc(out: CalcOutput | CalcTableOutput): CalcResult {
  const common = { console: out.console, console_cut: out.consoleCut, run_ms: out.runMs };
  if (out.type === "Value") return { value: out.value, gives: "value", table: null, ...common };
  return { value: null, gives: "table", table: summarizeTable(out), ...common };
}

/** The longest value a CLI line shows whole. */
const LINE_CHARS = 100;

/**
 * One human line: the value in brief, or the table's size.
 *
 * @param r The result.
 * @returns The line.
 * @example
 * ```ts
 * import { calcLine } from "./result.ts";
 * const r = { value: { cycle: 812 }, gives: "value" as const, table: null, console: "", console_cut: 0, run_ms: 40 };
 * if (calcLine(r) !== '{"cycle":812}') throw new Error(calcLine(r));
 * ```
 */
export function calcLine(r: CalcResult): string {
  if (r.table !== null) {
    const cols = r.table.columns.length;
    return `table of ${r.table.rows_used} rows · ${cols} column${cols === 1 ? "" : "s"}`;
  }
  const text = JSON.stringify(r.value) ?? "null";
  return text.length <= LINE_CHARS ? text : `${text.slice(0, LINE_CHARS - 1)}…`;
}

/**
 * The code's console output under the line (at most ten lines).
 *
 * @param r The result.
 * @returns Lines.
 */
export function calcDetails(r: CalcResult): string[] {
  const lines = r.console.split("\n").filter((l) => l !== "");
  const shown = lines.slice(0, 10).map((l) => `console: ${l.slice(0, 200)}`);
  const more = lines.length - shown.length + r.console_cut;
  if (more > 0) shown.push(`console: … ${more} more line${more === 1 ? "" : "s"}`);
  return shown;
}
