/**
 * Heteroscedasticity-consistent ("sandwich") covariance of least-squares
 * estimates, HC0–HC3.
 *
 * Method: White (1980), Econometrica 48:817–838 (HC0), and MacKinnon & White
 * (1985), "Some heteroskedasticity-consistent covariance matrix estimators
 * with improved finite sample properties", J. Econometrics 29:305–325
 * (HC1–HC3): Cov = (XᵀX)⁻¹·(Σ ωᵢ xᵢxᵢᵀ)·(XᵀX)⁻¹ with ωᵢ = eᵢ² (HC0),
 * n/(n − p)·eᵢ² (HC1), eᵢ²/(1 − hᵢ) (HC2), eᵢ²/(1 − hᵢ)² (HC3). The
 * bread (XᵀX)⁻¹ is the fit's unscaled covariance (from its QR, never an
 * explicit inverse of XᵀX here); with bᵢ = (XᵀX)⁻¹xᵢ the sandwich is
 * Σ ωᵢbᵢbᵢᵀ. Weighted fits use x̃ᵢ = √wᵢxᵢ and ẽᵢ = √wᵢeᵢ; nonlinear fits
 * the Jacobian at the solution.
 *
 * @module
 */
import { LEVERAGE_ONE_TOLERANCE } from "./leverage.ts";

/** Which estimator. */
export type HCType = "hc0" | "hc1" | "hc2" | "hc3";

/** The robust covariance and standard errors. */
export interface RobustCovariance {
  type: HCType;
  /** p×p column-major; NaN where it does not exist. */
  covariance: Float64Array;
  /** √diag, null where not finite (HC2/HC3 with a leverage of 1, a parameter at a bound). */
  stdErrors: (number | null)[];
}

/**
 * HC covariance of the estimates.
 *
 * @param design p columns (design or Jacobian), each n long (unweighted).
 * @param residuals eᵢ (unweighted).
 * @param hat hᵢ (weighted hat values for a weighted fit).
 * @param unscaledCovariance (XᵀWX)⁻¹, p×p column-major.
 * @param weights wᵢ per row, or null.
 * @param type "hc0" to "hc3".
 * @returns The covariance and standard errors.
 * @throws {RangeError} When the shapes do not agree.
 * @example
 * ```ts
 * import { robustCovariance } from "./robust_covariance.ts";
 * // Mean only, e = (1, −1, 2, −2): HC0 var = Σe²/n² = 10/16 (hand computation).
 * const one = new Float64Array(4).fill(1);
 * const r = robustCovariance([one], new Float64Array([1, -1, 2, -2]), new Float64Array(4).fill(0.25), new Float64Array([0.25]), null, "hc0");
 * if (Math.abs(r.covariance[0] - 10 / 16) > 1e-15) throw new Error();
 * ```
 */
export function robustCovariance(
  design: readonly Float64Array[],
  residuals: Float64Array,
  hat: Float64Array,
  unscaledCovariance: Float64Array,
  weights: Float64Array | null,
  type: HCType,
): RobustCovariance {
  const p = design.length, n = residuals.length;
  if (
    unscaledCovariance.length !== p * p || hat.length !== n || design.some((c) => c.length !== n)
  ) {
    throw new RangeError(
      `Cannot compute a robust covariance: ${p} columns, ${n} residuals, ${hat.length} hat values and ${unscaledCovariance.length} covariance entries do not agree`,
    );
  }
  const meat = new Float64Array(p * p);
  const x = new Float64Array(p);
  for (let i = 0; i < n; i++) {
    const sw = weights ? Math.sqrt(weights[i]) : 1;
    const e2 = (sw * residuals[i]) ** 2, gap = 1 - hat[i];
    const omega = type === "hc0"
      ? e2
      : type === "hc1"
      ? e2 * n / (n - p)
      : gap < LEVERAGE_ONE_TOLERANCE
      ? (e2 === 0 ? 0 : NaN)
      : type === "hc2"
      ? e2 / gap
      : e2 / (gap * gap);
    for (let j = 0; j < p; j++) x[j] = sw * design[j][i];
    for (let j = 0; j < p; j++) for (let k = 0; k < p; k++) meat[j + k * p] += omega * x[j] * x[k];
  }
  const c = unscaledCovariance;
  const cm = new Float64Array(p * p), covariance = new Float64Array(p * p);
  for (let j = 0; j < p; j++) {
    for (let k = 0; k < p; k++) {
      let s = 0;
      for (let l = 0; l < p; l++) s += c[j + l * p] * meat[l + k * p];
      cm[j + k * p] = s;
    }
  }
  for (let j = 0; j < p; j++) {
    for (let k = 0; k < p; k++) {
      let s = 0;
      for (let l = 0; l < p; l++) s += cm[j + l * p] * c[l + k * p];
      covariance[j + k * p] = s;
    }
  }
  const stdErrors = Array.from({ length: p }, (_, j) => {
    const v = covariance[j + j * p];
    return Number.isFinite(v) && v >= 0 ? Math.sqrt(v) : null;
  });
  return { type, covariance, stdErrors };
}
