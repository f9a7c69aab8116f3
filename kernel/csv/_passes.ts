/**
 * The reader's two passes over the records, as field sinks.
 *
 * Pass 1 ({@link NumberPass}) parses every field of every column not declared
 * text straight from bytes into a Float64Array with room for every record
 * (and its decimal correction), counting missing and non-numeric values; the
 * reader fills it through the fast lane (`_plain_rows.ts`) and gives it the
 * records the lane leaves. Pass 2
 * ({@link TextPass}) runs only when some column turned out (or was declared)
 * text, and decodes just those columns' fields. No per-row objects, no
 * strings for numeric data.
 *
 * @module
 */
import type { DecimalParser } from "./decimal_parser.ts";
import { decodeField, type MissingMarkers } from "./_fields.ts";
import type { FieldSink } from "./_scanner.ts";

/** A non-numeric value seen in a column during pass 1. */
export interface BadValue {
  /** 1-based data row. */
  row: number;
  text: string;
}

/** How many non-numeric samples each column keeps for messages. */
const KEEP_BAD = 3;

/** Pass 1: numbers from bytes. */
export class NumberPass implements FieldSink {
  /** 0-based index of the row being read. */
  row = 0;
  values: (Float64Array | null)[];
  lo: (Float64Array | null)[];
  numeric: number[];
  missing: number[];
  bad: number[];
  badSamples: BadValue[][];
  /** Columns read by the scanner's fused number path (see FieldSink). */
  readonly numbers: readonly boolean[];
  /** Rows the columns have room for (they grow by doubling past it). */
  capacity: number;
  /** Some marker reads as a number (a sentinel such as -999): test markers before parsing. */
  readonly markersFirst: boolean;

  /**
   * @param bytes The file.
   * @param parse Column indexes to parse as numbers (others: skipped).
   * @param parser The decimal parser (its `wantLo` is set to `keepLo`).
   * @param markers Missing-value markers.
   * @param keepLo Whether decimal corrections are kept.
   * @param capacity Initial row capacity (the reader gives an upper bound of the rows).
   * @param shared Columns in shared memory (for a helper thread to fill half of them).
   */
  constructor(
    private readonly bytes: Uint8Array,
    parse: readonly boolean[],
    readonly parser: DecimalParser,
    readonly markers: MissingMarkers,
    keepLo: boolean,
    capacity: number,
    shared = false,
  ) {
    const n = parse.length;
    this.markersFirst = markers.numeric(parser);
    this.numbers = this.markersFirst ? [] : parse;
    this.capacity = Math.max(1, capacity);
    this.parser.wantLo = keepLo;
    const column = () =>
      shared
        ? new Float64Array(new SharedArrayBuffer(8 * this.capacity))
        : new Float64Array(this.capacity);
    this.values = parse.map((p) => (p ? column() : null));
    this.lo = parse.map((p) => (p && keepLo ? new Float64Array(this.capacity) : null));
    this.numeric = new Array(n).fill(0);
    this.missing = new Array(n).fill(0);
    this.bad = new Array(n).fill(0);
    this.badSamples = Array.from({ length: n }, () => []);
  }

  /** Prepares row `r` (0-based): grows the columns when they are full. */
  startRow(r: number): void {
    this.row = r;
    if (r < this.capacity) return;
    const cap = this.capacity * 2;
    const grow = (a: Float64Array | null) => {
      if (a === null) return null;
      const b = new Float64Array(cap);
      b.set(a);
      return b;
    };
    this.values = this.values.map(grow);
    this.lo = this.lo.map(grow);
    this.capacity = cap;
  }

  number(col: number, x: number): void {
    const r = this.row;
    this.values[col]![r] = x;
    const lo = this.lo[col];
    if (lo !== null) lo[r] = this.parser.lo;
    this.numeric[col]++;
  }

  field(col: number, start: number, end: number, _quoted: boolean, escaped: boolean): void {
    const v = this.values[col];
    if (v === undefined || v === null) return;
    const r = this.row;
    if (this.markersFirst && this.markers.test(this.bytes, start, end)) {
      v[r] = NaN;
      this.missing[col]++;
      return;
    }
    const x = escaped ? NaN : this.parser.parse(this.bytes, start, end);
    if (x === x) {
      v[r] = x;
      const lo = this.lo[col];
      if (lo !== null) lo[r] = this.parser.lo;
      this.numeric[col]++;
      return;
    }
    v[r] = NaN;
    if (this.markers.test(this.bytes, start, end)) {
      this.missing[col]++;
      return;
    }
    this.bad[col]++;
    if (this.badSamples[col].length < KEEP_BAD) {
      this.badSamples[col].push({ row: r + 1, text: decodeField(this.bytes, start, end, escaped) });
    }
  }
}

/** Pass 2: text for the columns that need it. */
export class TextPass implements FieldSink {
  /** 0-based index of the row being read. */
  row = 0;
  values: ((string | null)[] | null)[];
  missing: number[];

  /**
   * @param bytes The file.
   * @param text Column indexes to decode.
   * @param rows Number of data rows.
   * @param markers Missing-value markers.
   */
  constructor(
    private readonly bytes: Uint8Array,
    text: readonly boolean[],
    rows: number,
    readonly markers: MissingMarkers,
  ) {
    this.values = text.map((t) => (t ? new Array<string | null>(rows).fill(null) : null));
    this.missing = new Array(text.length).fill(0);
  }

  field(col: number, start: number, end: number, _quoted: boolean, escaped: boolean): void {
    const out = this.values[col];
    if (out === undefined || out === null) return;
    if (this.markers.test(this.bytes, start, end)) {
      this.missing[col]++;
      return;
    }
    out[this.row] = decodeField(this.bytes, start, end, escaped);
  }
}
