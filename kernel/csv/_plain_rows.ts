/**
 * The reader's fast lane: records made only of plain fields, read in one
 * tight loop straight into the Float64Array columns.
 *
 * A plain record is ASCII with no quote, its fields unquoted, every number
 * field a decimal in the reader's grammar written without spaces, every other
 * field a missing-value marker (or a column not parsed, skipped), and exactly
 * as many fields as the header. The loop reads such records one after the
 * other; at the first record that is anything else (a quote, a byte ≥ 0x80, a
 * space, a stray value, a wrong field count, no room left) it stops at that
 * record's first byte, and the general scanner (`_scanner.ts` with
 * `NumberPass`) reads it, with every check and message of the reader. So the
 * lane changes nothing a caller sees, only how fast plain files go.
 *
 * ```
 *  bytes ──plain record?──yes──▶ digits → m, point, exponent → Clinger's fast path → column[c][r]
 *            │                                       (long mantissas: DecimalParser.scan)
 *            └─no──▶ stop here; the general scanner reads this one record
 * ```
 *
 * Numbers: the digits (a point anywhere among them) are gathered in two
 * 32-bit integers of up to nine digits each (integer arithmetic: measured
 * here, a third faster than one double accumulator checked against 2^53 at
 * every digit), M = A·10^|B| + B is exact for up to 15 digits (below 2^53),
 * and with the decimal exponent k = exponent − digits after the point,
 * |k| ≤ 22, the value is M·10^k or M/10^−k, one correctly rounded IEEE
 * operation (Clinger 1990, "How to read floating point numbers accurately",
 * PLDI '90, fast path), with the correction `lo` by Dekker's exact product
 * error, exactly as `DecimalParser` computes them (`decimal_parser.ts`); a
 * number of more than 15 digits or a larger exponent is handed to
 * `DecimalParser.scan` (`Number()` and a BigInt residual).
 *
 * Long runs of records go through the same lane in WebAssembly first
 * (`_plain_wasm.ts`), which reads the plainest of them about twice as fast
 * and leaves every other record to this loop.
 *
 * The lane reads only records followed by a line feed somewhere in the
 * buffer, so every loop inside a record meets a line feed (neither digit,
 * point, exponent mark nor delimiter) before the buffer's end, and needs no
 * bounds test; the last record, when no line feed follows it, is the
 * scanner's.
 *
 * @module
 */
import { productError } from "../dd.ts";
import { type DecimalParser, POW10 } from "./decimal_parser.ts";
import type { MissingMarkers } from "./_fields.ts";
import { laneRows } from "./_plain_wasm.ts";

const LF = 0x0a;

/** Where the lane writes: the pass's columns and counts (see `NumberPass`). */
export interface PlainTarget {
  /** Per column: its values, or null for a column not parsed (skipped). */
  readonly values: readonly (Float64Array | null)[];
  /** Per column: decimal corrections, or null where none are kept. */
  readonly lo: readonly (Float64Array | null)[];
  /** Numbers read per column. */
  readonly numeric: number[];
  /** Missing values per column. */
  readonly missing: number[];
}

/** Reads plain records into a {@link PlainTarget} (see the module notes). */
export class PlainRows {
  /** After {@link PlainRows.read}: the first byte not read (a record's start, or the end). */
  pos = 0;
  /** The correction of the last {@link PlainRows.slow} number. */
  lo = 0;
  /** The file. */
  readonly bytes: Uint8Array;
  /** One past a line feed (by default the file's last): the lane reads no record beyond it. */
  readonly end: number;
  /** The delimiter's byte. */
  readonly delim: number;
  /** The decimal separator's byte. */
  readonly point: number;
  /** Columns with a missing value in the record being read (committed when it is whole). */
  readonly holes: Int32Array;
  /** Missing values per column in the current call, committed record by record. */
  readonly missed: Int32Array;
  readonly #markers: MissingMarkers;
  readonly #parser: DecimalParser;

  /**
   * @param bytes The whole file.
   * @param delim The delimiter's byte.
   * @param markers Missing-value markers (none of which reads as a number).
   * @param parser The decimal parser, for numbers off the fast path.
   * @param ncols Fields per record.
   * @param stop Read no record at or after this byte (default: the end).
   */
  constructor(
    bytes: Uint8Array,
    delim: number,
    markers: MissingMarkers,
    parser: DecimalParser,
    ncols: number,
    stop: number = bytes.length,
  ) {
    this.bytes = bytes;
    this.end = stop > 0 ? bytes.lastIndexOf(LF, stop - 1) + 1 : 0;
    this.delim = delim;
    this.point = parser.decimalByte;
    this.#markers = markers;
    this.#parser = parser;
    this.holes = new Int32Array(ncols);
    this.missed = new Int32Array(ncols);
  }

  /**
   * Reads plain records from byte `start` as rows `row`, `row + 1`, … up to
   * (not including) row `limit`, skipping blank lines before each.
   *
   * @param start A record's first byte (or blank lines before one).
   * @param row The row index of that record.
   * @param limit No row at or beyond this index is written.
   * @param to The columns and counts.
   * @returns The index of the next row; {@link PlainRows.pos} is where it starts.
   */
  read(start: number, row: number, limit: number, to: PlainTarget): number {
    const missed = this.missed;
    missed.fill(0);
    const r = laneRows(this, start, row, limit, to.values, to.lo, plainLoop);
    const read = r - row;
    for (let c = 0; c < missed.length; c++) {
      if (to.values[c] === null) continue;
      to.numeric[c] += read - missed[c];
      to.missing[c] += missed[c];
    }
    return r;
  }

  /** Whether the field is a missing-value marker (or empty). */
  marker(start: number, end: number): boolean {
    return this.#markers.test(this.bytes, start, end);
  }

  /** A number off the fast path (`DecimalParser.scan`); NaN unless it ends at `stop`. */
  slow(start: number, stop: number): number {
    const x = this.#parser.scan(this.bytes, start, this.bytes.length);
    this.lo = this.#parser.lo;
    return this.#parser.stop === stop ? x : NaN;
  }
}

/** What {@link plainLoop} reads of its lane (a {@link PlainRows}, or a helper thread's own). */
export type Lane = Pick<
  PlainRows,
  "bytes" | "end" | "delim" | "point" | "holes" | "missed" | "pos" | "lo" | "marker" | "slow"
>;

/**
 * The lane's loop (a function of its own, so the engine optimises it alone):
 * reads plain records into `values` and `los` from row `row`; sets
 * `lane.pos` and returns the next row (see {@link PlainRows.read}). It
 * refers to nothing outside itself but `productError` and `POW10`, so a
 * helper thread can be given its source (`_halves.ts`).
 */
export function plainLoop(
  lane: Lane,
  start: number,
  row: number,
  limit: number,
  values: readonly (Float64Array | null)[],
  los: readonly (Float64Array | null)[],
): number {
  const LF = 0x0a, CR = 0x0d, QUOTE = 0x22, MINUS = 0x2d, PLUS = 0x2b;
  const b = lane.bytes, end = lane.end, D = lane.delim, P = lane.point - 0x30;
  const n = values.length, last = n - 1;
  const holes = lane.holes, missed = lane.missed;
  let pos = start, r = row, rowStart = start;
  rows: while (r < limit) {
    while (pos < end && (b[pos] === LF || b[pos] === CR)) pos++;
    if (pos >= end) break;
    rowStart = pos;
    let nh = 0;
    for (let c = 0; c < n; c++) {
      const v = values[c];
      const fieldStart = pos;
      let i = pos, number = false;
      if (v !== null) {
        // [+-]? digits with at most one point ([eE] [+-]? digits)?  (digits before or after it)
        const ch = b[i];
        const neg = ch === MINUS;
        if (neg || ch === PLUS) i++;
        let a = 0, na = 0, z = 0, nz = 0, point = -1, d = 0;
        for (;;) {
          d = b[i] - 0x30;
          if (d >= 0 && d <= 9) {
            a = a * 10 + d;
            i++;
            if (++na === 9) break;
          } else if (d === P && point < 0) point = i++;
          else break;
        }
        if (na === 9) {
          for (;;) {
            d = b[i] - 0x30;
            if (d >= 0 && d <= 9) {
              z = z * 10 + d;
              i++;
              if (++nz === 9) break;
            } else if (d === P && point < 0) point = i++;
            else break;
          }
        }
        if (na > 0) {
          const digits = na + nz, frac = point < 0 ? 0 : i - point - 1;
          let exp = 0, expDigits = 0;
          if ((b[i] | 0x20) === 0x65) {
            i++;
            const eneg = b[i] === MINUS;
            if (eneg || b[i] === PLUS) i++;
            for (;;) {
              d = b[i] - 0x30;
              if (d < 0 || d > 9) break;
              expDigits++;
              if (exp < 100000) exp = exp * 10 + d;
              i++;
            }
            if (expDigits === 0) break rows; // "1e": not a number; the scanner says so
            if (eneg) exp = -exp;
          }
          const k = exp - frac, lc = los[c];
          let hi: number, lo = 0;
          if (digits <= 15 && k >= -22 && k <= 22) {
            const m = nz === 0 ? a : a * POW10[nz] + z;
            if (k >= 0) {
              const p = POW10[k];
              hi = m * p;
              if (lc !== null) lo = productError(m, p, hi);
            } else {
              const p = POW10[-k];
              hi = m / p;
              if (lc !== null) {
                const ph = hi * p;
                lo = ((m - ph) - productError(hi, p, ph)) / p;
              }
            }
            if (neg) {
              hi = -hi;
              lo = 0 - lo; // 0 - 0 is +0: no negative-zero corrections
            }
          } else {
            // Long mantissas (more digits may follow the 18 gathered) and large exponents.
            while (((d = b[i] - 0x30) >= 0 && d <= 9) || (d === P && point < 0)) {
              if (d === P) point = i;
              i++;
            }
            if ((b[i] | 0x20) === 0x65 && expDigits === 0) break rows; // an exponent after 18+ digits
            hi = lane.slow(fieldStart, i);
            if (hi !== hi) break rows;
            lo = lane.lo;
          }
          v[r] = hi;
          if (lc !== null) lc[r] = lo;
          number = true;
        }
      }
      if (!number) {
        // Not a number (or a column not parsed): the field must be plain ASCII.
        for (i = fieldStart;; i++) {
          const ch = b[i];
          if (ch === D || ch === LF || ch === CR) break;
          if (ch === QUOTE || ch >= 0x80) break rows;
        }
        if (v !== null) {
          if (!lane.marker(fieldStart, i)) break rows; // a stray value: the scanner keeps it
          v[r] = NaN;
          holes[nh++] = c;
        }
      }
      // The field's end: the delimiter, or after the last field a line end.
      const ch = b[i];
      if (c < last) {
        if (ch !== D) break rows;
        pos = i + 1;
      } else if (ch === LF) pos = i + 1;
      else if (ch === CR) pos = b[i + 1] === LF ? i + 2 : i + 1;
      else break rows;
    }
    for (let h = 0; h < nh; h++) missed[holes[h]]++;
    r++;
    rowStart = pos;
  }
  lane.pos = rowStart;
  return r;
}
