/**
 * Reads delimited text (CSV, TSV, `;`-separated with decimal comma) from
 * bytes into typed columns.
 *
 * - Quoting per RFC 4180 (quoted fields, doubled quotes, delimiters and line
 *   ends inside quotes), LF / CRLF / CR line ends, optional final line end,
 *   blank lines skipped. UTF-8 with or without BOM; invalid UTF-8 is an error
 *   naming the byte.
 * - The first record is the header: names trimmed, none empty or repeated.
 *   Data rows are numbered from 1 (the header is not a row).
 * - Missing values: the empty field always, plus the `missing` markers
 *   (default `NA`, `NaN`). Numbers become NaN, text becomes null.
 * - Column typing: a column is a number column when every non-missing field
 *   is a decimal number (see `decimal_parser.ts` for the grammar), else
 *   text. **Rule for likely data errors:** when at least 90 % of a column's
 *   non-missing values are numbers but some are not (one stray "2,5O1" in a
 *   column of a hundred readings), the reader refuses the column and names
 *   the first offending row and value, rather than silently turning the
 *   column into text; declare `types: { col: text }` or list the value as a
 *   missing marker to accept it. A column with no values at all is a number
 *   column (all NaN).
 * - Declared types (`types`) are obeyed; a non-number in a declared number
 *   column is an error naming row, column and value.
 * - Memory: numbers go straight from bytes into Float64Array columns (two
 *   passes only when text columns exist); corrections `lo` are kept while
 *   rows × number-parsed columns ≤ `loLimit` (default 4,000,000, i.e. 32 MB
 *   of corrections), otherwise `lo` is null.
 *
 * @module
 */
import { DecimalParser } from "./decimal_parser.ts";
import { DelimitedError } from "./delimited_error.ts";
import { decodeField, MissingMarkers } from "./_fields.ts";
import { resolveOptions } from "./_options.ts";
import { NumberPass, TextPass } from "./_passes.ts";
import { type FieldSink, Scanner } from "./_scanner.ts";
import { PROGRESS_EVERY, readRows, wrongCount } from "./_read_rows.ts";
import { cutInHalves, readInHalves, releaseCut } from "./_halves.ts";
import { recordBound, recordsEnd } from "./line_feeds.ts";
import { checkHeader, checkTypes, decideTypes } from "./_typing.ts";

import type { ReadDelimitedOptions } from "./_options.ts";
export type { ReadDelimitedOptions };

/** A number column read from text. Missing values are NaN. */
export interface NumberData {
  name: string;
  type: "number";
  values: Float64Array;
  /** values[i] + lo[i] is the decimal as written, to about 32 digits; null past the limit. */
  lo: Float64Array | null;
  missing: number;
}

/** A text column read from text. Missing values are null. */
export interface TextData {
  name: string;
  type: "text";
  values: (string | null)[];
  missing: number;
}

/** One column of {@link DelimitedData}. */
export type DelimitedColumn = NumberData | TextData;

/** What {@link readDelimited} returns. */
export interface DelimitedData {
  /** Number of data rows (the header is not a row). */
  rowCount: number;
  columns: DelimitedColumn[];
  /** The delimiter used. */
  delimiter: string;
  /** The decimal separator used. */
  decimal: "." | ",";
}

class HeaderSink implements FieldSink {
  names: string[] = [];
  /** Byte offset of each field, for the place of a header error. */
  starts: number[] = [];
  constructor(private readonly bytes: Uint8Array) {}
  field(col: number, start: number, end: number, _q: boolean, escaped: boolean): void {
    this.names[col] = decodeField(this.bytes, start, end, escaped).trim();
    this.starts[col] = start;
  }
}

/**
 * Reads delimited text into typed columns, working on bytes.
 *
 * @param bytes The file's content.
 * @param options Delimiter, decimal separator, missing markers, declared types.
 * @returns Row count and typed columns in header order.
 * @throws {DelimitedError} For an empty file, a bad header, invalid UTF-8,
 *   broken quoting, a row with the wrong number of fields, a mostly-numeric
 *   column with a stray value, or a value that breaks a declared type.
 * @example
 * ```ts
 * import { readDelimited } from "./read_delimited.ts";
 * const data = readDelimited(new TextEncoder().encode("cycle,capacity\n1,2500.5\n2,NA\n"));
 * const cap = data.columns[1];
 * if (data.rowCount !== 2 || cap.type !== "number" || cap.values[0] !== 2500.5 || cap.missing !== 1) {
 *   throw new Error("unexpected table");
 * }
 * ```
 */
export function readDelimited(
  bytes: Uint8Array,
  options: ReadDelimitedOptions = {},
): DelimitedData {
  const o = resolveOptions(options);
  const bom = bytes.length >= 3 && bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf;
  const start = bom ? 3 : 0;
  const scanner = new Scanner(bytes, start, o.delimByte, o.label);
  const header = new HeaderSink(bytes);
  if (scanner.next(header) < 0) {
    throw new DelimitedError(
      `File "${o.label}" is empty: expected a header row of column names`,
      { offset: start },
    );
  }
  const names = header.names;
  checkHeader(names, o.label, header.starts);
  checkTypes(names, o.types);
  const ncols = names.length;
  const declaredText = names.map((n) => o.types[n] === "text");
  const markers = new MissingMarkers(o.missing);
  const parser = new DecimalParser({ decimal: o.decimal });
  const dataStart = scanner.pos;
  const parse = declaredText.map((t) => !t);
  // Room for every record at once (no growing, no trimming copy for the usual file). A large
  // file is cut in two and each side's line feeds counted at once (_halves.ts).
  const cut = bytes.length >= o.halvesFrom
    ? cutInHalves(bytes, dataStart, recordsEnd(bytes))
    : null;
  let pass1: NumberPass, rows: number;
  try {
    const bound = cut !== null ? cut.feeds + 1 : recordBound(bytes, dataStart);
    const parsed = parse.filter((p) => p).length;
    const rowsWithLo = parsed === 0 ? Infinity : Math.floor(o.loLimit / parsed);
    const progress = (f: number) => o.onProgress?.(0.9 * f);
    const keepLo = bound < rowsWithLo;
    const split = keepLo ? null : cut;
    pass1 = new NumberPass(bytes, parse, parser, markers, keepLo, bound, split !== null);
    rows = (split === null || pass1.markersFirst
      ? null
      : readInHalves(bytes, o, pass1, ncols, progress, dataStart, split)) ??
      readRows(bytes, o, pass1, ncols, progress, { pos: dataStart, row: 0 }).row;
    if (bound >= rowsWithLo && rows < rowsWithLo) {
      // Fewer records than the bound said (blank lines, quoted line ends) and few enough to keep
      // their corrections: read again with them.
      pass1 = new NumberPass(bytes, parse, parser, markers, true, rows);
      rows = readRows(bytes, o, pass1, ncols, progress, { pos: dataStart, row: 0 }).row;
    }
    // More records than the bound said (lone CR line ends among line feeds): too many to keep them.
    if (rows >= rowsWithLo) {
      pass1.lo.fill(null);
    }
  } finally {
    if (cut !== null) releaseCut(cut);
  }
  const kinds = decideTypes(names, o.types, pass1);
  const textCols = kinds.map((k) => k === "text");
  let pass2: TextPass | null = null;
  if (textCols.some((t) => t)) {
    pass2 = new TextPass(bytes, textCols, rows, markers);
    const again = new Scanner(bytes, dataStart, o.delimByte, o.label);
    scan(again, pass2, ncols, o.label, (f) => o.onProgress?.(0.9 + 0.1 * f));
  }
  o.onProgress?.(1);
  const columns: DelimitedColumn[] = names.map((name, c) => {
    if (pass2 !== null && textCols[c]) {
      return { name, type: "text", values: pass2.values[c]!, missing: pass2.missing[c] };
    }
    return {
      name,
      type: "number",
      values: exactly(pass1.values[c]!, rows),
      lo: pass1.lo[c] === null ? null : exactly(pass1.lo[c]!, rows),
      missing: pass1.missing[c],
    };
  });
  return { rowCount: rows, columns, delimiter: o.delimiter, decimal: o.decimal };
}

/** The first `rows` values: the array itself when it has exactly that many (the usual case). */
function exactly(a: Float64Array, rows: number): Float64Array {
  return a.length === rows ? a : a.slice(0, rows);
}

/** Runs one pass over the data records; returns the row count. */
function scan(
  scanner: Scanner,
  sink: FieldSink & { row: number; startRow?: (r: number) => void },
  ncols: number,
  label: string,
  progress: (fraction: number) => void,
): number {
  let r = 0;
  for (;;) {
    if (sink.startRow) sink.startRow(r);
    else sink.row = r;
    scanner.row = r + 1;
    const n = scanner.next(sink);
    if (n < 0) break;
    if (n !== ncols) throw wrongCount(label, r + 1, n, ncols);
    r++;
    if (r % PROGRESS_EVERY === 0) progress(scanner.progress());
  }
  return r;
}
