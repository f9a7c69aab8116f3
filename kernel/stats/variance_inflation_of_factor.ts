/**
 * Variance inflation factors read from a fit's own triangular factor: no
 * auxiliary regression per column.
 *
 * Method: VIF_j = S_j/RSS_j (`variance_inflation.ts`), and 1/RSS_j, the
 * inverse of the residual sum of squares of column j regressed on the
 * others, is the j-th diagonal entry of (XᵀWX)⁻¹ (the partitioned inverse;
 * Belsley, Kuh & Welsch, *Regression Diagnostics*, 1980, §3.1; Stewart 1987,
 * "Collinearity and least squares regression", Statistical Science 2:68–84,
 * κ_j² = ‖x_j‖²·((XᵀX)⁻¹)_jj; both from memory for the sections). With the
 * factor X̃·P = Q₁·R̃ of the scaled design X̃ = √W·X·S (kernel/linalg
 * `TriangularFactor`), ((XᵀWX)⁻¹)_jj = s_j²·‖R̃⁻ᵀe_k‖², k the pivot position
 * of column j: one forward substitution with R̃ᵀ per column
 * (`inverseGramForms`, in double-double when the factor is), O(p²) each,
 * instead of a QR of the n × (p − 1) other columns (O(np²) each, O(np³) in
 * all). So
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
import { constantColumn } from "./_auxiliary.ts";

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
 * import { varianceInflationOfFactor } from "./variance_inflation_of_factor.ts";
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
