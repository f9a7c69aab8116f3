/**
 * The `table` result for RUN-JSON and the CLI's one-line summary.
 *
 * @module
 */
import type { TableOutput } from "./run.ts";

/** One column in the table's result. */
export interface TableColumnResult {
  name: string;
  type: "number" | "text";
  unit: string | null;
  /** Missing values among the rows used. */
  missing: number;
}

/** The `table` result object of RUN-JSON (see shared RUN-JSON.md; extra fields are additions). */
export interface TableResult {
  rows_read: number;
  rows_used: number;
  excluded: { row: number; why: string }[];
  columns: TableColumnResult[];
  /** SHA-256 of the source file's bytes; null for inline rows. */
  sha256: string | null;
  /** The source file as written; null for inline rows. (Addition.) */
  source: string | null;
  /** Rows dropped by the `where` filter, not counted as exclusions. (Addition.) */
  rows_filtered: number;
}

/**
 * The RUN-JSON result of a table.
 *
 * @param out The table.
 * @returns Plain JSON.
 * @example
 * ```ts
 * import { summarizeTable } from "./summary.ts";
 * const r = summarizeTable({
 *   type: "Table", columns: [], rows: new Int32Array([1, 3]), rowsRead: 3,
 *   excluded: [{ row: 2, why: "probe loose" }], sha256: null, source: null, rowsFiltered: 0,
 * });
 * if (r.rows_used !== 2 || r.excluded[0].row !== 2) throw new Error("bad summary");
 * ```
 */
export function summarizeTable(out: TableOutput): TableResult {
  return {
    rows_read: out.rowsRead,
    rows_used: out.rows.length,
    excluded: out.excluded.map((e) => ({ row: e.row, why: e.why })),
    columns: out.columns.map((c) => ({
      name: c.name,
      type: c.type,
      unit: c.unit,
      missing: c.missing,
    })),
    sha256: out.sha256,
    source: out.source,
    rows_filtered: out.rowsFiltered,
  };
}

/**
 * One human line: `118 of 120 rows · 3 columns · 2 excluded`.
 *
 * @param r The result.
 * @returns The line.
 * @example
 * ```ts
 * import { tableLine } from "./summary.ts";
 * const line = tableLine({ rows_read: 120, rows_used: 118, rows_filtered: 0, source: null, sha256: null,
 *   excluded: [{ row: 41, why: "a" }, { row: 42, why: "a" }], columns: [
 *   { name: "a", type: "number", unit: null, missing: 0 }, { name: "b", type: "number", unit: null, missing: 0 },
 *   { name: "c", type: "text", unit: null, missing: 0 }] });
 * if (line !== "118 of 120 rows · 3 columns · 2 excluded") throw new Error(line);
 * ```
 */
export function tableLine(r: TableResult): string {
  const plural = (n: number, w: string) => `${n} ${w}${n === 1 ? "" : "s"}`;
  const parts = [
    r.rows_used === r.rows_read
      ? plural(r.rows_read, "row")
      : `${r.rows_used} of ${plural(r.rows_read, "row")}`,
    plural(r.columns.length, "column"),
  ];
  if (r.excluded.length > 0) parts.push(`${r.excluded.length} excluded`);
  if (r.rows_filtered > 0) parts.push(`${r.rows_filtered} filtered out`);
  const missing = r.columns.reduce((m, c) => m + c.missing, 0);
  if (missing > 0) parts.push(`${missing} missing`);
  return parts.join(" · ");
}
