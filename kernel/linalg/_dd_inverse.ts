/**
 * What the double-double least-squares solve keeps of its factorization:
 * R̃ itself (hi + lo, for quadratic forms through `triangular_factor.ts`)
 * and the unscaled covariance (XᵀX)⁻¹ = S·P·R̃⁻¹R̃⁻ᵀ·Pᵀ·S, R̃⁻¹ column by
 * column as LAPACK DTRTRI (Golub & Van Loan, *Matrix Computations*, 4th
 * ed., §3.1 and §5.3.3), each step in double-double (`_dd_kernels.ts`).
 *
 * @module
 */
import * as K from "./_dd_kernels.ts";
import type { TriangularFactor } from "./triangular_factor.ts";

/** The leading p×p block of the factored matrix (R̃, hi and lo) with its order and scales. */
export function factorOf(
  ah: Float64Array,
  al: Float64Array,
  m: number,
  p: number,
  order: ArrayLike<number>,
  scale: number[],
): TriangularFactor {
  const r = new Float64Array(p * p), rLo = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    for (let i = 0; i <= j; i++) {
      r[i + j * p] = ah[i + j * m];
      rLo[i + j * p] = al[i + j * m];
    }
  }
  return { p, order: Int32Array.from(order), scale: Float64Array.from(scale), r, rLo };
}

/** (XᵀX)⁻¹ from R⁻¹R⁻ᵀ (DTRTRI, then the product), undoing order and scales. */
export function covariance(
  ah: Float64Array,
  al: Float64Array,
  m: number,
  p: number,
  order: ArrayLike<number>,
  scale: number[],
): Float64Array {
  // R⁻¹ column by column: X[j,j] = 1/R[j,j]; X[i,j] = −(Σ_{l=i+1..j} R[i,l]·X[l,j])/R[i,i].
  const xh = new Float64Array(p * p), xl = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    K.div(1, 0, ah[j + j * m], al[j + j * m]);
    xh[j + j * p] = K.OUT[0];
    xl[j + j * p] = K.OUT[1];
    for (let i = j - 1; i >= 0; i--) {
      let sh = 0, sl = 0;
      for (let l = i + 1; l <= j; l++) {
        K.mul(ah[i + l * m], al[i + l * m], xh[l + j * p], xl[l + j * p]);
        K.add(sh, sl, K.OUT[0], K.OUT[1]);
        sh = K.OUT[0], sl = K.OUT[1];
      }
      K.div(-sh, -sl, ah[i + i * m], al[i + i * m]);
      xh[i + j * p] = K.OUT[0];
      xl[i + j * p] = K.OUT[1];
    }
  }
  const cov = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let j = i; j < p; j++) {
      let sh = 0, sl = 0;
      for (let l = j; l < p; l++) {
        K.mul(xh[i + l * p], xl[i + l * p], xh[j + l * p], xl[j + l * p]);
        K.add(sh, sl, K.OUT[0], K.OUT[1]);
        sh = K.OUT[0], sl = K.OUT[1];
      }
      const a = order[i], b = order[j];
      const v = (sh + sl) * scale[a] * scale[b];
      cov[a + b * p] = v;
      cov[b + a * p] = v;
    }
  }
  return cov;
}
