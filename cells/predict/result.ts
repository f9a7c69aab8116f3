/**
 * The RUN-JSON `result` of a predict cell (RUN-JSON.md, `predict`) and the
 * `Predictions` output that carries it.
 *
 * RUN-JSON Additions: per point `se_prediction` and `unit` (of estimate,
 * ci and pi: the response column's; for `solve` the predictor's), from the
 * table's column units through the fit (kernel/units).
 *
 * Our additions to the documented shape (extend, never rename): `response`,
 * `scale`, `se_scale`, `distribution`, `new_observation`, `weight_source`,
 * `covariance`, `robust`, `mean_method`, for transformed responses
 * `estimate_is`; per point `extrapolated`, `weight` or `sigma` (weighted
 * fits), for transformed responses `model_scale`, for log responses
 * `mean_estimates`; per inverse prediction `method`, `interval_for` and
 * `extrapolated`.
 *
 * RUN-JSON additions of issue 19 (every interval labelled by its method):
 * per point `intervals` (the mean response: Wald, equal to `ci`, then
 * profile and bootstrap as the fit computed them) and `pi_intervals` (a new
 * observation: Wald, equal to `pi`, then the bootstrap's), each entry the
 * fit's `LabelledInterval` shape; `interval_methods` in words.
 *
 * @module
 */
import type { CellOutput } from "../../kernel/contract/mod.ts";
import type { HCType } from "../../kernel/stats/mod.ts";
import type { MeanEstimate } from "./log_mean.ts";
import type { LabelledInterval } from "../fit/_profile.ts";

export type { LabelledInterval, MeanEstimate };

/** One prediction point. Values that do not exist (the model is not finite there) are null. */
export interface PredictPointResult {
  /** The predictor values of the point. */
  x: Record<string, number>;
  /** The mean response, on the reporting scale (`scale`). */
  estimate: number | null;
  /** Standard error of the mean response, on the model scale (`se_scale`). */
  se_fit: number | null;
  /** Interval for the mean response at `level`. */
  ci: [number, number] | null;
  /** Interval for a new observation at `level`; null when its variance is unknown. */
  pi: [number, number] | null;
  /**
   * RUN-JSON Addition: standard error of a new observation (of the mean of
   * `replicates` m), √(se_fit² + s₀²/m), on the model scale (`se_scale`);
   * null when s₀² is unknown.
   */
  se_prediction: number | null;
  /** Our addition, fits with relative weights: the new observation's weight w₀ (null: unknown). */
  weight?: number | null;
  /** Our addition, fits with known σ: the new observation's σ₀ (null: unknown). */
  sigma?: number | null;
  /** Our addition: whether any predictor lies outside the fitted range. */
  extrapolated: boolean;
  /** RUN-JSON addition: the unit of estimate, ci and pi (the response column's); null when none. */
  unit: string | null;
  /** Our addition, log responses: labelled estimates of the mean of y (`estimate` is its median). */
  mean_estimates?: MeanEstimate[];
  /**
   * RUN-JSON addition (issue 19): every interval of the mean response, labelled by
   * its method, on the reporting scale: Wald first (equal to `ci`), then profile,
   * bootstrap percentile and BCa as the fit computed them; empty where no estimate
   * (absent in records made before it existed).
   */
  intervals?: LabelledInterval[];
  /**
   * RUN-JSON addition (issue 19): every interval for a new observation (the mean of
   * `replicates`), labelled: Wald first (equal to `pi`), then the bootstrap's
   * ("bootstrap-percentile", of the prediction error) when the fit has replicates.
   */
  pi_intervals?: LabelledInterval[];
  /** Our addition, transformed responses only: the same values on the model scale. */
  model_scale?: {
    estimate: number | null;
    ci: [number, number] | null;
    pi: [number, number] | null;
    intervals?: LabelledInterval[];
    pi_intervals?: LabelledInterval[];
  };
}

/** One inverse prediction. */
export interface PredictSolveResult {
  /** The response value as written in `solve`. */
  y: Record<string, number>;
  /** The predictor value that gives it. */
  x: Record<string, number>;
  /** Interval for x (see `interval_for`); null when not a finite interval. */
  ci: [number, number] | null;
  /** Our addition: "fieller" (straight lines) or "prediction-band" (other models). */
  method: "fieller" | "prediction-band";
  /** Our addition: what the interval is for, in words. */
  interval_for: string;
  /** Our addition: whether x lies outside the fitted range. */
  extrapolated: boolean;
  /** RUN-JSON addition: the unit of x and its interval (the predictor column's); null when none. */
  unit: string | null;
}

/** The `predict` result object. */
export interface PredictResult {
  fit: string;
  level: number;
  at: PredictPointResult[];
  solve: PredictSolveResult[];
  /** Our addition: the fit's response as written. */
  response: string;
  /** Our addition: the scale of estimates and intervals, in words. */
  scale: string;
  /** Our addition: the scale of `se_fit`, in words. */
  se_scale: string;
  /** Our addition: the reference distribution of the intervals, e.g. "t(18)" or "normal". */
  distribution: string;
  /** Our addition: the variance used for a new observation, in words. */
  new_observation: string;
  /** Our addition: where a new observation's weight or σ comes from, in words. */
  weight_source: string;
  /** Our addition: the covariance of the estimates behind se_fit, in words. */
  covariance: string;
  /** Our addition: the heteroscedasticity-consistent estimator used (option robust), or null. */
  robust: HCType | null;
  /** Our addition, transformed responses: what `estimate` estimates on the original scale. */
  estimate_is?: string;
  /** Our addition: how se_fit was computed, in words. */
  mean_method: string;
  /**
   * RUN-JSON addition (issue 19): the interval methods of the points beyond Wald and
   * what they rest on, in words (the fit's profile, its bootstrap replicates and seed).
   */
  interval_methods?: string;
}

/** Output of `predict`: the computed predictions (the result is all there is). */
export interface Predictions extends CellOutput {
  type: "Predictions";
  result: PredictResult;
}
