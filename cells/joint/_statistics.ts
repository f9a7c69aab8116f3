/**
 * Statistics of a joint fit from its pooled residuals, as the fit kind
 * computes them for one table (cells/fit/_statistics.ts; Draper & Smith,
 * *Applied Regression Analysis*, 3rd ed., ch. 2 and 24, from memory for the
 * chapters; Bates & Watts 1988, §2.3, from memory):
 *
 * - s² = RSS/(N − P) over all N rows and all P parameters (one error
 *   variance for every group), σ = s;
 * - Cov(θ̂) = s²·(JᵀJ)⁻¹ over every parameter, shared and per group;
 * - t_j = θ̂_j/se_j against t(N − P), Wald interval θ̂_j ± t_{(1+c)/2; N−P}·se_j;
 * - log L, AIC, AICc, BIC by the fit kind's `likelihood` (Gaussian, ML
 *   variance RSS/N; k = P + 1 counting the variance unless count_variance is false).
 *
 * @module
 */
import { studentT } from "../../kernel/stats/mod.ts";
import { likelihood } from "../fit/mod.ts";
import type { JointStatistics } from "./joint.ts";
import type { StackedFit } from "./_solve.ts";

/**
 * The joint fit's statistics.
 *
 * @param name The cell's name (for warnings).
 * @param fit The solved stacked problem.
 * @param n Rows N.
 * @param confidence The interval level.
 * @param countVariance Whether the criteria count σ².
 * @param warn The warning sink.
 * @returns The statistics.
 */
export function jointStatistics(
  name: string,
  fit: StackedFit,
  n: number,
  confidence: number,
  countVariance: boolean,
  warn: (m: string) => void,
): JointStatistics {
  const p = fit.x.length, df = n - p, rss = fit.rss;
  const s2 = rss / df;
  const covariance = fit.unscaled.map((v) => v * s2);
  const se = (j: number) => {
    const v = covariance[j + j * p];
    return Number.isFinite(v) && v >= 0 ? Math.sqrt(v) : null;
  };
  const stdErrors = Array.from({ length: p }, (_, j) => se(j));
  const T = studentT(df);
  const q = T.upperQuantile((1 - confidence) / 2);
  const t = stdErrors.map((u, j) => (u === null || u === 0 ? null : fit.x[j] / u));
  const pValues = t.map((x) => (x === null ? null : Math.min(1, 2 * T.upper(Math.abs(x)))));
  const intervals = stdErrors.map((u, j): [number, number] | null =>
    u === null ? null : [fit.x[j] - q * u, fit.x[j] + q * u]
  );
  const correlation = new Float64Array(p * p);
  for (let a = 0; a < p; a++) {
    for (let b = 0; b < p; b++) {
      const d = Math.sqrt(covariance[a + a * p] * covariance[b + b * p]);
      correlation[a + b * p] = a === b ? (Number.isNaN(d) ? NaN : 1) : covariance[a + b * p] / d;
    }
  }
  const lik = likelihood(
    { name, n, p, rss, weights: null, weighting: "none" },
    countVariance,
    warn,
  );
  return {
    n,
    p,
    dfResidual: df,
    rss,
    sigma: Math.sqrt(s2),
    stdErrors,
    t,
    pValues,
    intervals,
    confidence,
    covariance,
    correlation,
    ...lik,
  };
}
