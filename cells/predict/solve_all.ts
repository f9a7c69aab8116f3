/**
 * The `solve` part of a `predict` cell: each response value y₀ as written
 * (on the column's scale, or on the model scale when written as the
 * transformed response) solved for x by `inverse_prediction.ts`, with the
 * variance of the new observation(s) at y₀ along x (`new_observation.ts`:
 * a weight in the response is evaluated at y₀ itself, one in x along the
 * band), and an extrapolation warning.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { didYouMean } from "../../kernel/suggest.ts";
import type { RunContext } from "../../kernel/contract/mod.ts";
import type { Fit } from "../fit/mod.ts";
import type { PredictSpec } from "./spec.ts";
import type { PredictSolveResult } from "./result.ts";
import type { ModelAtEstimates } from "./mean_response.ts";
import type { IntervalSettings } from "./interval_settings.ts";
import type { ResponseScale } from "./response_scale.ts";
import { type InverseContext, inversePrediction, type NewVariance } from "./inverse_prediction.ts";
import { fittedRanges, quoted } from "./_points.ts";
import { formatNumber } from "../shared/format.ts";

/** Share of the fitted x range added on each side for the root search of `solve`. */
export const ROOT_MARGIN = 0.1;
/** Share of the fitted x range added on each side when looking for interval ends. */
export const BAND_MARGIN = 1;

/** What solving needs besides the spec and the run context. */
export interface SolveInputs {
  fit: Fit;
  model: ModelAtEstimates;
  settings: IntervalSettings;
  scale: ResponseScale;
  /** The covariance of the estimates (the fit's or a robust one). */
  covariance: Float64Array;
  /** A robust covariance's middle in the fit factor's coordinates, else null. */
  middle: Float64Array | null;
}

/**
 * Solves every value of `spec.solve`.
 *
 * @param ctx The run context (name, warnings).
 * @param spec The spec (`solve` not null).
 * @param s The fit, model, settings, scale and covariance.
 * @returns One result per value, in order.
 * @throws {CellError} At `solve.<response>` for a response that is not the
 *   fit's, a value whose transform is not finite, or no unique solution; at
 *   `solve` for a fit without exactly one predictor column.
 */
export function solveAll(
  ctx: RunContext,
  spec: PredictSpec,
  s: SolveInputs,
): PredictSolveResult[] {
  const { fit, scale } = s;
  const { response, values } = spec.solve!;
  const modelScale = checkSolvable(ctx.name, spec, fit, scale);
  const col = fit.model.columns[0];
  const [lo, hi] = fittedRanges(fit)[0];
  const width = hi > lo ? hi - lo : Math.max(Math.abs(lo), 1);
  const c: InverseContext = {
    name: ctx.name,
    fit,
    fitName: spec.fit,
    model: s.model,
    settings: s.settings,
    range: spec.search ?? [lo - ROOT_MARGIN * width, hi + ROOT_MARGIN * width],
    bandRange: spec.search ?? [lo - BAND_MARGIN * width, hi + BAND_MARGIN * width],
    covariance: s.covariance,
    middle: s.middle,
    warn: ctx.warn,
  };
  const obs = s.settings.newObservation, m = obs.m;
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
    const y = [modelScale ? scale.inverse(y0) ?? NaN : y0];
    const s0: NewVariance = {
      at: (x) => obs.at([[x]], 1, y, k).variance[0] / m,
      constant: !obs.variesWithX,
    };
    const r = inversePrediction(c, z0, shown, path, s0);
    if (r.ci === null && obs.known && obs.kind !== null && Number.isNaN(s0.at(r.x))) {
      ctx.warn(
        `No interval for ${shown}: the ${
          obs.kind === "weight" ? "weight" : "σ"
        } of a new observation (${obs.source}) is ${
          obs.at([[r.x]], 1, y, k).value[0]
        } there, and must be finite and positive`,
      );
    }
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
      unit: fit.units?.columns.get(col) ?? null,
    };
  });
}

/** Whether y₀ is written on the model scale; refuses a response that is not the fit's or a fit of several predictors. */
function checkSolvable(name: string, spec: PredictSpec, fit: Fit, scale: ResponseScale): boolean {
  const { response } = spec.solve!;
  const modelScale = scale.transformed && response === scale.written;
  if (response !== scale.column && !modelScale) {
    const names = scale.transformed ? [scale.column, scale.written] : [scale.column];
    throw new CellError(
      `Cannot solve for "${response}" in predict "${name}": the response of fit "${spec.fit}" is ${
        quoted(names)
      }${didYouMean(response, names)}`,
      ["solve", response],
    );
  }
  if (fit.model.columns.length !== 1) {
    throw new CellError(
      `Cannot solve in predict "${name}": inverse prediction needs a fit with one predictor column, and "${spec.fit}" has ${fit.model.columns.length} (${
        quoted(fit.model.columns)
      })`,
      ["solve"],
    );
  }
  return modelScale;
}
