/**
 * (JᵀJ)⁻¹ at a least-squares solution from the pivoted QR of J, never
 * forming JᵀJ: MINPACK's `covar` step (Moré, Garbow & Hillstrom 1980,
 * ANL-80-74, the routine that follows `lmder`), with the columns of J first
 * scaled to unit length (equilibration; van der Sluis 1969, "Condition
 * numbers and equilibration of matrices", Numer. Math. 14) so that the rank
 * decision does not depend on the parameters' units.
 *
 * ```
 *  J·E⁻¹ = Q·R·Pᵀ    E = diag(‖J_j‖)
 *  (JᵀJ)⁻¹ = E⁻¹·P·R⁻¹·R⁻ᵀ·Pᵀ·E⁻¹
 * ```
 *
 * Rank: |R_kk| ≤ tol·|R_00| marks column k (and those after it) as not
 * identifiable; default tol = 10·max(m, n)·ε (common practice, no source).
 *
 * @module
 */
import { qrfac } from "./qrfac.ts";

const EPS = 2.220446049250313e-16;

/** The unscaled covariance, or which parameters are not identifiable. */
export interface Covariance {
  /** (JᵀJ)⁻¹, n×n column-major; NaN rows and columns for unidentifiable parameters. */
  unscaled: Float64Array;
  /** Numerical rank of J. */
  rank: number;
  /** Parameter indexes (ascending) not identifiable at this point: columns beyond the rank. */
  unidentifiable: number[];
}

/**
 * Computes (JᵀJ)⁻¹ (see the module doc).
 *
 * @param m Rows of J.
 * @param n Columns of J (parameters).
 * @param jac J, m×n column-major; not modified.
 * @param tol Relative rank tolerance on the equilibrated R.
 * @returns The covariance and the rank.
 * @example
 * ```ts
 * import { covar } from "./covar.ts";
 * // J = [1 0; 0 2; 0 0]: JᵀJ = diag(1, 4), its inverse diag(1, 0.25).
 * const c = covar(3, 2, new Float64Array([1, 0, 0, 0, 2, 0]));
 * if (c.rank !== 2 || c.unscaled[0] !== 1 || c.unscaled[3] !== 0.25) throw new Error("covar");
 * ```
 */
export function covar(
  m: number,
  n: number,
  jac: Float64Array,
  tol = 10 * Math.max(m, n) * EPS,
): Covariance {
  const a = new Float64Array(m * n), e = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    let s = 0;
    for (let i = 0; i < m; i++) s += jac[i + j * m] ** 2;
    e[j] = Math.sqrt(s);
    const inv = e[j] === 0 ? 0 : 1 / e[j];
    for (let i = 0; i < m; i++) a[i + j * m] = jac[i + j * m] * inv;
  }
  const { ipvt, rdiag } = qrfac(m, n, a, true);
  const r0 = Math.abs(rdiag[0]);
  let rank = 0;
  while (rank < Math.min(m, n) && Math.abs(rdiag[rank]) > tol * r0 && e[ipvt[rank]] !== 0) rank++;
  const unscaled = new Float64Array(n * n).fill(NaN);
  const unidentifiable = Array.from(ipvt.subarray(rank)).sort((x, y) => x - y);
  if (rank < n) return { unscaled, rank, unidentifiable };
  // R's diagonal is in rdiag, its strict upper triangle in a; invert in place into w.
  const R = (i: number, j: number) => (i === j ? rdiag[i] : a[i + j * m]);
  const w = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    w[j + j * n] = 1 / R(j, j);
    for (let i = j - 1; i >= 0; i--) {
      let s = 0;
      for (let l = i + 1; l <= j; l++) s += R(i, l) * w[l + j * n];
      w[i + j * n] = -s / R(i, i);
    }
  }
  // C = R⁻¹R⁻ᵀ, then undo the permutation and the equilibration.
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      let s = 0;
      for (let l = j; l < n; l++) s += w[i + l * n] * w[j + l * n];
      const pi = ipvt[i], pj = ipvt[j];
      const v = s / (e[pi] * e[pj]);
      unscaled[pi + pj * n] = v;
      unscaled[pj + pi * n] = v;
    }
  }
  return { unscaled, rank, unidentifiable };
}
