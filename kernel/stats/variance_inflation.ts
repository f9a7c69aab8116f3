/**
 * Variance inflation factors.
 *
 * Method: Marquardt (1970), "Generalized inverses, ridge regression, biased
 * linear estimation, and nonlinear estimation", Technometrics 12:591–612;
 * Belsley, Kuh & Welsch (1980), §3.1: VIF_j = 1/(1 − R_j²), R_j² from
 * regressing term j on the other terms plus an intercept. The intercept
 * itself has none. A constant column of the design is taken as the intercept;
 * a design without one gets a column of ones for the auxiliary regressions.
 * For a weighted fit every column is scaled by √wᵢ and R_j² is centred on
 * the weighted mean, so VIF_j describes the weighted estimator.
 * When term j is a combination of the others the VIF does not exist: null.
 *
 * @module
 */
import { auxiliaryRegression, constantColumn, scaleRows } from "./_auxiliary.ts";

/**
 * VIF of every non-intercept term, keyed by its parameter name.
 *
 * @param design One column per parameter (or the Jacobian of a nonlinear fit), each n long.
 * @param names Parameter names, one per column.
 * @param weights wᵢ per row, or null.
 * @returns VIF_j by name (null where R_j² = 1); the intercept is left out.
 * @throws {RangeError} When names and columns differ in number.
 * @example
 * ```ts
 * import { varianceInflation } from "./variance_inflation.ts";
 * // Orthogonal centred terms: R_j² = 0, VIF = 1 (hand computation).
 * const one = new Float64Array([1, 1, 1, 1]);
 * const v = varianceInflation([one, new Float64Array([-1, 1, -1, 1]), new Float64Array([-1, -1, 1, 1])], ["b0", "b1", "b2"], null);
 * if (Math.abs(v.b1! - 1) > 1e-14 || "b0" in v) throw new Error(JSON.stringify(v));
 * ```
 */
export function varianceInflation(
  design: readonly Float64Array[],
  names: readonly string[],
  weights: Float64Array | null,
): Record<string, number | null> {
  if (names.length !== design.length) {
    throw new RangeError(
      `Cannot compute variance inflation: ${design.length} columns but ${names.length} names`,
    );
  }
  const out: Record<string, number | null> = {};
  const k = constantColumn(design);
  const n = design[0]?.length ?? 0;
  const ones = scaleRows([new Float64Array(n).fill(1)], weights)[0];
  const cols = scaleRows(design, weights);
  design.forEach((_, j) => {
    if (j === k) return;
    const others = cols.filter((_, i) => i !== j && i !== k);
    const aux = auxiliaryRegression([ones, ...others], cols[j], ones);
    out[names[j]] = aux === null || !(aux.r2 < 1) ? null : 1 / (1 - aux.r2);
  });
  return out;
}
