/**
 * Running a predict cell: fit + points → {@link Predictions}.
 *
 * ```
 *  inputs[fit] ─pointsOf─▶ points ─meanResponse(cov)─▶ ŷ, se_fit ─± q·se─▶ ci
 *        │                   └─newObservation─▶ s₀² ─√(se_fit² + s₀²/m)─▶ se_prediction, pi
 *        └─predictCovariance─▶ cov (the fit's, or robust HC0–HC3)
 *                                       responseScale ─g⁻¹─▶ reporting scale (+ log means)
 *  solve values ─g─▶ z₀ ─inversePrediction─▶ x̂₀ and its interval   (solve_all.ts)
 *  points ─pointIntervals─▶ intervals (Wald = ci, profile, bootstrap), pi_intervals
 *                            (Wald = pi, bootstrap prediction error)   (_point_intervals.ts)
 * ```
 *
 * A transformed response (`log(y) = …`) is reported on the original scale
 * of its column: estimate and interval ends back-transformed through g⁻¹
 * (`response_scale.ts`; the estimate is then the median of y), standard
 * errors on the model scale, and the model-scale values kept in
 * `model_scale`. For a log response the mean of y is given too, by two
 * labelled estimates (`log_mean.ts`).
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import type { RunContext } from "../../kernel/contract/mod.ts";
import type { Fit } from "../fit/mod.ts";
import type { PredictSpec } from "./spec.ts";
import type { Predictions, PredictPointResult, PredictResult } from "./result.ts";
import { meanResponse, type ModelAtEstimates, modelAtEstimates } from "./mean_response.ts";
import { type IntervalSettings, intervalSettings, predictCovariance } from "./interval_settings.ts";
import { type ResponseScale, responseScale } from "./response_scale.ts";
import { fittedRanges, outside, pointsOf, warnExtrapolation } from "./_points.ts";
import { invalidValueMessage } from "./new_observation.ts";
import { logBase, type LogMeanContext, logMeans } from "./log_mean.ts";
import { solveAll } from "./solve_all.ts";
import { type LabelledInterval, type PointIntervals, pointIntervals } from "./_point_intervals.ts";

export { BAND_MARGIN, ROOT_MARGIN } from "./solve_all.ts";

/** What predicting at points and solving share. */
interface Shared {
  fit: Fit;
  model: ModelAtEstimates;
  settings: IntervalSettings;
  scale: ResponseScale;
  covariance: Float64Array;
  middle: Float64Array | null;
  /** The points' intervals beyond Wald, as the fit computed them. */
  beyond: PointIntervals;
}

/**
 * Predicts from the spec's fit.
 *
 * @param spec The normalised options.
 * @param ctx Inputs (the fit under `spec.fit`), settings and the warning sink.
 * @returns The predictions.
 * @throws {CellError} For a missing fit, bad `at` columns (see `_points.ts`),
 *   a `solve` response that is not the fit's, a fit without exactly one
 *   predictor for `solve`, or no unique solution (see `inverse_prediction.ts`).
 */
export function runPredict(spec: PredictSpec, ctx: RunContext): Predictions {
  const fit = fitInput(spec, ctx);
  const settings = intervalSettings(fit, spec, ctx.settings.confidence, ctx.warn);
  const scale = responseScale(fit.model);
  const cov = predictCovariance(fit, spec.robust);
  const s: Shared = {
    fit,
    model: modelAtEstimates(fit),
    settings,
    scale,
    covariance: cov.covariance,
    middle: cov.middle,
    beyond: pointIntervals(fit, {
      level: settings.level,
      q: settings.q,
      seed: ctx.settings.seed,
    }),
  };
  const at = spec.at === null ? [] : predictAt(ctx, spec, s);
  const solve = spec.solve === null ? [] : solveAll(ctx, spec, s);
  const obs = settings.newObservation;
  const robustNote = spec.robust !== undefined && fit.weighting !== "absolute"
    ? "; s² is the fit's residual variance also with robust covariance (common practice, no source)"
    : "";
  const result: PredictResult = {
    fit: spec.fit,
    level: settings.level,
    at,
    solve,
    response: scale.written,
    scale: scale.transformed
      ? `original (back-transformed from ${scale.written})`
      : "response as written",
    se_scale: scale.transformed ? `model (${scale.written})` : "response as written",
    distribution: settings.distribution,
    new_observation: obs.statement + robustNote,
    weight_source: obs.source,
    covariance: cov.statement,
    robust: spec.robust ?? null,
    mean_method: meanMethod(fit, spec.robust !== undefined),
    interval_methods: intervalMethods(fit, s.beyond, spec.robust !== undefined),
    ...(scale.transformed ? { estimate_is: estimateIs(fit, scale) } : {}),
  };
  return { type: "Predictions", result };
}

function meanMethod(fit: Fit, robust: boolean): string {
  const form = fit.robust !== undefined
    ? "se² = gᵀ·C·g with C the robust fit's sandwich covariance"
    : robust
    ? "se² = zᵀ·M·z with Rᵀz = g through the fit's own triangular factor, M the robust covariance's middle Σ ωᵢ·qᵢqᵢᵀ (qᵢ row i of Q)"
    : "se² = s²·‖R⁻ᵀg‖² through the fit's own triangular factor";
  return fit.method === "linear"
    ? `exact: model linear in its parameters, ${form}, g the design row`
    : `delta method: ${form}, g = ∂f/∂θ at the estimates (first order, approximate)`;
}

/** What the points' labelled intervals rest on, in words. */
function intervalMethods(fit: Fit, b: PointIntervals, robust: boolean): string {
  const parts = ["wald: ci and pi"];
  if (b.profile) {
    parts.push(
      `profile: of f(x₀; θ) at each point, the fit's least-squares criterion minimised with it held${
        robust ? " (likelihood-based: not robust)" : ""
      }`,
    );
  }
  const run = fit.intervals?.bootstrap;
  if (run !== undefined && b.resamples > 0) {
    parts.push(
      `bootstrap: f(x₀; θ*) over the fit's ${run.b} ${
        run.resample === "cases" ? "case" : "residual"
      } resamples (percentile; BCa with the fit's jackknife${
        run.jackknife === null ? ", not available here" : ""
      }); a new observation by the prediction error f(x₀; θ*) − (f(x₀; θ̂) + ε*), ε* a centred modified residual scaled to the point (Davison & Hinkley 1997, Alg. 6.4), seed ${run.seed}`,
    );
  }
  if (parts.length === 1) parts.push("the fit carries no profile or bootstrap intervals");
  return parts.join("; ");
}

function estimateIs(fit: Fit, scale: ResponseScale): string {
  const log = logBase(fit.model) !== null ? "; its mean is in mean_estimates" : "";
  return `the median of ${scale.column} (g⁻¹ of the model-scale prediction, for errors symmetric on the model scale)${log}`;
}

function fitInput(spec: PredictSpec, ctx: RunContext): Fit {
  const f = ctx.inputs[spec.fit];
  if (f === undefined || f.type !== "Fit") {
    throw new CellError(`Cannot predict "${ctx.name}": cell "${spec.fit}" gives no fit`, ["fit"]);
  }
  return f as Fit;
}

function predictAt(ctx: RunContext, spec: PredictSpec, sh: Shared): PredictPointResult[] {
  const { fit, settings: s, scale } = sh;
  const pts = pointsOf(ctx.name, spec, fit);
  warnExtrapolation(ctx, spec, fit, pts);
  const ranges = fittedRanges(fit);
  // Estimates, CI and PI are on the response column's scale (back-transformed), so in its unit.
  const unit = fit.units?.columns.get(fit.model.responseColumn) ?? null;
  const mr = meanResponse(fit, sh.model, pts.cols, pts.n, sh.covariance, sh.middle);
  const obs = s.newObservation;
  // The response column's value standing in at each point (for a weight such as 1/y²): its prediction.
  const yhat = mr.estimate.map((z) => (scale.transformed ? scale.inverse(z) ?? NaN : z));
  const nw = obs.at(pts.cols, pts.n, yhat);
  const c = logBase(fit.model);
  const lm: LogMeanContext | null = c === null ? null : { fit, c, q: s.q, df: s.df };
  const out: PredictPointResult[] = [];
  const invalid: number[] = [];
  for (let i = 0; i < pts.n; i++) {
    const x = Object.fromEntries(fit.model.columns.map((col, j) => [col, pts.cols[j][i]]));
    const est = mr.estimate[i], se = mr.seFit[i];
    const own = obs.kind === null ? {} : { [obs.kind]: finiteOrNull(nw.value[i]) };
    if (!Number.isFinite(est) || !Number.isFinite(se)) {
      ctx.warn(
        `The model of "${spec.fit}" is not finite at point ${i + 1} (${
          shownPoint(x)
        }): estimate ${est}, so no prediction is given there`,
      );
      out.push({
        x,
        estimate: null,
        se_fit: null,
        ci: null,
        pi: null,
        se_prediction: null,
        ...own,
        extrapolated: false,
        unit,
        intervals: [],
        pi_intervals: [],
      });
      continue;
    }
    if (obs.kind !== null && obs.known && Number.isNaN(nw.variance[i])) invalid.push(i);
    const row = pointRow(x, est, se, nw.variance[i] / obs.m, s.q);
    const x0 = fit.model.columns.map((_, j) => pts.cols[j][i]);
    row.intervals = [wald(row.ci, s.level, "no standard error"), ...sh.beyond.mean(x0, se)];
    const boot = sh.beyond.newObservation(x0, i, est, nw.variance[i], obs.m);
    row.pi_intervals = [
      wald(row.pi, s.level, "the variance of a new observation is not known here"),
      ...(boot === null ? [] : [boot]),
    ];
    Object.assign(row, own, { extrapolated: outside(ranges, pts, i), unit });
    if (lm !== null) row.mean_estimates = logMeans(lm, est, se, nw.variance[i]);
    out.push(row);
  }
  if (invalid.length > 0) {
    ctx.warn(invalidValueMessage(obs, invalid.map((i) => i + 1), invalid.map((i) => nw.value[i])));
  }
  if (scale.transformed) backTransform(ctx, scale, out);
  return out;
}

/** One point on the model scale: ŷ ± q·se_fit and ŷ ± q·√(se_fit² + s₀²/m). */
function pointRow(
  x: Record<string, number>,
  est: number,
  se: number,
  newVariance: number,
  q: number,
): PredictPointResult {
  const sp = finiteOrNull(Math.sqrt(se * se + newVariance));
  return {
    x,
    estimate: est,
    se_fit: se,
    ci: [est - q * se, est + q * se],
    pi: sp === null ? null : [est - q * sp, est + q * sp],
    se_prediction: sp,
    extrapolated: false,
    unit: null,
  };
}

/** A Wald interval (`ci` or `pi`) as a labelled one. */
function wald(iv: [number, number] | null, level: number, why: string): LabelledInterval {
  return iv === null
    ? { method: "wald", level, lower: null, upper: null, note: why }
    : { method: "wald", level, lower: iv[0], upper: iv[1] };
}

/** Estimates and interval ends through g⁻¹, the model-scale values kept in `model_scale`. */
function backTransform(ctx: RunContext, scale: ResponseScale, rows: PredictPointResult[]) {
  let unmapped = false;
  for (const row of rows) {
    if (row.estimate === null) continue;
    const { estimate: est, ci, pi, intervals = [], pi_intervals = [] } = row;
    const e = scale.inverse(est),
      ce = ci && mapInterval(scale, ci),
      p = pi && mapInterval(scale, pi);
    unmapped ||= e === null || ce === null || (pi !== null && p === null);
    Object.assign(row, {
      estimate: e,
      ci: ce,
      pi: p,
      intervals: intervals.map((iv) => mapLabelled(scale, iv, est)),
      pi_intervals: pi_intervals.map((iv) => mapLabelled(scale, iv, est)),
      model_scale: { estimate: est, ci, pi, intervals, pi_intervals },
    });
  }
  if (unmapped) {
    const why = scale.noInverse ?? `no finite "${scale.column}" gives them`;
    ctx.warn(
      `Some values could not be back-transformed from "${scale.written}" to "${scale.column}" (${why}): they are null; see model_scale`,
    );
  }
}

function finiteOrNull(v: number): number | null {
  return Number.isFinite(v) ? v : null;
}

function mapInterval(scale: ResponseScale, [a, b]: [number, number]): [number, number] | null {
  const u = scale.inverse(a), v = scale.inverse(b);
  if (u === null || v === null) return null;
  return u <= v ? [u, v] : [v, u];
}

/**
 * A labelled interval through g⁻¹: each end mapped (swapped for a decreasing g), a
 * Monte Carlo error L ± u mapped as half the width of g⁻¹ over it (ẑ = `at`, the
 * model-scale estimate, for g⁻¹'s direction); an end with no
 * finite value is null, said in the note.
 */
function mapLabelled(scale: ResponseScale, iv: LabelledInterval, at: number): LabelledInterval {
  const end = (v: number | null) => (v === null ? null : scale.inverse(v));
  let lower = end(iv.lower), upper = end(iv.upper);
  const mcOf = (v: number | null, u: number | null | undefined) => {
    if (v === null || u === null || u === undefined) return null;
    const a = scale.inverse(v - u), b = scale.inverse(v + u);
    return a === null || b === null ? null : Math.abs(b - a) / 2;
  };
  let mc = iv.mc_error === undefined ? undefined : {
    lower: mcOf(iv.lower, iv.mc_error.lower),
    upper: mcOf(iv.upper, iv.mc_error.upper),
  };
  const lost = (iv.lower !== null && lower === null) || (iv.upper !== null && upper === null);
  // A decreasing g⁻¹ turns the ends round (both ends compared; a lone end by g⁻¹'s slope at ẑ).
  const h = 1e-6 * Math.max(1, Math.abs(at)), a = scale.inverse(at - h), b = scale.inverse(at + h);
  const decreasing = lower !== null && upper !== null
    ? lower > upper
    : a !== null && b !== null && b < a;
  if (decreasing) {
    [lower, upper] = [upper, lower];
    if (mc !== undefined) mc = { lower: mc.upper, upper: mc.lower };
  }
  const notes = [iv.note, lost ? `no finite "${scale.column}" gives an end` : undefined]
    .filter((n): n is string => n !== undefined);
  return {
    method: iv.method,
    level: iv.level,
    lower,
    upper,
    ...(notes.length > 0 ? { note: notes.join("; ") } : {}),
    ...(mc === undefined ? {} : { mc_error: mc }),
  };
}

function shownPoint(x: Record<string, number>): string {
  return Object.entries(x).map(([c, v]) => `${c} = ${v}`).join(", ");
}
