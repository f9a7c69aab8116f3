/**
 * Decimal text → correctly rounded double, plus the double-double correction.
 *
 * Method
 * - Fast path (Clinger 1990, "How to read floating point numbers accurately",
 *   PLDI '90, §"fast path"; the case also in Gay 1990): when the decimal
 *   mantissa M is an integer below 2^53 and the power of ten k has |k| ≤ 22,
 *   both M and 10^|k| are exact doubles, so one IEEE multiply (k ≥ 0) or
 *   divide (k < 0) gives the correctly rounded result.
 * - Otherwise the text goes to `Number()`, which ECMAScript specifies as
 *   correctly rounded (round to nearest, ties to even).
 * - Correction `lo`, so that hi + lo equals the decimal to about 2^-106
 *   relative (double-double):
 *   - fast path, k ≥ 0: lo is the exact error of the product M·10^k, by
 *     Dekker's TwoProduct with Veltkamp's splitting (Dekker 1971, "A
 *     floating-point technique for extending the available precision",
 *     Numer. Math. 18, §5 mul12; `productError` of `kernel/dd.ts`; both
 *     factors are below 2^996, so no scaling is needed);
 *   - fast path, k < 0: the remainder r = M − hi·10^|k| is an exact double
 *     (the remainder of a correctly rounded division is representable; Dekker
 *     1971 §5 div12 relies on it); it is computed exactly as (M − p) − e with
 *     TwoProduct(hi, 10^|k|) = p + e (M − p is exact by Sterbenz's lemma), and
 *     lo = r / 10^|k| (one rounding, relative 2^-53 of a term already 2^-53
 *     below hi);
 *   - slow path: exact rational arithmetic with BigInt (see `_exact_lo.ts`).
 *
 * Grammar accepted (after trimming spaces and tabs): `[+-]? digits [. digits]?
 * ([eE] [+-]? digits)?` or `[+-]? . digits (…)`, with `,` instead of `.` when
 * the decimal separator is a comma. No hex, no `Infinity`, no thousands
 * separators: such fields are not numbers.
 *
 * @module
 */
import { productError } from "../dd.ts";
import { exactLo } from "./_exact_lo.ts";

/** 10^0 … 10^22, each an exact double: 10^k = 5^k · 2^k and 5^22 < 2^53. */
export const POW10: Float64Array = (() => {
  const p = new Float64Array(23);
  let v = 1;
  for (let i = 0; i <= 22; i++) {
    p[i] = v;
    v *= 10;
  }
  return p;
})();

/** 2^53 − 1: mantissas up to this are exact doubles (Clinger's fast path). */
export const MAX_EXACT = 9007199254740991;

/** Options of {@link DecimalParser}. */
export interface DecimalParserOptions {
  /** Decimal separator: "." (default) or ",". */
  decimal?: "." | ",";
  /** Compute {@link DecimalParser.lo} (default true). */
  wantLo?: boolean;
}

/**
 * Parses decimal numbers from byte ranges without building strings on the
 * fast path. One parser is reused for every field; after a successful
 * {@link DecimalParser.parse} the correction is in {@link DecimalParser.lo}.
 *
 * @example
 * ```ts
 * import { DecimalParser } from "./decimal_parser.ts";
 * const p = new DecimalParser();
 * const x = p.parse(new TextEncoder().encode("0.1"), 0, 3);
 * if (x !== 0.1) throw new Error("0.1 must round to the double 0.1");
 * // The double 0.1 is 0.1000000000000000055511151231257827…: lo is about -5.55e-18.
 * if (!(p.lo < 0 && p.lo > -1e-17)) throw new Error("the double 0.1 is above 1/10: lo is negative");
 * ```
 */
export class DecimalParser {
  /** Correction of the last parsed value: value + lo ≈ the decimal (0 when not wanted). */
  lo = 0;
  /** Whether `lo` is computed. */
  wantLo: boolean;
  /** The decimal separator's byte. */
  readonly decimalByte: number;

  /**
   * @param options Decimal separator and whether to compute the correction.
   */
  constructor(options: DecimalParserOptions = {}) {
    this.decimalByte = options.decimal === "," ? 0x2c : 0x2e;
    this.wantLo = options.wantLo ?? true;
  }

  /** After {@link DecimalParser.scan}: one past the last byte it consumed. */
  stop = 0;

  /**
   * Parses `bytes[start, end)` as a decimal number, allowing spaces and tabs around it.
   *
   * @param bytes The buffer.
   * @param start First byte of the field.
   * @param end One past the last byte.
   * @returns The correctly rounded double, or NaN when the text is not a
   *   number in the accepted grammar (empty text included).
   */
  parse(bytes: Uint8Array, start: number, end: number): number {
    let i = start, e = end;
    if (i < e && bytes[i] <= 0x20) {
      while (i < e && (bytes[i] === 0x20 || bytes[i] === 0x09)) i++;
    }
    if (e > i && bytes[e - 1] <= 0x20) {
      while (e > i && (bytes[e - 1] === 0x20 || bytes[e - 1] === 0x09)) e--;
    }
    const x = this.scan(bytes, i, e);
    return this.stop === e ? x : NaN;
  }

  /**
   * Reads the longest decimal number starting at `start` (no spaces), for a
   * scanner that parses while it looks for the end of a field. The caller
   * checks that {@link DecimalParser.stop} is where the field ends.
   *
   * @param bytes The buffer.
   * @param start Where the number should begin.
   * @param end Do not read at or beyond this index.
   * @returns The correctly rounded double of `bytes[start, stop)`, or NaN
   *   when no number begins there.
   */
  scan(bytes: Uint8Array, start: number, end: number): number {
    let i = start, neg = false;
    if (i < end && (bytes[i] === 0x2d || bytes[i] === 0x2b)) {
      neg = bytes[i] === 0x2d;
      i++;
    }
    let m = 0, exact = true, frac = 0, digits = 0;
    for (; i < end; i++) {
      const d = bytes[i] - 0x30;
      if (d < 0 || d > 9) break;
      digits++;
      const t = m * 10 + d;
      if (t > MAX_EXACT) exact = false;
      else m = t;
    }
    if (i < end && bytes[i] === this.decimalByte) {
      for (i++; i < end; i++) {
        const d = bytes[i] - 0x30;
        if (d < 0 || d > 9) break;
        digits++;
        frac++;
        const t = m * 10 + d;
        if (t > MAX_EXACT) exact = false;
        else m = t;
      }
    }
    this.stop = i;
    if (digits === 0) return NaN;
    let exp = 0;
    if (i < end && (bytes[i] | 0x20) === 0x65) {
      i++;
      let eneg = false;
      if (i < end && (bytes[i] === 0x2d || bytes[i] === 0x2b)) {
        eneg = bytes[i] === 0x2d;
        i++;
      }
      const es = i;
      for (; i < end; i++) {
        const d = bytes[i] - 0x30;
        if (d < 0 || d > 9) break;
        if (exp < 100000) exp = exp * 10 + d; // beyond this the value is 0 or infinite anyway
      }
      this.stop = i;
      if (i === es) return NaN;
      if (eneg) exp = -exp;
    }
    const k = exp - frac;
    if (exact && k >= -22 && k <= 22) return this.fast(m, k, neg);
    return this.slow(bytes, start, i);
  }

  /** Clinger's fast path with Dekker's exact residual. */
  private fast(m: number, k: number, neg: boolean): number {
    let hi: number, lo = 0;
    if (k >= 0) {
      const p = POW10[k];
      hi = m * p;
      if (this.wantLo) lo = productError(m, p, hi);
    } else {
      const p = POW10[-k];
      hi = m / p;
      if (this.wantLo) {
        const ph = hi * p;
        const r = (m - ph) - productError(hi, p, ph);
        lo = r / p;
      }
    }
    this.lo = neg ? 0 - lo : lo; // 0 - 0 is +0: no negative-zero corrections
    return neg ? -hi : hi;
  }

  /** Long mantissas or large exponents: `Number()` and BigInt residual. */
  private slow(bytes: Uint8Array, start: number, end: number): number {
    let s = "";
    for (let i = start; i < end; i++) {
      const c = bytes[i];
      s += String.fromCharCode(c === this.decimalByte ? 0x2e : c);
    }
    const hi = Number(s);
    this.lo = this.wantLo ? exactLo(s, hi) : 0;
    return hi;
  }
}

/**
 * Parses one decimal string (a convenience over {@link DecimalParser} for
 * tests and inline values).
 *
 * @param text Decimal text such as "2.5e-3".
 * @param decimal Decimal separator, "." by default.
 * @returns `[hi, lo]`, or `[NaN, 0]` when `text` is not a number.
 * @example
 * ```ts
 * import { parseDecimal } from "./decimal_parser.ts";
 * const [hi, lo] = parseDecimal("1e23");
 * if (hi !== 1e23 || lo === 0) throw new Error("1e23 is not a double: lo must be non-zero");
 * ```
 */
export function parseDecimal(text: string, decimal: "." | "," = "."): [number, number] {
  const bytes = new TextEncoder().encode(text);
  const p = new DecimalParser({ decimal });
  const hi = p.parse(bytes, 0, bytes.length);
  return [hi, Number.isNaN(hi) ? 0 : p.lo];
}
