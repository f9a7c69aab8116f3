/**
 * Normalisers for a table read from a database: `database` (an embedded
 * DuckDB file beside the document, or `{ url_from: VARIABLE }` naming the
 * environment variable that holds a PostgreSQL URL), `query` (one read-only
 * SELECT), `partition_by` (the column the database partitions the table
 * by, so sums are taken per partition where each partition lives) and
 * `order_by` (the column whose order is the rows' sequence: rows in memory
 * come in that order, and a fit in the engine takes Durbin–Watson in it).
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { checkQuery } from "../../kernel/engine/guard.ts";
import type { DatabaseRef } from "../../kernel/engine/types.ts";
import { checkFromPath } from "./_parse_source.ts";

/** The database part of a table's spec. */
export interface DatabaseSource {
  database: DatabaseRef;
  /** The query as written (trimmed). */
  query: string;
  partitionBy: string | null;
  /** The column giving the rows' sequence, or null (the query's own order). */
  orderBy: string | null;
  /** Where the rows are kept: memory up to LOAD_ROWS (auto), or always one place. */
  keep: "auto" | "memory" | "database";
}

/** File-reading options that a query replaces. */
const FILE_ONLY = ["columns", "rows", "delimiter", "decimal", "missing"] as const;
/** Row work that belongs in the query, so an in-engine fit sees exactly the table's rows. */
const IN_QUERY: Record<string, string> = {
  exclude: "leave the rows out in the query's WHERE clause (and say why in the prose)",
  derive: "compute the column in the query's SELECT list",
  where: "filter in the query's WHERE clause",
};

/** Names of environment variables: letters, digits and underscores, not starting with a digit. */
const VARIABLE = /^[A-Za-z_][A-Za-z0-9_]*$/;

/**
 * Reads `database`, `query`, `partition_by`, `order_by` and `keep_rows`;
 * null when the table has no `database` (then the others are refused).
 *
 * @param o The cell's options.
 * @param name The cell's name (for messages).
 * @returns The source, or null.
 * @throws {CellError} For a missing or ill-formed option, an option that a
 *   query replaces, or a query that is not one read-only SELECT (at its
 *   place in the query).
 */
export function parseDatabaseSource(
  o: Record<string, unknown>,
  name: string,
): DatabaseSource | null {
  if (o.database === undefined || o.database === null) {
    for (const key of ["query", "partition_by", "order_by", "keep_rows"]) {
      if (o[key] !== undefined) {
        throw new CellError(
          `Option "${key}" goes with database: name the database the query runs in`,
          [key],
        );
      }
    }
    return null;
  }
  if (o.from !== undefined && o.from !== null) {
    throw new CellError(
      `Table "${name}" has both from and database: read a file or query a database, not both`,
      ["from"],
    );
  }
  for (const key of FILE_ONLY) {
    if (o[key] !== undefined) {
      throw new CellError(`Option "${key}" applies to files and inline rows, not to a query`, [
        key,
      ]);
    }
  }
  for (const [key, instead] of Object.entries(IN_QUERY)) {
    if (o[key] !== undefined) {
      throw new CellError(
        `Option "${key}" cannot be used with a database table: ${instead}`,
        [key],
      );
    }
  }
  return {
    database: parseDatabase(o.database),
    query: parseQuery(o.query),
    partitionBy: columnName(
      o.partition_by,
      "partition_by",
      "the one the database partitions the table by",
    ),
    orderBy: columnName(
      o.order_by,
      "order_by",
      "the one whose order is the rows' sequence (a time, a cycle)",
    ),
    keep: parseKeep(o.keep_rows),
  };
}

function parseKeep(v: unknown): DatabaseSource["keep"] {
  if (v === undefined || v === null) return "auto";
  if (v === "auto" || v === "memory" || v === "database") return v;
  throw new CellError(
    `Option "keep_rows" is auto, memory or database, not ${JSON.stringify(v)}`,
    ["keep_rows"],
  );
}

function parseDatabase(v: unknown): DatabaseRef {
  if (typeof v === "string") return { engine: "duckdb", file: checkFromPath(v, "database") };
  if (typeof v === "object" && v !== null && !Array.isArray(v)) {
    const keys = Object.keys(v);
    const extra = keys.find((k) => k !== "url_from");
    if (extra !== undefined) {
      throw new CellError(
        `Option "database" knows only url_from (the environment variable holding a PostgreSQL URL), not "${extra}"`,
        ["database", extra],
      );
    }
    const variable = (v as { url_from?: unknown }).url_from;
    if (typeof variable !== "string" || !VARIABLE.test(variable.trim())) {
      throw new CellError(
        `database: url_from must name an environment variable, such as PLANT_DB (letters, digits and _)`,
        ["database", "url_from"],
      );
    }
    return { engine: "postgres", urlFrom: variable.trim() };
  }
  throw new CellError(
    `Option "database" must be a DuckDB file such as plant.duckdb, or { url_from: VARIABLE }`,
    ["database"],
  );
}

function parseQuery(v: unknown): string {
  if (typeof v !== "string" || v.trim() === "") {
    throw new CellError(
      `A database table needs a query: one SELECT, such as SELECT cycle, capacity FROM cells`,
      v === undefined ? [] : ["query"],
    );
  }
  const lead = v.length - v.trimStart().length;
  const query = v.trim();
  const refused = checkQuery(query);
  if (refused) throw new CellError(refused.message, ["query"], lead + refused.offset);
  return query;
}

function columnName(v: unknown, key: string, which: string): string | null {
  if (v === undefined || v === null) return null;
  if (typeof v !== "string" || v.trim() === "") {
    throw new CellError(`Option "${key}" must name a column of the query, ${which}`, [key]);
  }
  return v.trim();
}
