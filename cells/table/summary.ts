/**
 * The `table` result for RUN-JSON and the CLI's one-line summary.
 *
 * @module
 */
import type { Column } from "../../kernel/contract/mod.ts";
import type { TableOutput } from "./run.ts";

/** One column in the table's result. */
export interface TableColumnResult {
  name: string;
  type: "number" | "text";
  unit: string | null;
  /** Missing values among the rows used. */
  missing: number;
  /** RUN-JSON addition: rows whose value is a detection limit the quantity lies below (`below_limit`); absent otherwise. */
  below_limit?: number;
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
  /**
   * RUN-JSON addition: the source row numbers, ascending, of the rows used
   * that carry a missing value in any column (read or derived). A table
   * leaves no row out for a missing value, it keeps it with the hole; these
   * are the rows a fit will leave out if its model or weights use the column
   * (the fit's own `rows_missing` then names those it did). The columns'
   * `missing` counts are over the same rows. Rows the `where` filter dropped
   * (a comparison with a missing value does not hold) are counted in
   * `rows_filtered`, not listed here.
   */
  rows_missing: number[];
  /**
   * RUN-JSON addition, present when the rows came from a database: the
   * engine, the DuckDB file or the name of the variable holding the
   * PostgreSQL URL (never the URL), the query, the result's fingerprint
   * (row count and a hash of the values), and whether the rows stayed in the
   * engine (`kept`: more rows than a cell holds; `rows_used` counts them).
   */
  database?: {
    engine: "duckdb" | "postgres";
    file: string | null;
    url_from: string | null;
    query: string;
    partition_by: string | null;
    /** The column whose order is the rows' sequence, or null. */
    order_by: string | null;
    fingerprint: string;
    kept: boolean;
  };
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
 * if (r.rows_missing.length !== 0) throw new Error("no column, no missing value");
 * ```
 */
export function summarizeTable(out: TableOutput): TableResult {
  return {
    rows_read: out.rowsRead,
    rows_used: out.database?.kept ? out.database.rowsInEngine : out.rows.length,
    excluded: out.excluded.map((e) => ({ row: e.row, why: e.why })),
    columns: out.columns.map((c) => ({
      name: c.name,
      type: c.type,
      unit: c.unit,
      missing: c.missing,
      ...(c.type === "number" && c.below !== undefined
        ? { below_limit: c.below.reduce((t, v) => t + v, 0) }
        : {}),
    })),
    sha256: out.sha256,
    source: out.source,
    rows_filtered: out.rowsFiltered,
    rows_missing: rowsWithMissing(out.columns, out.rows),
    ...databaseOf(out),
  };
}

function databaseOf(out: TableOutput): Pick<TableResult, "database"> {
  const d = out.database;
  if (d === undefined) return {};
  return {
    database: {
      engine: d.ref.engine,
      file: d.ref.engine === "duckdb" ? d.ref.file : null,
      url_from: d.ref.engine === "postgres" ? d.ref.urlFrom : null,
      query: d.query,
      partition_by: d.partitionBy,
      order_by: d.orderBy ?? null,
      fingerprint: d.fingerprint,
      kept: d.kept,
    },
  };
}

/** Source rows (ascending, as `rows` is) where any column is missing: NaN or null. */
function rowsWithMissing(columns: readonly Column[], rows: Int32Array): number[] {
  const holed = columns.filter((c) => c.missing > 0);
  if (holed.length === 0) return [];
  const out: number[] = [];
  for (let i = 0; i < rows.length; i++) {
    if (holed.some((c) => c.type === "number" ? Number.isNaN(c.values[i]) : c.values[i] === null)) {
      out.push(rows[i]);
    }
  }
  return out;
}

/**
 * One human line: `118 of 120 rows · 3 columns · 2 excluded`.
 *
 * @param r The result.
 * @returns The line.
 * @example
 * ```ts
 * import { tableLine } from "./summary.ts";
 * const line = tableLine({ rows_read: 120, rows_used: 118, rows_filtered: 0, rows_missing: [],
 *   source: null, sha256: null,
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
  if (r.database !== undefined) {
    parts.push(r.database.engine === "duckdb" ? "from DuckDB" : "from PostgreSQL");
    if (r.database.kept) parts.push("kept in the database");
  }
  return parts.join(" · ");
}
