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
 * From a fit's own triangular factor ({@link conditionNumberOfFactor}), with
 * no second QR of the n × p design: the factor is X̃·P = Q₁·R̃ with
 * X̃ = √W·X·S (S the power-of-two column scales, exact), so
 * √W·X·P = Q₁·(R̃·S_π⁻¹), S_π the scales in pivot order, and the singular
 * values of √W·X are those of the p × p matrix R̃·S_π⁻¹, as the linear
 * solver finds its own `conditionEstimate`.
 *
 * @module
 */
import { householderQR, singularValues, type TriangularFactor } from "../linalg/mod.ts";
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

/**
 * σ_max/σ_min of the design the factor was made from.
 *
 * @param f The factor (its hi parts are used; a double-double factor's lo parts are below
 *   what the ratio can show).
 * @returns The ratio; null when σ_min is 0.
 * @example
 * ```ts
 * import { factorOfQR, householderQR } from "../linalg/mod.ts";
 * import { conditionNumberOfFactor } from "./condition_number.ts";
 * // diag(3, 1) stacked with a zero row, the first column scaled by 1/4 before factoring:
 * // singular values 3 and 1 (hand computation).
 * const f = factorOfQR(householderQR(Float64Array.of(0.75, 0, 0, 0, 1, 0), 3, 2), Float64Array.of(0.25, 1));
 * if (Math.abs(conditionNumberOfFactor(f)! - 3) > 1e-14) throw new Error();
 * ```
 */
export function conditionNumberOfFactor(f: TriangularFactor): number | null {
  const { p, order, scale } = f;
  if (p === 0) return null;
  const r = new Float64Array(p * p);
  for (let k = 0; k < p; k++) {
    const s = scale[order[k]];
    for (let i = 0; i <= k; i++) r[i + k * p] = f.r[i + k * p] / s;
  }
  const sv = singularValues(r, p, p);
  return sv[p - 1] > 0 ? sv[0] / sv[p - 1] : null;
}
