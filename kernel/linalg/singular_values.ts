/**
 * Singular values of a small matrix by one-sided Jacobi rotations.
 *
 * Method: one-sided (Hestenes 1958, "Inversion of matrices by
 * biorthogonalization and related results", J. SIAM 6) Jacobi: plane
 * rotations on pairs of columns until every pair is orthogonal to working
 * precision; the singular values are then the column norms (Golub & Van Loan,
 * *Matrix Computations*, 4th ed., §8.6.3 "Jacobi SVD procedures"; rotation
 * formulas of the symmetric Schur step, §8.5.2; section numbers from memory).
 * Demmel & Veselić (1992, SIAM J. Matrix Anal. Appl. 13) show this attains high
 * relative accuracy, which is why it suits the condition estimate of R, where
 * the smallest singular value is the one that matters.
 *
 * Meant for the p×p R factor of a least-squares problem (p up to a few
 * dozen): O(p³) per sweep, typically 5–10 sweeps.
 *
 * @module
 */

const MAX_SWEEPS = 60;

/**
 * Singular values of a column-major m×n matrix, largest first.
 *
 * @param a Column-major m×n entries; copied, never modified.
 * @param m Number of rows.
 * @param n Number of columns.
 * @returns The n singular values in non-increasing order (for m ≥ n; with m < n
 *   the trailing n − m are zero up to rounding).
 * @throws {RangeError} When `a` is not m·n long or the rotations do not converge.
 * @example
 * ```ts
 * import { singularValues } from "./singular_values.ts";
 * // [[3, 0], [4, 5]] has singular values √45 and √5 (hand computation of AᵀA)
 * const s = singularValues(new Float64Array([3, 4, 0, 5]), 2, 2);
 * if (Math.abs(s[0] - Math.sqrt(45)) > 1e-14 || Math.abs(s[1] - Math.sqrt(5)) > 1e-14) {
 *   throw new Error("unexpected");
 * }
 * ```
 */
export function singularValues(a: Float64Array, m: number, n: number): Float64Array {
  if (a.length !== m * n) {
    throw new RangeError(`Cannot take singular values: expected ${m * n} entries, got ${a.length}`);
  }
  const b = a.slice();
  for (let sweep = 0; sweep < MAX_SWEEPS; sweep++) {
    let rotated = false;
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) rotated = rotatePair(b, m, p, q) || rotated;
    }
    if (!rotated) return columnNormsSorted(b, m, n);
  }
  throw new RangeError(
    `Cannot take singular values: Jacobi rotations did not converge in ${MAX_SWEEPS} sweeps`,
  );
}

/** Orthogonalizes columns p and q; returns whether a rotation was needed. */
function rotatePair(b: Float64Array, m: number, p: number, q: number): boolean {
  const op = p * m, oq = q * m;
  let alpha = 0, beta = 0, gamma = 0;
  for (let i = 0; i < m; i++) {
    const x = b[op + i], y = b[oq + i];
    alpha += x * x;
    beta += y * y;
    gamma += x * y;
  }
  if (gamma === 0 || Math.abs(gamma) <= Number.EPSILON * Math.sqrt(alpha * beta)) return false;
  // Symmetric Schur step on [[alpha, gamma], [gamma, beta]]: the smaller root t = tan θ.
  const zeta = (beta - alpha) / (2 * gamma);
  const t = (zeta >= 0 ? 1 : -1) / (Math.abs(zeta) + Math.sqrt(1 + zeta * zeta));
  const c = 1 / Math.sqrt(1 + t * t), s = c * t;
  for (let i = 0; i < m; i++) {
    const x = b[op + i], y = b[oq + i];
    b[op + i] = c * x - s * y;
    b[oq + i] = s * x + c * y;
  }
  return true;
}

function columnNormsSorted(b: Float64Array, m: number, n: number): Float64Array {
  const s = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    let t = 0;
    for (let i = 0; i < m; i++) t += b[i + j * m] * b[i + j * m];
    s[j] = Math.sqrt(t);
  }
  return s.sort().reverse();
}
