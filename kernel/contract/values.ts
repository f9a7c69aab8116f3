/**
 * The values that flow between cells: output types, the table every kind may
 * read, and the files and references a cell names.
 *
 * ```
 *  table ──Table──▶ fit ──Fit──▶ compare / check / predict / chart
 *    ▲                               (each kind's output type is a name below;
 *    └─ FileData (bytes, SHA-256)     a reference is accepted when the target's
 *                                     output is among those it lists)
 * ```
 *
 * @module
 */
import type { DatabaseRef } from "../engine/types.ts";
import type { OptionPath } from "../errors.ts";

export type { OptionPath };

/** Names of output types. A reference is accepted when the target's output is listed. */
export type OutputType =
  | "Table"
  | "Fit"
  | "Comparison"
  | "Diagnostics"
  | "Predictions"
  | "Chart"
  | "Value"
  | "Ranked"
  | "JointFit"
  | "Agreement";

/** Base of every cell output. */
export interface CellOutput {
  type: OutputType;
  /**
   * Set when the output's rows stay in a database (a table kept in its
   * engine, a fit computed there): what to say to a kind that needs rows,
   * e.g. `its 20,000,000 rows stay in the database`. Only kinds with
   * `readsKept` are given such an input.
   */
  keptIn?: string;
}

/** A reference from one cell to another, found by a kind's `inputs`. */
export interface InputRef {
  /** The referenced cell's name. */
  name: string;
  /** Output types this reference accepts. */
  accepts: readonly OutputType[];
  /** The option that holds the reference, for error positions. */
  path: OptionPath;
  /** Where in that option's text (or a code body) the name is written, when known. */
  offset?: number;
}

/** A data file a cell needs; the kernel reads it (relative to the document) and passes bytes. */
export interface FileRef {
  /** Path as written, relative to the document's folder. */
  path: string;
  /** The option that names the file, for error positions. */
  option: OptionPath;
}

/** A file's content as handed to `run`. */
export interface FileData {
  path: string;
  bytes: Uint8Array;
  /** Lower-case hex SHA-256 of `bytes`. */
  sha256: string;
}

/** A numeric column. Missing values are NaN. */
export interface NumberColumn {
  name: string;
  type: "number";
  unit: string | null;
  values: Float64Array;
  /**
   * Decimal corrections: `values[i] + lo[i]` is the number as printed in the
   * file, to double-double precision (about 32 digits). `null` when the table
   * did not keep them (large tables, derived columns).
   */
  lo: Float64Array | null;
  missing: number;
  /**
   * Per row, 1 where the value is a detection limit the quantity lies below
   * (written `<L` in a column the table's `below_limit` names); absent for
   * columns with no such notation.
   */
  below?: Uint8Array;
}

/** A text column. Missing values are null. */
export interface TextColumn {
  name: string;
  type: "text";
  unit: string | null;
  values: (string | null)[];
  missing: number;
}

export type Column = NumberColumn | TextColumn;

/** Output of `table`: typed columns over the rows kept after exclusions and filters. */
export interface Table extends CellOutput {
  type: "Table";
  columns: Column[];
  /** Source row number (1-based data row, before exclusions) of each kept row. */
  rows: Int32Array;
  rowsRead: number;
  excluded: { row: number; why: string }[];
  /** SHA-256 of the source file's bytes, when the table came from a file. */
  sha256: string | null;
  /** The source file path as written, when from a file. */
  source: string | null;
  /** When the rows came from a database query; absent otherwise. */
  database?: TableInEngine;
}

/**
 * A table read by a query. A table of more rows than a cell may hold is
 * kept in its engine (`kept`): its columns carry names, types and units but
 * no values, `rows` is empty, and only kinds that compute in the engine
 * (a linear fit) read it; the kernel refuses it to the others with a
 * sentence saying so.
 */
export interface TableInEngine {
  ref: DatabaseRef;
  /** The query as written. */
  query: string;
  /** The column the database partitions the table by, or null. */
  partitionBy: string | null;
  /** The column whose order is the rows' sequence, or null (the query's own order). */
  orderBy: string | null;
  /** The result's row count and a hash of its values, as the engine computed them. */
  fingerprint: string;
  /** True when the rows stay in the engine. */
  kept: boolean;
  /** Rows of the query's result. */
  rowsInEngine: number;
}
