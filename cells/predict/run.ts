/**
 * Running a predict cell: fit + points → {@link Predictions}.
 *
 * ```
 *  inputs[fit] ─pointsOf─▶ points ─meanResponse─▶ ŷ, se_fit ─± q·se─▶ ci, pi (model scale)
 *                                       responseScale ─g⁻¹─▶ reporting scale
 *  solve values ─g─▶ z₀ ─inversePrediction─▶ x̂₀ and its interval
 * ```
 *
 * A transformed response (`log(y) = …`) is reported on the original scale
 * of its column: estimate and interval ends back-transformed through g⁻¹
 * (`response_scale.ts`), standard errors on the model scale, and the
 * model-scale values kept in `model_scale`.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { didYouMean } from "../../kernel/suggest.ts";
import type { RunContext } from "../../kernel/contract/mod.ts";
import type { Fit } from "../fit/mod.ts";
import type { PredictSpec } from "./spec.ts";
import type { Predictions, PredictPointResult, PredictResult } from "./result.ts";
import { meanResponse, type ModelAtEstimates, modelAtEstimates } from "./mean_response.ts";
import { type IntervalSettings, intervalSettings } from "./interval_settings.ts";
import { type ResponseScale, responseScale } from "./response_scale.ts";
import { type InverseContext, inversePrediction } from "./inverse_prediction.ts";
import { type Points, pointsOf, quoted } from "./_points.ts";
import { formatNumber } from "../shared/format.ts";

/** Share of the fitted x range added on each side for the root search of `solve`. */
export const ROOT_MARGIN = 0.1;
/** Share of the fitted x range added on each side when looking for interval ends. */
export const BAND_MARGIN = 1;

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
  const model = modelAtEstimates(fit);
  const at = spec.at === null ? [] : predictAt(ctx, spec, fit, model, settings, scale);
  const solve = spec.solve === null ? [] : solveAll(ctx, spec, fit, model, settings, scale);
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
    new_observation: settings.statement,
    mean_method: fit.method === "linear"
      ? "exact: model linear in its parameters, se² = gᵀ·Cov·g with g the design row"
      : "delta method: se² = gᵀ·Cov·g with g = ∂f/∂θ at the estimates (first order, approximate)",
  };
  return { type: "Predictions", result };
}

function fitInput(spec: PredictSpec, ctx: RunContext): Fit {
  const f = ctx.inputs[spec.fit];
  if (f === undefined || f.type !== "Fit") {
    throw new CellError(`Cannot predict "${ctx.name}": cell "${spec.fit}" gives no fit`, ["fit"]);
  }
  return f as Fit;
}

function predictAt(
  ctx: RunContext,
  spec: PredictSpec,
  fit: Fit,
  model: ModelAtEstimates,
  s: IntervalSettings,
  scale: ResponseScale,
): PredictPointResult[] {
  const pts = pointsOf(ctx.name, spec, fit);
  warnExtrapolation(ctx, spec, fit, pts);
  const m = meanResponse(fit, model, pts.cols, pts.n);
  const cols = fit.model.columns;
  const out: PredictPointResult[] = [];
  let unmapped = false;
  for (let i = 0; i < pts.n; i++) {
    const x = Object.fromEntries(cols.map((c, j) => [c, pts.cols[j][i]]));
    const est = m.estimate[i], se = m.seFit[i];
    if (!Number.isFinite(est) || !Number.isFinite(se)) {
      ctx.warn(
        `The model of "${spec.fit}" is not finite at point ${i + 1} (${
          shownPoint(x)
        }): estimate ${est}, so no prediction is given there`,
      );
      out.push({ x, estimate: null, se_fit: null, ci: null, pi: null, extrapolated: false });
      continue;
    }
    const ci: [number, number] = [est - s.q * se, est + s.q * se];
    const sp = s.newVariance === null ? null : Math.sqrt(se * se + s.newVariance);
    const pi: [number, number] | null = sp === null ? null : [est - s.q * sp, est + s.q * sp];
    const row: PredictPointResult = {
      x,
      estimate: est,
      se_fit: se,
      ci,
      pi,
      extrapolated: outside(fit, pts, i).length > 0,
    };
    if (scale.transformed) {
      const e = scale.inverse(est), c = mapInterval(scale, ci), p = pi && mapInterval(scale, pi);
      unmapped ||= e === null || c === null || (pi !== null && p === null);
      Object.assign(row, { estimate: e, ci: c, pi: p, model_scale: { estimate: est, ci, pi } });
    }
    out.push(row);
  }
  if (unmapped) {
    const why = scale.noInverse ?? `no finite "${scale.column}" gives them`;
    ctx.warn(
      `Some values could not be back-transformed from "${scale.written}" to "${scale.column}" (${why}): they are null; see model_scale`,
    );
  }
  return out;
}

function mapInterval(scale: ResponseScale, [a, b]: [number, number]): [number, number] | null {
  const u = scale.inverse(a), v = scale.inverse(b);
  if (u === null || v === null) return null;
  return u <= v ? [u, v] : [v, u];
}

function shownPoint(x: Record<string, number>): string {
  return Object.entries(x).map(([c, v]) => `${c} = ${v}`).join(", ");
}

/** The fitted range of each model column. */
function fittedRanges(fit: Fit): [number, number][] {
  return fit.columns.map((v) => {
    let lo = Infinity, hi = -Infinity;
    for (const x of v) if (!Number.isNaN(x)) [lo, hi] = [Math.min(lo, x), Math.max(hi, x)];
    return [lo, hi];
  });
}

/** Indexes of the columns where point i lies outside the fitted range. */
function outside(fit: Fit, pts: Points, i: number): number[] {
  const r = fittedRanges(fit);
  return r.map(([lo, hi], j) => (pts.cols[j][i] < lo || pts.cols[j][i] > hi ? j : -1))
    .filter((j) => j >= 0);
}

function warnExtrapolation(ctx: RunContext, spec: PredictSpec, fit: Fit, pts: Points) {
  fittedRanges(fit).forEach(([lo, hi], j) => {
    const bad: number[] = [];
    for (let i = 0; i < pts.n; i++) if (pts.cols[j][i] < lo || pts.cols[j][i] > hi) bad.push(i);
    if (bad.length === 0) return;
    const values = [...new Set(bad.map((i) => pts.cols[j][i]))].join(", ");
    ctx.warn(
      `Extrapolation: "${fit.model.columns[j]}" = ${values} (${
        bad.length === 1 ? "point" : "points"
      } ${
        bad.map((i) => i + 1).join(", ")
      }) lies outside the range fitted by "${spec.fit}", [${lo}, ${hi}]`,
    );
  });
}

function solveAll(
  ctx: RunContext,
  spec: PredictSpec,
  fit: Fit,
  model: ModelAtEstimates,
  settings: IntervalSettings,
  scale: ResponseScale,
) {
  const { response, values } = spec.solve!;
  const modelScale = scale.transformed && response === scale.written;
  if (response !== scale.column && !modelScale) {
    const names = scale.transformed ? [scale.column, scale.written] : [scale.column];
    throw new CellError(
      `Cannot solve for "${response}" in predict "${ctx.name}": the response of fit "${spec.fit}" is ${
        quoted(names)
      }${didYouMean(response, names)}`,
      ["solve", response],
    );
  }
  if (fit.model.columns.length !== 1) {
    throw new CellError(
      `Cannot solve in predict "${ctx.name}": inverse prediction needs a fit with one predictor column, and "${spec.fit}" has ${fit.model.columns.length} (${
        quoted(fit.model.columns)
      })`,
      ["solve"],
    );
  }
  const col = fit.model.columns[0];
  const [lo, hi] = fittedRanges(fit)[0];
  const width = hi > lo ? hi - lo : Math.max(Math.abs(lo), 1);
  const c: InverseContext = {
    name: ctx.name,
    fit,
    fitName: spec.fit,
    model,
    settings,
    range: spec.search ?? [lo - ROOT_MARGIN * width, hi + ROOT_MARGIN * width],
    bandRange: spec.search ?? [lo - BAND_MARGIN * width, hi + BAND_MARGIN * width],
    warn: ctx.warn,
  };
  const m = spec.replicates ?? 1;
  return values.map((y0, k) => {
    const path = ["solve", response, ...(values.length > 1 ? [k] : [])];
    const shown = `"${response}" = ${y0}`;
    const z0 = modelScale ? y0 : scale.forward(y0);
    if (!Number.isFinite(z0)) {
      throw new CellError(
        `Cannot solve ${shown} in predict "${ctx.name}": "${scale.written}" is not finite there`,
        path,
      );
    }
    const r = inversePrediction(c, z0, shown, path);
    const extrapolated = r.x < lo || r.x > hi;
    if (extrapolated) {
      ctx.warn(
        `Extrapolation: ${shown} is solved by "${col}" = ${
          formatNumber(r.x, 6)
        }, outside the range fitted by "${spec.fit}", [${lo}, ${hi}]`,
      );
    }
    return {
      y: { [response]: y0 },
      x: { [col]: r.x },
      ci: r.ci,
      method: r.method,
      interval_for: m === 1
        ? "a new single observation of the response"
        : `the mean of ${m} new observations of the response`,
      extrapolated,
    };
  });
}
