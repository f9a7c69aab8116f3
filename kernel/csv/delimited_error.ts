/**
 * The error raised by the delimited-text reader.
 *
 * @module
 */

/** Where in the data (and which option) a {@link DelimitedError} concerns. */
export interface DelimitedErrorPlace {
  /** 1-based data row (the header is not a row), when the error is about one row. */
  row?: number | null;
  /** Column name, when the error is about one column. */
  column?: string | null;
  /** 0-based byte offset in the file, when known. */
  offset?: number | null;
  /** The reader option at fault, e.g. `["types", "capcity"]`; empty when the data is at fault. */
  option?: readonly string[];
}

/**
 * A data or option error found while reading delimited text. The message is
 * complete and names row, column and value; the fields let callers place it.
 *
 * @example
 * ```ts
 * import { DelimitedError } from "./delimited_error.ts";
 * const e = new DelimitedError(`File "a.csv": row 3 has 2 fields, expected 3 as in the header`, { row: 3 });
 * if (e.row !== 3 || e.option.length !== 0) throw new Error("place not kept");
 * ```
 */
export class DelimitedError extends Error {
  /** 1-based data row, or null. */
  row: number | null;
  /** Column name, or null. */
  column: string | null;
  /** 0-based byte offset, or null. */
  offset: number | null;
  /** The option at fault (empty: the data). */
  option: readonly string[];

  /**
   * @param message Sentence case, no final period, offending value quoted.
   * @param place Row, column, byte offset and option concerned.
   */
  constructor(message: string, place: DelimitedErrorPlace = {}) {
    super(message);
    this.name = "DelimitedError";
    this.row = place.row ?? null;
    this.column = place.column ?? null;
    this.offset = place.offset ?? null;
    this.option = place.option ?? [];
  }
}
