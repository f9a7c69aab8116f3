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
 * From a fit's own triangular factor ({@link varianceInflationOfFactor};
 * issue 16: ten auxiliary regressions on 1,000,000 × 11 took 3.7–10 s): 1/RSS_j
 * is the j-th diagonal entry of (XᵀWX)⁻¹ (the partitioned inverse; Belsley,
 * Kuh & Welsch 1980, §3.1; Stewart 1987, κ_j² = ‖x_j‖²·((XᵀX)⁻¹)_jj). With
 * the factor X̃·P = Q₁·R̃ of the scaled design X̃ = √W·X·S (kernel/linalg
 * `TriangularFactor`), ((XᵀWX)⁻¹)_jj = s_j²·‖R̃⁻ᵀe_k‖², k the pivot position
 * of column j: one forward substitution with R̃ᵀ per column
 * (`inverseGramForms`, in double-double when the factor is), O(p²) each,
 * instead of a QR of the n × (p − 1) other columns (O(np²) each). So
 *
 * ```
 *   VIF_j = S_j · s_j² · ‖R̃⁻ᵀe_k‖²
 *   S_j = Σ wᵢ(x_ij − x̄_j)²   (centred: the design has an intercept; x̄_j the weighted mean)
 *   S_j = Σ wᵢ x_ij²          (uncentred: no intercept)
 * ```
 *
 * With an intercept the centred diagonal needs no centred factor: the
 * intercept's column is among the regressors, so RSS_j is already the
 * residual of x_j about its mean and the others (the inverse of the
 * predictors' correlation matrix has diagonal S_j/RSS_j). The only pass over
 * the rows is S_j's (two passes, the mean first).
 *
 * @module
 */
import { inverseGramForms, type TriangularFactor } from "../linalg/mod.ts";
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

/**
 * VIF of every listed non-intercept column through the fit's factor.
 *
 * @param factor R̃ of √W·X·S with its pivot order and scales (it must cover every listed column).
 * @param design The design (or Jacobian) columns the factor was made from, by its column numbers.
 * @param names Parameter names, one per design column.
 * @param weights wᵢ per row, or null.
 * @param columns The design columns to judge (default all), e.g. those not held at a bound.
 * @returns VIF_j by name as `varianceInflation` gives it (centred when one of the
 *   columns is constant, which gets none; 1 for a lone uncentred column), or null
 *   when the factor does not cover every listed column (rank-deficient: use
 *   `varianceInflation`).
 * @example
 * ```ts
 * import { householderQR, factorOfQR } from "../linalg/mod.ts";
 * import { varianceInflationOfFactor } from "./variance_inflation.ts";
 * // Through the origin, x = (1, 2) and z = (1, 0): uncentred R² = 1/5, VIF 5/4 (hand computation).
 * const x = Float64Array.of(1, 2), z = Float64Array.of(1, 0);
 * const f = factorOfQR(householderQR(Float64Array.of(1, 2, 1, 0), 2, 2), Float64Array.of(1, 1));
 * const v = varianceInflationOfFactor(f, [x, z], ["a", "b"], null)!;
 * if (Math.abs(v.a! - 1.25) > 1e-14 || Math.abs(v.b! - 1.25) > 1e-14) throw new Error(JSON.stringify(v));
 * ```
 */
export function varianceInflationOfFactor(
  factor: TriangularFactor,
  design: readonly Float64Array[],
  names: readonly string[],
  weights: Float64Array | null,
  columns: readonly number[] = design.map((_, j) => j),
): Record<string, number | null> | null {
  const covered = new Set(factor.order);
  if (factor.p !== columns.length || columns.some((j) => !covered.has(j))) return null;
  const k = constantColumn(columns.map((j) => design[j]));
  const intercept = k >= 0 ? columns[k] : -1;
  const judged = columns.filter((j) => j !== intercept);
  const out: Record<string, number | null> = {};
  if (intercept < 0 && judged.length === 1) {
    out[names[judged[0]]] = 1; // nothing to be collinear with
    return out;
  }
  const d = inverseDiagonal(factor, design.length, judged);
  judged.forEach((j, a) => {
    const v = spread(design[j], weights, intercept >= 0) * d[a];
    out[names[j]] = Number.isFinite(v) && v > 0 ? v : null;
  });
  return out;
}

/** ((XᵀWX)⁻¹)_jj for the listed columns: eⱼᵀ(XᵀWX)⁻¹eⱼ through the factor. */
function inverseDiagonal(
  factor: TriangularFactor,
  p: number,
  judged: readonly number[],
): Float64Array {
  // Point a is the unit vector of column judged[a]: column c of g holds 1 at the points of c.
  const g = Array.from({ length: p }, (_, c) => ({
    hi: Float64Array.from(judged, (j) => (j === c ? 1 : 0)),
    lo: null,
  }));
  return inverseGramForms(factor, g, judged.length);
}

/** S_j: Σwᵢ(xᵢ − x̄)² about the weighted mean (centred), or Σwᵢxᵢ² (uncentred). */
function spread(x: Float64Array, weights: Float64Array | null, centred: boolean): number {
  const n = x.length;
  let mean = 0;
  if (centred) {
    let sw = 0, swx = 0;
    for (let i = 0; i < n; i++) {
      const w = weights === null ? 1 : weights[i];
      sw += w;
      swx += w * x[i];
    }
    mean = swx / sw;
  }
  let s = 0;
  for (let i = 0; i < n; i++) {
    const d = x[i] - mean;
    s += (weights === null ? 1 : weights[i]) * d * d;
  }
  return s;
}
