/**
 * Small symmetric positive definite systems (a fit's k×k cross-products):
 * Cholesky factor, solve and inverse, and the eigenvalues by cyclic Jacobi
 * rotations (Golub & Van Loan, Matrix Computations, 4th ed., §8.5), for the
 * condition number. Row-major k×k arrays.
 *
 * @module
 */

/**
 * The lower Cholesky factor L (A = LLᵀ), or null when A is not positive definite.
 *
 * @param a Row-major k×k symmetric matrix.
 * @param k Its order.
 * @example
 * ```ts
 * import { cholesky } from "./small_symmetric.ts";
 * const l = cholesky(new Float64Array([4, 2, 2, 3]), 2)!;
 * // exact arithmetic: L = [[2, 0], [1, √2]]
 * if (l[0] !== 2 || l[2] !== 1 || Math.abs(l[3] - Math.SQRT2) > 1e-15) throw new Error("L");
 * ```
 */
export function cholesky(a: Float64Array, k: number): Float64Array | null {
  const l = new Float64Array(k * k);
  for (let j = 0; j < k; j++) {
    let d = a[j * k + j];
    for (let t = 0; t < j; t++) d -= l[j * k + t] * l[j * k + t];
    if (!(d > 0)) return null;
    const ljj = Math.sqrt(d);
    l[j * k + j] = ljj;
    for (let i = j + 1; i < k; i++) {
      let s = a[i * k + j];
      for (let t = 0; t < j; t++) s -= l[i * k + t] * l[j * k + t];
      l[i * k + j] = s / ljj;
    }
  }
  return l;
}

/** Solves LLᵀx = b for the factor of {@link cholesky}. */
export function choleskySolve(l: Float64Array, k: number, b: ArrayLike<number>): Float64Array {
  const y = Float64Array.from(b);
  for (let i = 0; i < k; i++) {
    for (let t = 0; t < i; t++) y[i] -= l[i * k + t] * y[t];
    y[i] /= l[i * k + i];
  }
  for (let i = k - 1; i >= 0; i--) {
    for (let t = i + 1; t < k; t++) y[i] -= l[t * k + i] * y[t];
    y[i] /= l[i * k + i];
  }
  return y;
}

/** A⁻¹ (row-major) from the factor of {@link cholesky}. */
export function choleskyInverse(l: Float64Array, k: number): Float64Array {
  const inv = new Float64Array(k * k);
  const e = new Float64Array(k);
  for (let j = 0; j < k; j++) {
    e.fill(0);
    e[j] = 1;
    const x = choleskySolve(l, k, e);
    for (let i = 0; i < k; i++) inv[i * k + j] = x[i];
  }
  return inv;
}

/**
 * Eigenvalues of a symmetric matrix by cyclic Jacobi rotations, ascending.
 *
 * @param a Row-major k×k symmetric matrix (not changed).
 * @param k Its order.
 * @example
 * ```ts
 * import { symmetricEigenvalues } from "./small_symmetric.ts";
 * // exact arithmetic: the eigenvalues of [[2, 1], [1, 2]] are 1 and 3
 * const ev = symmetricEigenvalues(new Float64Array([2, 1, 1, 2]), 2);
 * if (Math.abs(ev[0] - 1) > 1e-14 || Math.abs(ev[1] - 3) > 1e-14) throw new Error("eigen");
 * ```
 */
export function symmetricEigenvalues(a: Float64Array, k: number): Float64Array {
  const m = Float64Array.from(a);
  for (let sweep = 0; sweep < 64; sweep++) {
    let off = 0;
    for (let i = 0; i < k; i++) for (let j = i + 1; j < k; j++) off += m[i * k + j] ** 2;
    if (off === 0) break;
    for (let p = 0; p < k; p++) {
      for (let q = p + 1; q < k; q++) {
        const apq = m[p * k + q];
        if (apq === 0) continue;
        const theta = (m[q * k + q] - m[p * k + p]) / (2 * apq);
        const t = Math.sign(theta || 1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1), s = t * c;
        for (let r = 0; r < k; r++) {
          const mrp = m[r * k + p], mrq = m[r * k + q];
          m[r * k + p] = c * mrp - s * mrq;
          m[r * k + q] = s * mrp + c * mrq;
        }
        for (let r = 0; r < k; r++) {
          const mpr = m[p * k + r], mqr = m[q * k + r];
          m[p * k + r] = c * mpr - s * mqr;
          m[q * k + r] = s * mpr + c * mqr;
        }
      }
    }
  }
  const ev = new Float64Array(k);
  for (let i = 0; i < k; i++) ev[i] = m[i * k + i];
  return ev.sort();
}
