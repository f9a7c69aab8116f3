/**
 * The condition number σ_max/σ_min of a (√w-scaled) design read from the
 * fit's own triangular factor, without factoring the n × p design again.
 *
 * Method: the factor is X̃·P = Q₁·R̃ with X̃ = √W·X·S (S the power-of-two
 * column scales, exact); so √W·X·P = Q₁·(R̃·S_π⁻¹), S_π the scales in pivot
 * order, and Q₁ having orthonormal columns, the singular values of √W·X are
 * those of the p × p matrix R̃·S_π⁻¹, found by one-sided Jacobi
 * (kernel/linalg `singularValues`; Golub & Van Loan, *Matrix Computations*,
 * 4th ed., §8.6.3), as the linear solver finds its own `conditionEstimate`.
 * The number is the one `conditionNumber` gives from the design (unscaled
 * columns, intercept included); see `condition_number.ts`.
 *
 * @module
 */
import { singularValues, type TriangularFactor } from "../linalg/mod.ts";

/**
 * σ_max/σ_min of the design the factor was made from.
 *
 * @param f The factor (its hi parts are used; a double-double factor's lo parts are below
 *   what the ratio can show).
 * @returns The ratio; null when σ_min is 0.
 * @example
 * ```ts
 * import { factorOfQR, householderQR } from "../linalg/mod.ts";
 * import { conditionNumberOfFactor } from "./condition_number_of_factor.ts";
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
