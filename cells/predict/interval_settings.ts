/**
 * What the intervals of a `predict` cell rest on: the level, the reference
 * distribution and its quantile, and the variance s₀² of a new observation.
 *
 * - Unweighted fits: s₀² = s²/m, s the residual standard error and m the
 *   number of new observations averaged (`replicates`, default 1).
 * - Relative weights (wᵢ ∝ 1/σᵢ², covariance rescaled by s²): a new
 *   observation of weight w₀ has variance s²/w₀, so s₀² = s²/(w₀·m). We
 *   take w₀ = 1 unless the option `weight` gives it: the weights' scale is
 *   the user's, and w₀ = 1 is what a weight-free reading of s means.
 * - Known standard deviations (absolute): s₀² = σ₀²/m with σ₀ from the
 *   option `sigma`; without it the new observation's variance is unknown
 *   and prediction intervals are null, with a warning.
 * - Quantile: t(1 − α/2; n − p), or z(1 − α/2) with known standard
 *   deviations (the covariance is not estimated, so no t).
 *
 * (Draper & Smith, *Applied Regression Analysis*, 3rd ed., §1.4 and ch. 9
 * for weights; from memory.)
 *
 * @module
 */
import { standardNormal, studentT } from "../../kernel/stats/mod.ts";
import type { Fit } from "../fit/mod.ts";
import type { PredictSpec } from "./spec.ts";

/** Level, quantile and new-observation variance of a `predict` cell. */
export interface IntervalSettings {
  level: number;
  /** The two-sided quantile q: intervals are estimate ± q·se. */
  q: number;
  /** The reference distribution in words, e.g. "t(18)" or "normal". */
  distribution: string;
  /** Variance of the new observation(s) s₀², or null when unknown. */
  newVariance: number | null;
  /** How s₀² was obtained, in words. */
  statement: string;
}

/**
 * Works out the interval settings, warning about options that do not apply
 * and about prediction intervals that cannot be given.
 *
 * @param fit The fit predicted from.
 * @param spec The predict cell's spec.
 * @param confidence The document's confidence level (used without `level`).
 * @param warn Records a warning on the cell.
 * @returns The settings.
 * @example
 * ```ts
 * import { intervalSettings } from "./interval_settings.ts";
 * import type { Fit } from "../fit/mod.ts";
 * const fit = { weighting: "none", statistics: { sigma: 2, dfResidual: 10 } } as unknown as Fit;
 * const s = intervalSettings(fit, { fit: "line", at: null, solve: null }, 0.95, () => {});
 * if (s.newVariance !== 4 || s.distribution !== "t(10)") throw new Error(JSON.stringify(s));
 * ```
 */
export function intervalSettings(
  fit: Fit,
  spec: PredictSpec,
  confidence: number,
  warn: (m: string) => void,
): IntervalSettings {
  const level = spec.level ?? confidence;
  const m = spec.replicates ?? 1;
  const absolute = fit.weighting === "absolute";
  const df = fit.statistics.dfResidual;
  const ref = absolute ? standardNormal : studentT(df);
  const q = ref.upperQuantile((1 - level) / 2);
  const s = fit.statistics.sigma ?? NaN;
  const of = m === 1 ? "a new observation" : `the mean of ${m} new observations`;
  if (spec.weight !== undefined && fit.weighting !== "relative") {
    warn(`Option "weight" is not used: fit "${spec.fit}" has no relative weights`);
  }
  if (spec.sigma !== undefined && !absolute) {
    warn(`Option "sigma" is not used: fit "${spec.fit}" has no known standard deviations`);
  }
  let newVariance: number | null, statement: string;
  if (absolute) {
    if (spec.sigma === undefined) {
      newVariance = null;
      statement = "unknown: give the σ of a new observation with the option sigma";
      warn(
        `Prediction intervals are not given: fit "${spec.fit}" has known standard deviations per row, so the variance of a new observation is unknown: give it with the option sigma`,
      );
    } else {
      newVariance = spec.sigma * spec.sigma / m;
      statement = `σ₀²/m for ${of}, σ₀ = ${spec.sigma} (option sigma)`;
    }
  } else if (fit.weighting === "relative") {
    const w0 = spec.weight ?? 1;
    newVariance = s * s / (w0 * m);
    statement = `s²/(w₀·m) for ${of} of weight w₀ = ${w0}${
      spec.weight === undefined ? " (the default; option weight)" : " (option weight)"
    }`;
  } else {
    newVariance = s * s / m;
    statement = `s²/m for ${of}, s the residual standard error`;
  }
  return {
    level,
    q,
    distribution: absolute ? "normal" : `t(${df})`,
    newVariance: newVariance !== null && Number.isFinite(newVariance) ? newVariance : null,
    statement,
  };
}
