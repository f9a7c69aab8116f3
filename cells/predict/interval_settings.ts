/**
 * What the intervals of a `predict` cell rest on: the level, the reference
 * distribution and its quantile, and the variance of a new observation
 * (`new_observation.ts`: s², s²/w₀ or σ₀², per point).
 *
 * Quantile: t(1 − α/2; n − p), or z(1 − α/2) with known standard deviations
 * (the covariance is not estimated, so no t). The same quantile serves the
 * fit's own covariance and a robust one (common practice for HC standard
 * errors in linear models, e.g. MacKinnon & White 1985; from memory).
 *
 * (Draper & Smith, *Applied Regression Analysis*, 3rd ed., §1.4; from memory.)
 *
 * The covariance of the estimates behind se_fit ({@link predictCovariance}):
 * the fit's own (s²(XᵀWX)⁻¹, or (XᵀWX)⁻¹ with known standard deviations),
 * or with `robust:` a heteroscedasticity-consistent ("sandwich") covariance,
 * HC0 (White 1980, Econometrica 48:817–838) or HC1–HC3 (MacKinnon & White
 * 1985, J. Econometrics 29:305–325), through the fit's own triangular factor
 * (cells/fit `fitRobust`, kernel/stats `robustCovarianceOfFactor`) on the
 * fit's design (the Jacobian at the solution for a nonlinear fit),
 * residuals and weights, with its middle for the mean response's variance
 * (`mean_response.ts`). A parameter held at a bound is fixed: the sandwich
 * is formed over the free parameters only, and the held rows and columns
 * are NaN, as in the fit's own covariance.
 *
 * @module
 */
import { type HCType, standardNormal, studentT } from "../../kernel/stats/mod.ts";
import { type Fit, fitRobust } from "../fit/mod.ts";
import { CellError } from "../../kernel/errors.ts";
import type { PredictSpec } from "./spec.ts";
import { type NewObservation, newObservation } from "./new_observation.ts";

/** Level, quantile and new-observation variance of a `predict` cell. */
export interface IntervalSettings {
  level: number;
  /** The two-sided quantile q: intervals are estimate ± q·se. */
  q: number;
  /** The reference distribution in words, e.g. "t(18)" or "normal". */
  distribution: string;
  /** Residual degrees of freedom n − p; Infinity with known standard deviations (σ not estimated). */
  df: number;
  /** The variance of a new observation at a point. */
  newObservation: NewObservation;
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
 * const v = s.newObservation.at([], 1, [NaN]).variance[0];
 * if (v !== 4 || s.distribution !== "t(10)") throw new Error(JSON.stringify(s));
 * ```
 */
export function intervalSettings(
  fit: Fit,
  spec: PredictSpec,
  confidence: number,
  warn: (m: string) => void,
): IntervalSettings {
  const level = spec.level ?? confidence;
  const absolute = fit.weighting === "absolute";
  const df = fit.statistics.dfResidual;
  const ref = absolute ? standardNormal : studentT(df);
  return {
    level,
    q: ref.upperQuantile((1 - level) / 2),
    distribution: absolute ? "normal" : `t(${df})`,
    df: absolute ? Infinity : df,
    newObservation: newObservation(fit, spec, warn),
  };
}

/** The covariance used and what it is, in words. */
export interface PredictCovariance {
  /** p×p column-major, as `fit.statistics.covariance`. */
  covariance: Float64Array;
  /** A robust covariance's middle in the fit factor's coordinates (`mean_response.ts`), else null. */
  middle: Float64Array | null;
  /** RUN-JSON `covariance` of a predict result, e.g. "the fit's: s²(XᵀWX)⁻¹". */
  statement: string;
}

const HC_WORDS: Record<HCType, string> = {
  hc0: "HC0 (White 1980): ωᵢ = eᵢ²",
  hc1: "HC1 (MacKinnon & White 1985): ωᵢ = n/(n − p)·eᵢ²",
  hc2: "HC2 (MacKinnon & White 1985): ωᵢ = eᵢ²/(1 − hᵢ)",
  hc3: "HC3 (MacKinnon & White 1985): ωᵢ = eᵢ²/(1 − hᵢ)²",
};

/**
 * The covariance for the mean response.
 *
 * @param fit The fit predicted from.
 * @param robust The HC estimator, or undefined for the fit's own covariance.
 * @returns The covariance and its statement.
 * @example
 * ```ts
 * import { predictCovariance } from "./interval_settings.ts";
 * import type { Fit } from "../fit/mod.ts";
 * const fit = { weighting: "none", statistics: { covariance: Float64Array.of(2) } } as unknown as Fit;
 * if (predictCovariance(fit, undefined).covariance[0] !== 2) throw new Error("the fit's own");
 * ```
 */
export function predictCovariance(fit: Fit, robust: HCType | undefined): PredictCovariance {
  if (fit.robust !== undefined) return mEstimateCovariance(fit, robust);
  if (robust === undefined) {
    const own = fit.weighting === "absolute"
      ? "(XᵀWX)⁻¹ with W the known 1/σᵢ² (not rescaled)"
      : fit.weighting === "relative"
      ? "s²(XᵀWX)⁻¹"
      : "s²(XᵀX)⁻¹";
    const x = fit.method === "linear" ? "" : ", X the Jacobian at the estimates";
    return {
      covariance: fit.statistics.covariance,
      middle: null,
      statement: `the fit's: ${own}${x}`,
    };
  }
  const r = fitRobust(fit, robust);
  const x = fit.method === "linear" ? "X the design" : "X the Jacobian at the estimates";
  const w = fit.weights === null ? "" : ", rows scaled by √wᵢ";
  return {
    covariance: r.covariance,
    middle: r.middle ?? null,
    statement: `heteroscedasticity-consistent ${
      HC_WORDS[robust]
    }: (XᵀWX)⁻¹(Σ ωᵢ xᵢxᵢᵀ)(XᵀWX)⁻¹, ${x}${w}`,
  };
}

/**
 * A robust fit's (cells/fit/_robust.ts) own sandwich covariance, read as a
 * given covariance (a copy, so mean_response.ts takes gᵀ·C·g rather than
 * s²·‖R⁻ᵀg‖²); HC estimators of least-squares residuals do not apply to it.
 */
function mEstimateCovariance(fit: Fit, robust: HCType | undefined): PredictCovariance {
  const loss = fit.robust!.loss;
  if (robust !== undefined) {
    throw new CellError(
      `Cannot use robust: ${robust} here: the fit (${fit.model.text}) is an M-estimate (loss ${loss}) whose covariance is already Huber's sandwich, and ${robust} is made for least-squares residuals; remove robust`,
      ["robust"],
    );
  }
  return {
    covariance: fit.statistics.covariance.slice(),
    middle: null,
    statement:
      `the robust fit's: Huber's sandwich (loss ${loss}; see the fit's robust.covariance_statement)${
        fit.method === "linear" ? "" : ", X the Jacobian at the estimates"
      }`,
  };
}
