/**
 * Information criteria of a fit on the original response scale.
 *
 * Formulas (DESIGN.md §5; Burnham & Anderson 2002, *Model Selection and
 * Multimodel Inference*, 2nd ed., §2.2 and §2.4; Schwarz 1978 for BIC):
 * AIC = 2k − 2 log L, AICc = AIC + 2k(k + 1)/(n − k − 1) (undefined when
 * n − k − 1 ≤ 0), BIC = k ln n − 2 log L, with the fit's own k (its
 * `count_variance` convention) and log L on the original scale:
 * log L + Σ ln |g′(yᵢ)| for a response written as g(y) (`original_scale.ts`).
 * For a bare column the values equal the fit's own criteria. Weighted fits
 * use the fit's weighted log L, which includes ½·Σ ln wᵢ (the weights as a
 * variance model, yᵢ ~ N(μᵢ, σ²/wᵢ)): a density of the same y whatever the
 * weights, so fits that differ only in their relative weights compare here
 * (comparable.ts). The fit's log L is used as it is; nothing is added here.
 *
 * @module
 */
import type { Candidate } from "./comparable.ts";

/** The criteria of one fit, on the original scale of its response column. */
export interface Criteria {
  n: number;
  k: number;
  /** The fit's log L (of the response as written). */
  logLikelihood: number | null;
  /** log L + Σ ln |g′(yᵢ)|. */
  logLikelihoodOriginal: number | null;
  aic: number | null;
  aicc: number | null;
  bic: number | null;
}

/**
 * Criteria from a log-likelihood, k and n.
 *
 * @param logL The log-likelihood, or null when it does not exist.
 * @param k Parameters counted.
 * @param n Rows.
 * @returns AIC, AICc (null when n − k − 1 ≤ 0) and BIC; all null with logL.
 * @example
 * ```ts
 * import { criteriaOf } from "./criteria.ts";
 * // log L = −69.24345981383686, k = 3, n = 24: statsmodels 0.13.5 gives AIC 144.48691962767373
 * // (../shared/reference/checks/poly_degree_series_drying_curve.json, degree 1).
 * const c = criteriaOf(-69.24345981383686, 3, 24);
 * if (Math.abs(c.aic! - 144.48691962767373) > 1e-12) throw new Error(String(c.aic));
 * ```
 */
export function criteriaOf(
  logL: number | null,
  k: number,
  n: number,
): { aic: number | null; aicc: number | null; bic: number | null } {
  if (logL === null || !Number.isFinite(logL)) return { aic: null, aicc: null, bic: null };
  const aic = 2 * k - 2 * logL;
  const aicc = n - k - 1 > 0 ? aic + 2 * k * (k + 1) / (n - k - 1) : null;
  return { aic, aicc, bic: k * Math.log(n) - 2 * logL };
}

/**
 * The criteria of a candidate on the original scale.
 *
 * @param c The candidate (fit and its original scale).
 * @returns n, k, both log-likelihoods and the criteria from the original-scale one.
 */
export function candidateCriteria(c: Candidate): Criteria {
  const st = c.fit.statistics;
  const logL = st.logLikelihood;
  const original = logL === null ? null : logL + c.scale.logJacobian;
  return {
    n: st.n,
    k: st.k,
    logLikelihood: logL,
    logLikelihoodOriginal: original,
    ...criteriaOf(original, st.k, st.n),
  };
}
