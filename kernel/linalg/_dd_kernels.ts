/**
 * Inner loops of the double-double least-squares path over parallel hi/lo
 * Float64Arrays, allocating nothing.
 *
 * Methods: the error-free transformations and the double-double + × ÷ √ of
 * `kernel/dd.ts` (TwoSum, Knuth; TwoProduct by Veltkamp splitting, Dekker
 * 1971; QD's dd_real), called as functions: V8 inlines them, and copies
 * written out inline here measured no faster (ddLeastSquares 10,000 × 10,
 * about 5 ms either way). The dot product accumulates the exact errors of
 * every product and sum in a second double, as Dot2 of Ogita, Rump & Oishi
 * 2005 ("Accurate sum and dot product", SIAM J. Sci. Comput. 26), with
 * double-double operands: the result is as accurate as if computed in twice
 * the working precision and then rounded, here about 2^−104 relative to
 * Σ|xᵢyᵢ|.
 *
 * @module
 */
import { addDD, divDD, fastSumError, mulDD, productError, sqrtDD, sumError } from "../dd.ts";

/** Result slot of the kernels: `[hi, lo]`. */
export const OUT = new Float64Array(2);

/**
 * OUT = s + Σ x[xo+i]·y[yo+i] for i < len, all values hi + lo.
 * (s is passed as sh, sl so the leading 1 of a Householder vector is cheap.)
 */
export function dot(
  sh: number,
  sl: number,
  xh: Float64Array,
  xl: Float64Array,
  xo: number,
  yh: Float64Array,
  yl: Float64Array,
  yo: number,
  len: number,
): void {
  let h = sh, l = sl;
  for (let i = 0; i < len; i++) {
    const a = xh[xo + i], b = yh[yo + i];
    const p = a * b;
    const pe = productError(a, b, p) + (a * yl[yo + i] + xl[xo + i] * b);
    const s = h + p;
    l += sumError(h, p, s) + pe;
    h = s;
  }
  const s = h + l;
  OUT[0] = s;
  OUT[1] = fastSumError(h, l, s);
}

/** y[yo+i] −= a·x[xo+i] for i < len (a = ah + al). */
export function axpy(
  ah: number,
  al: number,
  xh: Float64Array,
  xl: Float64Array,
  xo: number,
  yh: Float64Array,
  yl: Float64Array,
  yo: number,
  len: number,
): void {
  for (let i = 0; i < len; i++) {
    const b = xh[xo + i];
    const p = ah * b;
    const pe = productError(ah, b, p) + (ah * xl[xo + i] + al * b);
    const c = yh[yo + i];
    const s = c - p;
    const e = sumError(c, -p, s) + (yl[yo + i] - pe);
    const t = s + e;
    yh[yo + i] = t;
    yl[yo + i] = fastSumError(s, e, t);
  }
}

/** OUT = a·b (kernel/dd.ts `mulDD`). */
export const mul = (ah: number, al: number, bh: number, bl: number): void =>
  mulDD(ah, al, bh, bl, OUT);

/** OUT = a + b, accurate form (kernel/dd.ts `addDD`). */
export const add = (ah: number, al: number, bh: number, bl: number): void =>
  addDD(ah, al, bh, bl, OUT);

/** OUT = a/b, three partial quotients (kernel/dd.ts `divDD`). */
export const div = (ah: number, al: number, bh: number, bl: number): void =>
  divDD(ah, al, bh, bl, OUT);

/** OUT = √a for a > 0, one Newton step (kernel/dd.ts `sqrtDD`). */
export const sqrt = (ah: number, al: number): void => sqrtDD(ah, al, OUT);
