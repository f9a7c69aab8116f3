/**
 * Variance inflation factors: by how much the variance of each estimate
 * exceeds what it would be were its column orthogonal to the others.
 *
 * Method: VIF_j = S_j/RSS_j, RSS_j the residual sum of squares of column j
 * regressed on the other columns (pivoted Householder QR, `_auxiliary.ts`):
 *
 * - centred (the design has a constant column, the intercept): S_j is the
 *   sum of squares of column j about its mean, so VIF_j = 1/(1 − R_j²) with
 *   the usual centred R_j² (Marquardt 1970, Technometrics 12:591–612;
 *   Belsley, Kuh & Welsch, *Regression Diagnostics*, 1980, §3.1). The
 *   intercept itself has none;
 * - uncentred (no constant column: a model through the origin, or the
 *   Jacobian of a nonlinear model): S_j = ‖x_j‖² and RSS_j from the other
 *   columns alone, VIF_j = (XᵀX)_jj·((XᵀX)⁻¹)_jj = 1/(1 − R_j²) with the
 *   uncentred R_j². This is the variance actually inflated: var(θ̂_j) =
 *   σ²((XᵀX)⁻¹)_jj against σ²/‖x_j‖² for an orthogonal column (Belsley 1984,
 *   "Demeaning conditioning diagnostics through centering", The American
 *   Statistician 38:73–77; Stewart 1987, "Collinearity and least squares
 *   regression", Statistical Science 2:68–84, whose collinearity index κ_j
 *   = ‖x_j‖·‖x_j⁺‖ is √VIF_j; both from memory). Centring a design that
 *   has no intercept answers a question the model does not ask: a Jacobian
 *   column that is nearly constant (a saturating curve's ∂f/∂vmax) then
 *   looks collinear with a column of ones that is not in the model.
 *
 * Computing S_j/RSS_j rather than 1/(1 − R_j²) keeps the digits of a large
 * VIF that 1 − R_j² would cancel. For a weighted fit every column is scaled
 * by √wᵢ (and S_j centred on the weighted mean), so VIF_j describes the
 * weighted estimator. When column j is a combination of the others to
 * working precision (RSS_j = 0, or the others are rank-deficient) the VIF
 * is infinite: null.
 *
 * @module
 */
import { auxiliaryRegression, constantColumn, scaleRows } from "./_auxiliary.ts";

/** Which variance inflation factor: about the mean (with an intercept) or about zero. */
export type VifForm = "centred" | "uncentred";

/**
 * The form {@link varianceInflation} uses for a design: centred when a
 * column is constant (the intercept), uncentred otherwise.
 *
 * @param design The design columns (or the Jacobian of a nonlinear fit).
 * @returns "centred" or "uncentred".
 * @example
 * ```ts
 * import { vifForm } from "./variance_inflation.ts";
 * if (vifForm([new Float64Array([1, 2, 3])]) !== "uncentred") throw new Error();
 * ```
 */
export function vifForm(design: readonly Float64Array[]): VifForm {
  return constantColumn(design) >= 0 ? "centred" : "uncentred";
}

/**
 * VIF of every non-intercept term, keyed by its parameter name.
 *
 * @param design One column per parameter (or the Jacobian of a nonlinear fit), each n long.
 * @param names Parameter names, one per column.
 * @param weights wᵢ per row, or null.
 * @returns VIF_j by name, in the form {@link vifForm} names (null where it is
 *   infinite); the intercept is left out.
 * @throws {RangeError} When names and columns differ in number.
 * @example
 * ```ts
 * import { varianceInflation } from "./variance_inflation.ts";
 * // Orthogonal centred terms: R_j² = 0, VIF = 1 (hand computation).
 * const one = new Float64Array([1, 1, 1, 1]);
 * const v = varianceInflation([one, new Float64Array([-1, 1, -1, 1]), new Float64Array([-1, -1, 1, 1])], ["b0", "b1", "b2"], null);
 * if (Math.abs(v.b1! - 1) > 1e-14 || "b0" in v) throw new Error(JSON.stringify(v));
 * // Through the origin, x = (1, 2) and z = (1, 0): uncentred R² = (xᵀz)²/(xᵀx·zᵀz) = 1/5, VIF 5/4.
 * const u = varianceInflation([new Float64Array([1, 2]), new Float64Array([1, 0])], ["a", "b"], null);
 * if (Math.abs(u.a! - 1.25) > 1e-14 || Math.abs(u.b! - 1.25) > 1e-14) throw new Error(JSON.stringify(u));
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
  const cols = scaleRows(design, weights);
  design.forEach((_, j) => {
    if (j === k) return;
    const others = cols.filter((_, i) => i !== j);
    if (others.length === 0) {
      out[names[j]] = 1; // nothing to be collinear with
      return;
    }
    // Centred: TSS about the (√w-scaled) constant column, which is among the others.
    const aux = auxiliaryRegression(others, cols[j], k >= 0 ? cols[k] : null, k < 0);
    out[names[j]] = aux === null || !(aux.rss > 0) ? null : aux.tss / aux.rss;
  });
  return out;
}
