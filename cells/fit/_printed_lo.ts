/**
 * The decimal correction of a number whose table kept none: lo such that
 * v + lo is the shortest decimal that rounds to the double v.
 *
 * Why: the table keeps each number's correction (`NumberColumn.lo`, the
 * printed decimal less its double) only up to 4,000,000 numbers
 * (DEVELOPERS.md, "Numbers in a table"). A decimal of at most 15 significant
 * digits survives the trip through a double and is the shortest decimal
 * that rounds back to it (DBL_DIG = 15; IEEE 754-2008 §5.12.2), so for data
 * printed with 15 digits or fewer this recovers the decimal as printed, as
 * the table does for inline rows (cells/table/_read_source.ts).
 *
 * Method: with e = ⌊log₁₀|v|⌋ and k = min(22, 14 − e) decimals, M =
 * round(v·10^k) has at most 15 digits, and M/10^k == v (both exact below
 * 2^53, the quotient correctly rounded) exactly when v is the double of a
 * decimal of at most 15 significant digits: v·10^k is then within 0.2 of
 * that decimal's digits padded with zeros (|v·10^k| < 10^15, so the rounding
 * of v and of the product add at most 10^15·2^−53 + 2^−4), and two distinct
 * decimals of 15 digits are more than an ulp apart, so the one found is the
 * printed one. Then lo = (M − v·10^k)/10^k with v·10^k taken exactly as p + e
 * by TwoProduct (Dekker 1971), one rounding of lo's own size. Integers, and
 * values needing more than 15 significant digits, keep lo = 0. Taking k from
 * e (not trying k = 1, 2, … from the last value's) makes each value's lo
 * independent of its neighbours, so a block of rows gives the same
 * corrections as the whole column, and costs one try a value.
 *
 * Speed: the same computation runs in WebAssembly a block of values at a
 * time (kernel/csv/printed_lo.ts: the same bits, about four times as fast);
 * {@link correction} here is its reference and its fallback.
 *
 * @module
 */
import { productError } from "../../kernel/dd.ts";
import { wasmCorrections } from "../../kernel/csv/printed_lo.ts";
import type { DDColumn } from "./_dd_design.ts";

const POW10 = Array.from({ length: 23 }, (_, k) => 10 ** k); // exact up to 10^22
/** Digits M of a decimal M·10^−k are kept below 10^15 (15 significant digits). */
const LIMIT = 1e15;
/** The doubles nearest 10^−8 … 10^14: the decades {@link decade} tells apart. */
const DECADES = Array.from({ length: 23 }, (_, i) => Number(`1e${i - 8}`));

/** ⌊log₁₀ a⌋ for 10^−8 ≤ a < 10^15 (against the doubles nearest the powers); −9 below. */
function decade(a: number): number {
  let lo = 0, hi = DECADES.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (a >= DECADES[mid]) lo = mid + 1;
    else hi = mid;
  }
  return lo - 9;
}

/** The correction of one value (see the module notes); 0 when there is none to recover. */
export function correction(v: number): number {
  if (Number.isInteger(v) || !Number.isFinite(v) || Math.abs(v) >= LIMIT) return 0;
  let k = Math.min(22, 14 - decade(Math.abs(v)));
  let t = POW10[k], p = v * t, m = Math.round(p);
  if (Math.abs(m) >= LIMIT && k > 0) {
    // v just under a power of ten whose double is above it: one decimal fewer.
    t = POW10[--k], p = v * t, m = Math.round(p);
  }
  if (!(Math.abs(m) < LIMIT) || m / t !== v) return 0;
  return ((m - p) - productError(v, t, p)) / t;
}

/**
 * The corrections of a column of doubles taken as printed decimals.
 *
 * @param values The doubles.
 * @returns lo per value, or null when every correction is 0 (integers, binary fractions).
 * @example
 * ```ts
 * import { printedLo } from "./_printed_lo.ts";
 * const lo = printedLo(Float64Array.of(0.1, 2, 88.2))!;
 * // The double 0.1 is 0.1000000000000000055511151231257827…: lo ≈ −5.55e−18.
 * if (!(lo[0] < -5.5e-18 && lo[0] > -5.6e-18) || lo[1] !== 0) throw new Error(String(lo));
 * ```
 */
export function printedLo(values: ArrayLike<number>): Float64Array | null {
  const n = values.length;
  if (values instanceof Float64Array && n >= 1024) {
    const all = new Float64Array(n);
    const some = wasmCorrections(values, 0, n, all);
    if (some >= 0) return some > 0 ? all : null;
  }
  let out: Float64Array | null = null;
  for (let i = 0; i < n; i++) {
    const lo = correction(values[i]);
    if (lo === 0) continue;
    out ??= new Float64Array(n);
    out[i] = lo;
  }
  return out;
}

/**
 * A column as printed whose corrections are recovered from its doubles only
 * when read: whole through `lo` (computed once), or a block of rows at a time
 * through {@link PrintedColumn.block} into a buffer the caller reuses (the
 * refinement at scale: no column-long array of corrections, whose memory
 * costs more to touch than the corrections to compute).
 */
export class PrintedColumn implements DDColumn {
  #lo: Float64Array | null | undefined = undefined;

  /** @param hi The column's doubles. */
  constructor(readonly hi: Float64Array) {}

  /** The whole column's corrections (computed on first read), or null when all are 0. */
  get lo(): Float64Array | null {
    if (this.#lo === undefined) this.#lo = printedLo(this.hi);
    return this.#lo;
  }

  /**
   * The corrections of rows start … start + len − 1.
   *
   * @param start First row.
   * @param len Number of rows.
   * @param out A buffer of at least `len` values, written when the column's
   *   corrections are not already whole.
   * @returns Their corrections (a view of the whole ones, or `out`).
   */
  block(start: number, len: number, out: Float64Array): Float64Array {
    if (this.#lo === null) return out.fill(0, 0, len);
    if (this.#lo !== undefined) return this.#lo.subarray(start, start + len);
    const hi = this.hi;
    if (wasmCorrections(hi, start, len, out) >= 0) return out;
    for (let i = 0; i < len; i++) out[i] = correction(hi[start + i]);
    return out;
  }
}
