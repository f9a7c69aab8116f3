/**
 * The `table` cell kind: a CSV/TSV file beside the document, or inline rows,
 * read into typed columns with units, exclusions (each with its reason),
 * derived columns and a row filter. Options are described in `spec.ts`.
 *
 * @example
 * ```ts
 * import { tableKind } from "./mod.ts";
 * const settings = { title: "", confidence: 0.95, seed: 1, criterion: "aicc", maxFileBytes: 2 ** 29, extra: {} };
 * const spec = tableKind.parse({
 *   name: "t", kind: "table", body: "", settings, warn: () => {},
 *   options: { columns: ["x", "y"], rows: [[1, 2.5], [2, 4.5]], units: { y: "mV" } },
 * });
 * const out = await tableKind.run(spec, {
 *   name: "t", settings, inputs: {}, files: {}, warn: () => {}, progress: () => {},
 * });
 * if (tableKind.line(tableKind.summary(out, spec)) !== "2 rows · 2 columns") throw new Error("unexpected");
 * ```
 *
 * @module
 */
import type { CellKind } from "../../kernel/contract/mod.ts";
import { runTable, type TableOutput } from "./run.ts";
import { databaseStamp } from "./_read_database.ts";
import { parseTableSpec, type TableSpec } from "./spec.ts";
import { summarizeTable, tableLine, type TableResult } from "./summary.ts";
import { TABLE_OPTIONS } from "./spec.ts";
import { tableHistory } from "./history.ts";

export type { TableSpec } from "./spec.ts";
export type { TableOutput } from "./run.ts";
export type { TableColumnResult, TableResult } from "./summary.ts";
export { TABLE_OPTIONS } from "./spec.ts";

/** The `table` kind record. */
export const tableKind: CellKind<TableSpec, TableOutput, TableResult> = {
  kind: "table",
  body: "yaml",
  output: "Table",
  description:
    "Reads a CSV/TSV file, inline rows or a database query into typed columns, with units, exclusions and derived columns",
  parse: parseTableSpec,
  inputs: () => [],
  files: (spec) => (spec.from === null ? [] : [{ path: spec.from, option: ["from"] }]),
  stamp: databaseStamp,
  run: runTable,
  summary: (out) => summarizeTable(out),
  // Every kept row with a missing value: up to one entry a row, which no view reads.
  page: { omit: ["rows_missing"] },
  rows: ["rows_missing"],
  history: tableHistory,
  line: tableLine,
  options: TABLE_OPTIONS,
  columns: (r) => r.columns.map(({ name, type, unit }) => ({ name, type, unit })),
  template: tableTemplate,
};

/** A new table: a few inline rows, so it runs before any file is chosen. */
function tableTemplate(): string {
  return [
    "# from: data/measurements.csv   (or read a file beside the document)",
    "columns: [x, y]",
    "rows:",
    "  - [1, 2.1]",
    "  - [2, 3.9]",
    "  - [3, 6.2]",
    "  - [4, 7.8]",
    "  - [5, 10.1]",
    "",
  ].join("\n");
}
