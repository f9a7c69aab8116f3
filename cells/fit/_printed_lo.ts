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
 * Method: for k = 0, 1, … decimals, M = round(v·10^k) and M/10^k == v
 * (both exact below 2^53, the quotient correctly rounded) identifies the
 * decimal M·10^−k; then lo = (M − v·10^k)/10^k with v·10^k taken exactly
 * as p + e by TwoProduct (Dekker 1971), one rounding of lo's own size. The
 * number of decimals found is tried first on the next value, so a column of
 * like numbers costs one try a value. Integers, and values needing more
 * than 15 significant digits, keep lo = 0.
 *
 * @module
 */
import { productError } from "../../kernel/dd.ts";

const POW10 = Array.from({ length: 23 }, (_, k) => 10 ** k); // exact up to 10^22
/** Digits M of a decimal M·10^−k are kept below 10^15 (15 significant digits). */
const LIMIT = 1e15;

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
  let out: Float64Array | null = null;
  let guess = 1;
  for (let i = 0; i < n; i++) {
    const v = values[i];
    if (Number.isInteger(v) || !Number.isFinite(v) || Math.abs(v) >= LIMIT) continue;
    const k = decimals(v, guess);
    if (k < 0) continue;
    guess = k;
    const t = POW10[k], p = v * t, m = Math.round(p);
    const lo = ((m - p) - productError(v, t, p)) / t;
    if (lo === 0) continue;
    out ??= new Float64Array(n);
    out[i] = lo;
  }
  return out;
}

/**
 * Some k ≤ 22 with round(v·10^k)/10^k == v and |M| < 10^15, or −1. With at
 * most 15 digits every such k names the same decimal (v·10^k is then within
 * 1/8 of an integer's ulp of M, so M is the shortest decimal's digits padded
 * with zeros), so the last column's k is tried first.
 */
function decimals(v: number, guess: number): number {
  if (fits(v, guess)) return guess;
  for (let k = 1; k < POW10.length; k++) {
    const m = Math.round(v * POW10[k]);
    if (Math.abs(m) >= LIMIT) return -1;
    if (m / POW10[k] === v) return k;
  }
  return -1;
}

function fits(v: number, k: number): boolean {
  const m = Math.round(v * POW10[k]);
  return Math.abs(m) < LIMIT && m / POW10[k] === v;
}
