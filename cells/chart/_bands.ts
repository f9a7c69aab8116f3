/**
 * The bands of one fit on the chart's grid: of the mean, of a new
 * observation, or both; pointwise or simultaneous over the plotted range.
 *
 * ```
 *  seFitOn (delta method) ─▶ se_fit(x) ─┬─ mean:        f̂ ± q·se_fit
 *                                       └─ observation: f̂ ± q·√(se_fit² + s₀²(x)/m)
 *  q: pointwise   t(1 − α/2; ν)                  (z with known σ)
 *     scheffe     √(p·F(c; p, ν)) for the mean   (√χ²(c; p) with known σ)
 *                 √((p+1)·F(c; p+1, ν)) for a new observation
 *     bootstrap   sup-t order statistic of the fit's replicates (mean only)
 * ```
 *
 * The new observation's variance s₀² at x is the predict cell's
 * (cells/predict/new_observation.ts, one home for it): s² unweighted, s²/w₀
 * with relative weights and σ₀² with known standard deviations, w₀ or σ₀
 * the fit's weights expression evaluated at x. When that expression reads a
 * column a point on the curve does not give, the band assumes the fitted
 * rows' mean variance, s²·mean(1/wᵢ) (mean(σᵢ²) with known σ), and says so.
 *
 * The simultaneous band of a new observation. No finite band covers a new
 * observation at every x at once (their errors are independent, so their
 * maximum is unbounded). What the `scheffe` band covers is Scheffé's
 * S-method applied to the p + 1 directions (θ̂ − θ, e₀): with probability c
 * it holds at once for the mean's error at every x plus one new observation
 * (or mean of m) taken at any x of the plotted range, the use a calibration
 * curve is put to (our application of Scheffé 1959, §3.5; with known σ, χ²
 * on p + 1). Each single new observation is then covered at least at c.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import type { RunContext } from "../../kernel/contract/mod.ts";
import { newObservation } from "../predict/new_observation.ts";
import type { Fit } from "../fit/fit.ts";
import type { DrawnFit } from "./_fit_layers.ts";
import type { ChartSpec } from "./spec.ts";
import { bandEnds, meanOn, type SeFit, seFitOn } from "./_curves.ts";
import { type Multiplier, pointwiseMultiplier, scheffeMultiplier } from "./_band_quantiles.ts";
import { bootstrapOf, leastReplicates, supTMultiplier } from "./_bootstrap_band.ts";

/** One band on the grid, at full precision, ends on the response column's scale. */
export interface GridBand {
  /** The band of the mean response, or of a new observation (a prediction band). */
  kind: "mean" | "observation";
  coverage: "pointwise" | "simultaneous";
  /** e.g. "delta, pointwise", "Scheffé, simultaneous", "bootstrap sup-t, simultaneous, B = 2000". */
  method: string;
  level: number;
  /** q in f̂ ± q·se. */
  quantile: number;
  /** The quantile named: `t(0.975; 8)`, `√(2·F(0.95; 2, 8))`, … */
  quantileOf: string;
  /** What the method rests on here (Working–Hotelling, linearised, …), or null. */
  note: string | null;
  /** A new observation's variance in words (observation bands), else null. */
  newObservation: string | null;
  lo: Float64Array;
  hi: Float64Array;
}

/**
 * Computes the bands the spec asks of the fit `d`.
 *
 * @param spec The chart's spec (`bandFor`, `bandMethod`, `bandLevel`, `newObservations`).
 * @param ctx Settings (the document's confidence), warnings, the cell name.
 * @param d The band's fit.
 * @param grid x values.
 * @returns The mean's band first, then the new observation's, as asked.
 * @throws {CellError} At `band_method` for a bootstrap band of a fit without
 *   replicates or with too few for the level; at `band_for` for a band of a
 *   new observation of a fit without a residual variance.
 */
export function bandsOf(
  spec: ChartSpec,
  ctx: RunContext,
  d: DrawnFit,
  grid: Float64Array,
): GridBand[] {
  const level = spec.bandLevel ?? ctx.settings.confidence;
  const mean = meanOn(d.fit, grid);
  const sf = seFitOn(d.fit, grid);
  if (sf.held) {
    ctx.warn(
      `Band of "${d.name}" in chart "${ctx.name}" leaves out the parameters held at a bound: they have no standard error`,
    );
  }
  const out: GridBand[] = [];
  if (spec.bandFor !== "observation") out.push(meanBand(spec, ctx, d, grid, mean, sf, level));
  if (spec.bandFor !== "mean") out.push(observationBand(spec, ctx, d, grid, mean, sf, level));
  return out;
}

function meanBand(
  spec: ChartSpec,
  ctx: RunContext,
  d: DrawnFit,
  grid: Float64Array,
  mean: Float64Array,
  sf: SeFit,
  level: number,
): GridBand {
  const s = d.fit.statistics;
  let m: Multiplier, method: string, note: string | null = null;
  if (spec.bandMethod === "pointwise") {
    m = pointwiseMultiplier(s.inference, s.dfResidual, level);
    method = "delta, pointwise";
  } else if (spec.bandMethod === "scheffe") {
    m = scheffeMultiplier(s.inference, sf.free, s.dfResidual, level);
    method = "Scheffé, simultaneous";
    note = scheffeNote(d.fit, sf, grid);
  } else {
    const boot = bootstrapOf(d.fit);
    if (boot === null) {
      throw new CellError(
        `Cannot draw a bootstrap band of fit "${d.name}" in chart "${ctx.name}": the fit has no bootstrap replicates: ask the fit for bootstrap intervals (intervals: [wald, bootstrap], or bootstrap: { resamples: 2000 })`,
        ["band_method"],
      );
    }
    if (boot.b < leastReplicates(level)) {
      throw new CellError(
        `Cannot draw a bootstrap band of fit "${d.name}" in chart "${ctx.name}" at level ${level}: it needs at least ${
          leastReplicates(level)
        } replicates, and the fit has ${boot.b}`,
        ["band_method"],
      );
    }
    const t = supTMultiplier(d.fit, boot, grid, mean, sf.se, level);
    if (t.nonFinite > 0) {
      ctx.warn(
        `Bootstrap band of "${d.name}" in chart "${ctx.name}": ${t.nonFinite} of ${boot.b} replicate curves are not finite somewhere on the plotted range and count as exceeding every bound`,
      );
    }
    m = t;
    method = `bootstrap sup-t, simultaneous, B = ${boot.b}`;
    note =
      `${boot.resample} resampling, seed ${boot.seed}; studentised by the delta method's se_fit`;
  }
  const half = sf.se.map((v) => m.q * v);
  return {
    kind: "mean",
    coverage: spec.bandMethod === "pointwise" ? "pointwise" : "simultaneous",
    method,
    level,
    quantile: m.q,
    quantileOf: m.of,
    note,
    newObservation: null,
    ...bandEnds(mean, half, d.inverse),
  };
}

/** Working–Hotelling for a straight line; exact for a linear model; linearised otherwise. */
function scheffeNote(fit: Fit, sf: SeFit, grid: Float64Array): string {
  if (sf.free === 2 && straightLine(sf.gradient, grid)) {
    return "Working–Hotelling: the straight line's mean over every x at once";
  }
  if (fit.method === "linear") {
    return `Scheffé over the ${sf.free} parameters: exact for a model linear in its parameters`;
  }
  return `linearised: Scheffé over the ${sf.free} parameters on the tangent plane at the estimates (approximate for a nonlinear model)`;
}

/** Whether the gradients are 1 and x: the model is a + b·x on its fitted scale. */
function straightLine(g: Float64Array[], grid: Float64Array): boolean {
  const near = (a: Float64Array, b: (i: number) => number) =>
    a.every((v, i) => Math.abs(v - b(i)) <= 1e-12 * (1 + Math.abs(b(i))));
  const one = g.findIndex((a) => near(a, () => 1));
  return one >= 0 && g.some((a, j) => j !== one && near(a, (i) => grid[i]));
}

function observationBand(
  spec: ChartSpec,
  ctx: RunContext,
  d: DrawnFit,
  grid: Float64Array,
  mean: Float64Array,
  sf: SeFit,
  level: number,
): GridBand {
  const s = d.fit.statistics;
  const v0 = newVariance(spec, ctx, d, grid, mean);
  let m: Multiplier, method: string, note: string | null = null;
  if (spec.bandMethod === "scheffe") {
    m = scheffeMultiplier(s.inference, sf.free + 1, s.dfResidual, level);
    method = "Scheffé, simultaneous";
    note =
      `Scheffé over the ${sf.free} parameters and one new observation: covers at once the mean curve and one new observation taken at any x of the plotted range`;
  } else {
    m = pointwiseMultiplier(s.inference, s.dfResidual, level);
    method = "delta, pointwise";
  }
  const half = new Float64Array(grid.length);
  let missing = 0;
  for (let i = 0; i < grid.length; i++) {
    half[i] = m.q * Math.sqrt(sf.se[i] ** 2 + v0.variance[i] / spec.newObservations);
    if (Number.isNaN(v0.variance[i])) missing++;
  }
  if (missing > 0 && v0.known) {
    ctx.warn(
      `Band of a new observation of "${d.name}" in chart "${ctx.name}" is not drawn at ${missing} of ${grid.length} grid points: the ${v0.what} of a new observation (${v0.source}) is not finite and positive there`,
    );
  }
  return {
    kind: "observation",
    coverage: spec.bandMethod === "pointwise" ? "pointwise" : "simultaneous",
    method,
    level,
    quantile: m.q,
    quantileOf: m.of,
    note,
    newObservation: v0.statement,
    ...bandEnds(mean, half, d.inverse),
  };
}

/**
 * s₀²(x) per grid point by the predict cell's rule, or the fitted rows' mean
 * variance (said in a warning) when the weights expression reads a column a
 * point on the curve does not give.
 */
function newVariance(
  spec: ChartSpec,
  ctx: RunContext,
  d: DrawnFit,
  grid: Float64Array,
  mean: Float64Array,
) {
  const fit = d.fit, m = spec.newObservations;
  const rule = newObservation(
    fit,
    { fit: d.name, at: null, solve: null, replicates: m },
    () => {}, // predict's warnings name predict's options; the chart says its own below
  );
  const what = rule.kind === "sigma" ? "σ" : "weight";
  if (rule.known) {
    const at = rule.at(fit.model.columns.map(() => grid), grid.length, mean.map(d.inverse));
    if (rule.source.includes("at its prediction")) {
      ctx.warn(
        `Band of a new observation of "${d.name}" in chart "${ctx.name}": its ${what} is the fit's expression "${fit.weightsText}" with "${fit.model.responseColumn}" at the curve, as a new point has no observed "${fit.model.responseColumn}"`,
      );
    }
    return { ...rule, what, variance: at.variance };
  }
  const w = fit.weights;
  if (w === null || w.length === 0) {
    throw new CellError(
      `Cannot draw the band of a new observation of fit "${d.name}" in chart "${ctx.name}": ${rule.source}, and the fit keeps no weights per row to average`,
      ["band_for"],
    );
  }
  let sum = 0;
  for (let i = 0; i < w.length; i++) sum += 1 / w[i];
  const s2 = fit.weighting === "relative" ? (fit.statistics.sigma ?? NaN) ** 2 : 1;
  const v = s2 * sum / w.length;
  const formula = fit.weighting === "relative" ? "s²·mean(1/wᵢ)" : "mean(σᵢ²)";
  const of = m === 1 ? "a new observation" : `the mean of ${m} new observations`;
  const statement =
    `${formula}/m for ${of}: the fitted rows' mean variance, assumed, as ${rule.source}`;
  ctx.warn(
    `Band of a new observation of "${d.name}" in chart "${ctx.name}" assumes the fitted rows' mean variance (${formula} = ${
      Number(v.toPrecision(4))
    }): ${rule.source.replace(/^none: /, "")}`,
  );
  return {
    ...rule,
    what,
    statement,
    source: "the fitted rows' mean variance",
    variance: new Float64Array(grid.length).fill(v),
  };
}
