/**
 * The Euclidean norm without destructive underflow or overflow, as MINPACK's
 * `enorm` (Moré, Garbow & Hillstrom 1980, *User Guide for MINPACK-1*,
 * ANL-80-74). Deviation: instead of MINPACK's three-range accumulation we sum
 * squares directly (fast path) and rescale by the largest magnitude only when
 * that sum underflows or overflows; the result is the same to rounding.
 *
 * @module
 */

/**
 * ‖x[from … to-1]‖₂, safe against underflow and overflow.
 *
 * @param x The vector (or a column of a column-major matrix).
 * @param from First index (default 0).
 * @param to One past the last index (default `x.length`).
 * @returns The norm; NaN when an element is NaN, Infinity when one is infinite.
 * @example
 * ```ts
 * import { enorm } from "./enorm.ts";
 * if (Math.abs(enorm(new Float64Array([3e200, 4e200])) / 5e200 - 1) > 1e-15) throw new Error("overflow");
 * if (enorm(new Float64Array([3, 4])) !== 5) throw new Error("3-4-5");
 * ```
 */
export function enorm(x: ArrayLike<number>, from = 0, to = x.length): number {
  let s = 0;
  for (let i = from; i < to; i++) s += x[i] * x[i];
  if (s > 1e-290 && s < 1e290) return Math.sqrt(s);
  if (Number.isNaN(s)) return NaN;
  let big = 0;
  for (let i = from; i < to; i++) big = Math.max(big, Math.abs(x[i]));
  if (big === 0 || big === Infinity) return big;
  s = 0;
  for (let i = from; i < to; i++) {
    const t = x[i] / big;
    s += t * t;
  }
  return big * Math.sqrt(s);
}
