/**
 * The total sum of squares of R² in double-double, from a response given as
 * hi + lo pairs (the data as printed): Σ(vᵢ − v̄)² or Σvᵢ², with the mean
 * formed in double-double first (two passes: Chan, Golub & LeVeque 1983,
 * "Algorithms for computing the sample variance", Am. Stat. 37, recommend
 * the two-pass form; from memory); each sum and square carries its exact
 * rounding error in a second double (Dot2 of Ogita, Rump & Oishi 2005,
 * "Accurate sum and dot product", SIAM J. Sci. Comput. 26), with the
 * error-free transformations of `kernel/dd.ts`.
 *
 * @module
 */
import * as K from "./_dd_kernels.ts";
import { fastSumError, productError, sumError } from "../dd.ts";
import type { DDVector } from "./dd_least_squares.ts";

/**
 * Σ(vᵢ − v̄)² (centred) or Σvᵢ² in double-double, rounded to a double:
 * the total sum of squares of a fit's R² from the response as printed.
 * The mean is formed in double-double first (two passes; no cancellation
 * beyond the data's own 32 digits).
 *
 * @param v The values, hi + lo.
 * @param centred Subtract the mean first.
 * @returns The sum of squares (0 for a constant v when centred).
 * @example
 * ```ts
 * import { ddSumOfSquares } from "./dd_sum_of_squares.ts";
 * if (ddSumOfSquares({ hi: [1, 2, 3], lo: null }, true) !== 2) throw new Error("unexpected");
 * ```
 */
export function ddSumOfSquares(v: DDVector, centred: boolean): number {
  const m = v.hi.length, lo = v.lo;
  let mh = 0, ml = 0;
  if (centred && m > 0) {
    let sh = 0, sl = 0; // Σv with every sum's exact error carried (compensated, Ogita, Rump & Oishi 2005)
    for (let i = 0; i < m; i++) {
      const a = v.hi[i], t = sh + a;
      sl += sumError(sh, a, t) + (lo === null ? 0 : lo[i]);
      sh = t;
    }
    K.div(sh, sl, m, 0);
    mh = K.OUT[0], ml = K.OUT[1];
  }
  let sh = 0, sl = 0;
  for (let i = 0; i < m; i++) {
    // d = v − mean in double-double, then d² accumulated with its exact errors (Dot2)
    const a = v.hi[i] - mh;
    const e = sumError(v.hi[i], -mh, a) + ((lo === null ? 0 : lo[i]) - ml);
    const dh = a + e, dl = fastSumError(a, e, dh);
    const q = dh * dh, t = sh + q;
    sl += sumError(sh, q, t) + (productError(dh, dh, q) + 2 * dh * dl);
    sh = t;
  }
  return sh + sl;
}
