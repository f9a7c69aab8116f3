/**
 * Condition number of a design matrix: σ_max/σ_min, its 2-norm condition.
 *
 * Method: the pivoted Householder QR X·P = Q·R of kernel/linalg leaves the
 * singular values unchanged (Q, P orthogonal), so they are those of the p×p
 * R, found by one-sided Jacobi (`singularValues`; Golub & Van Loan,
 * *Matrix Computations*, 4th ed., §8.6.3). The design is not scaled, so
 * the number reflects the units of the columns (and includes the intercept
 * column), as Belsley, Kuh & Welsch (1980, §3.2) describe before they
 * recommend scaling. For a weighted fit the rows are scaled by √wᵢ: that is
 * the matrix the fit factors. For a nonlinear fit the check passes the
 * Jacobian at the estimates (the free parameters' columns): the number is
 * then the conditioning of the problem linearised there, a local quantity
 * that depends on the parameters' units as a design's does on its columns'.
 *
 * @module
 */
import { householderQR, singularValues } from "../linalg/mod.ts";
import { scaleRows } from "./_auxiliary.ts";

/**
 * σ_max/σ_min of the (√w-scaled) design.
 *
 * @param design Columns, each n long (n ≥ number of columns).
 * @param weights wᵢ per row, or null.
 * @returns The ratio; null when σ_min is 0 (or there are fewer rows than columns).
 * @throws {RangeError} For no columns or non-finite entries.
 * @example
 * ```ts
 * import { conditionNumber } from "./condition_number.ts";
 * // diag(3, 1) stacked with a zero row: singular values 3 and 1 (hand computation).
 * const c = conditionNumber([new Float64Array([3, 0, 0]), new Float64Array([0, 1, 0])], null);
 * if (Math.abs(c! - 3) > 1e-14) throw new Error(String(c));
 * ```
 */
export function conditionNumber(
  design: readonly Float64Array[],
  weights: Float64Array | null,
): number | null {
  if (design.length === 0) {
    throw new RangeError("Cannot compute a condition number: the design has no columns");
  }
  const n = design[0].length, p = design.length;
  if (n < p) return null;
  const cols = scaleRows(design, weights);
  const a = new Float64Array(n * p);
  cols.forEach((c, j) => a.set(c, j * n));
  const f = householderQR(a, n, p);
  const r = new Float64Array(p * p);
  for (let j = 0; j < p; j++) for (let i = 0; i <= j; i++) r[i + j * p] = f.qr[i + j * n];
  const s = singularValues(r, p, p);
  return s[p - 1] > 0 ? s[0] / s[p - 1] : null;
}
