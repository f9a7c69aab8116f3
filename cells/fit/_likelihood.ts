/**
 * Gaussian log-likelihood of a least-squares fit and the information
 * criteria built on it.
 *
 * Formulas (DESIGN.md §5; Burnham & Anderson 2002, *Model Selection and
 * Multimodel Inference*, 2nd ed., §2.2 and §2.4 for AIC and AICc; Schwarz
 * 1978 for BIC):
 *
 * - unweighted, ML variance σ̂² = RSS/n: log L = −n/2·(ln 2π + ln(RSS/n) + 1);
 * - relative weights wᵢ (Var yᵢ = σ²/wᵢ, σ² by ML): the same with the
 *   weighted RSS = Σ wᵢrᵢ², plus ½·Σ ln wᵢ;
 * - known standard deviations σᵢ (wᵢ = 1/σᵢ², nothing estimated):
 *   log L = −½·Σ (rᵢ/σᵢ)² − Σ ln σᵢ − n/2·ln 2π;
 * - AIC = 2k − 2 log L, AICc = AIC + 2k(k + 1)/(n − k − 1), BIC = k ln n − 2 log L,
 *   with k = p + 1 when the variance is estimated (or p when the fit's
 *   `count_variance` is false), and k = p with known standard deviations.
 *
 * Log L is positive whenever the residuals are small enough (continuous
 * densities exceed 1), so the criteria may be negative; nothing here assumes
 * otherwise. With RSS = 0 and an estimated variance log L is unbounded: it is
 * null, with a warning, and so are the criteria.
 *
 * @module
 */
import type { Weighting } from "./_weighting.ts";

const LN_2PI = Math.log(2 * Math.PI);

/** Log-likelihood, the parameter count and the criteria. */
export interface Likelihood {
  logLikelihood: number | null;
  k: number;
  /** How k was counted, in words. */
  kConvention: string;
  aic: number | null;
  aicc: number | null;
  bic: number | null;
}

/**
 * Computes the log-likelihood and criteria.
 *
 * @param fit Name, rows n, mean parameters p, (weighted) RSS, weights and mode.
 * @param countVariance Whether k counts the estimated error variance.
 * @param warn Records a warning (unbounded log L, AICc undefined).
 * @returns The values; null where they do not exist.
 * @example
 * ```ts
 * import { likelihood } from "./_likelihood.ts";
 * // n = 20, RSS = 22.22271407147202: statsmodels 0.13.5 gives log L = −29.432597150384765
 * // (../shared/reference/checks/ols_simple_sensor_calibration.json).
 * const l = likelihood({ name: "x", n: 20, p: 2, rss: 22.22271407147202, weights: null, weighting: "none" }, true, () => {});
 * if (Math.abs(l.logLikelihood! + 29.432597150384765) > 1e-12) throw new Error(String(l.logLikelihood));
 * ```
 */
export function likelihood(
  fit: {
    name: string;
    n: number;
    p: number;
    rss: number;
    weights: Float64Array | null;
    weighting: Weighting;
  },
  countVariance: boolean,
  warn: (m: string) => void,
): Likelihood {
  const { n, p, rss, weights, weighting } = fit;
  let halfLogW = 0;
  if (weights) { for (const w of weights) halfLogW += 0.5 * Math.log(w); }
  let logL: number | null;
  if (weighting === "absolute") {
    logL = -0.5 * rss - 0.5 * n * LN_2PI + halfLogW;
  } else if (rss > 0) {
    logL = -0.5 * n * (LN_2PI + Math.log(rss / n) + 1) + halfLogW;
  } else {
    logL = null;
    warn(
      `Log-likelihood of "${fit.name}" is unbounded: every residual is 0, so the ML variance is 0; AIC, AICc and BIC are not given`,
    );
  }
  const k = weighting === "absolute" || !countVariance ? p : p + 1;
  const kConvention = weighting === "absolute"
    ? "k = p: mean parameters only, the standard deviations are known"
    : countVariance
    ? "k = p + 1: mean parameters and the error variance"
    : "k = p: mean parameters only (count_variance: false)";
  if (logL === null) {
    return { logLikelihood: null, k, kConvention, aic: null, aicc: null, bic: null };
  }
  const aic = 2 * k - 2 * logL;
  let aicc: number | null = null;
  if (n - k - 1 > 0) aicc = aic + 2 * k * (k + 1) / (n - k - 1);
  else {
    warn(
      `AICc of "${fit.name}" is undefined: it needs n − k − 1 > 0, and n = ${n}, k = ${k}`,
    );
  }
  return { logLikelihood: logL, k, kConvention, aic, aicc, bic: k * Math.log(n) - 2 * logL };
}
