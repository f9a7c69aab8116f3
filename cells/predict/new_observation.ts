/**
 * The variance of a new observation at a point, for prediction intervals
 * and `se_prediction` (the standard error of a new observation,
 * √(se_fit² + s₀²/m), m new observations averaged).
 *
 * - Unweighted fits: s₀² = s², the residual variance.
 * - Relative weights (`weights:`, wᵢ ∝ 1/σᵢ²): s₀² = s²/w₀. Without the
 *   option `weight`, w₀ is the fit's own weights expression evaluated at the
 *   new point (1/x² at x₀ for a 1/x² calibration): the expression is the
 *   fit's model of how the variance changes, so a new observation at x₀
 *   follows it; w₀ = 1 would give s², the variance where w = 1, which at
 *   the top of a 1/x² calibration is many times too small.
 * - Known standard deviations (`known_sigma:`): s₀² = σ₀², σ₀ the option
 *   `sigma` or else the fit's known_sigma expression at the point.
 * - An expression that reads the response column (weights 1/y²) is
 *   evaluated with the response at its prediction on the column's scale (a
 *   new point has no observed y; the fitted mean stands in for the observed
 *   value, the usual plug-in of a variance function, e.g. Carroll & Ruppert,
 *   *Transformation and Weighting in Regression*, 1988, ch. 2; from memory),
 *   with a warning. One that reads any other column (weights: w) cannot be
 *   evaluated at a new point: prediction intervals are then not given, with
 *   a warning asking for the option; a number would be a guess.
 * - A w₀ or σ₀ that is not finite and positive at a point (1/x² at x = 0)
 *   gives no prediction interval there.
 *
 * (Draper & Smith, *Applied Regression Analysis*, 3rd ed., §1.4 and ch. 9;
 * from memory.)
 *
 * @module
 */
import { compile, freeNames, parseExpression } from "../../kernel/expr/mod.ts";
import type { Fit } from "../fit/mod.ts";
import type { PredictSpec } from "./spec.ts";
import { quoted } from "./_points.ts";
import { rowList } from "../shared/rows.ts";

/** A new observation's weight or σ and variance at each of `n` points. */
export interface NewObservationAt {
  /** w₀ (relative weights) or σ₀ (known σ) per point; NaN where unknown, NaN for unweighted fits. */
  value: Float64Array;
  /** Variance of one new observation per point (s²/w₀, σ₀², s²); NaN where unknown. */
  variance: Float64Array;
}

/** How a `predict` cell obtains the variance of a new observation. */
export interface NewObservation {
  /** Which per-point value is reported: "weight", "sigma", or null for an unweighted fit. */
  kind: "weight" | "sigma" | null;
  /** RUN-JSON `weight_source`: where w₀ or σ₀ comes from, in words. */
  source: string;
  /** RUN-JSON `new_observation`: s₀² in words. */
  statement: string;
  /** New observations averaged (`replicates`). */
  m: number;
  /** False when w₀ or σ₀ cannot be had at any point (the expression reads a column a point does not give). */
  known: boolean;
  /** Whether s₀² depends on the predictor columns (then a straight line's Fieller interval does not apply). */
  variesWithX: boolean;
  /**
   * The values at points.
   *
   * @param cols The points, one array per `fit.model.columns` entry.
   * @param n The number of points.
   * @param response The response column's value standing in at each point (its prediction, or y₀ of `solve`).
   * @param index Which entry of a per-point option list to use for every point (solve value k); else entry i for point i.
   */
  at(
    cols: readonly ArrayLike<number>[],
    n: number,
    response: ArrayLike<number>,
    index?: number,
  ): NewObservationAt;
}

/**
 * Works out the new observation's variance for a fit and a predict spec,
 * warning about options that do not apply and variances that cannot be had.
 *
 * @param fit The fit predicted from.
 * @param spec The predict cell's spec.
 * @param warn Records a warning on the cell.
 * @returns The variance model.
 * @example
 * ```ts
 * import { parseModel } from "../../kernel/expr/mod.ts";
 * import { newObservation } from "./new_observation.ts";
 * import type { Fit } from "../fit/mod.ts";
 * const model = parseModel("y = a + b*x", ["x", "y"]);
 * const fit = { model, weighting: "relative", weightsText: "1/x^2", statistics: { sigma: 2 } } as unknown as Fit;
 * const v = newObservation(fit, { fit: "cal", at: null, solve: null }, () => {}).at([[10]], 1, [NaN]);
 * if (v.value[0] !== 0.01 || Math.abs(v.variance[0] - 400) > 1e-12) throw new Error("s²/w₀ = 4·100");
 * ```
 */
export function newObservation(
  fit: Fit,
  spec: PredictSpec,
  warn: (m: string) => void,
): NewObservation {
  const m = spec.replicates ?? 1;
  const of = m === 1 ? "a new observation" : `the mean of ${m} new observations`;
  const s2 = (fit.statistics.sigma ?? NaN) ** 2;
  if (spec.weight !== undefined && fit.weighting !== "relative") {
    warn(`Option "weight" is not used: fit "${spec.fit}" has no relative weights`);
  }
  if (spec.sigma !== undefined && fit.weighting !== "absolute") {
    warn(`Option "sigma" is not used: fit "${spec.fit}" has no known standard deviations`);
  }
  if (fit.weighting === "none") {
    const nan = (n: number) => new Float64Array(n).fill(NaN);
    return {
      kind: null,
      source: "none: the fit is unweighted",
      statement: `s²/m for ${of}, s the residual standard error`,
      m,
      known: true,
      variesWithX: false,
      at: (_c, n) => ({ value: nan(n), variance: new Float64Array(n).fill(s2) }),
    };
  }
  const relative = fit.weighting === "relative";
  const kind = relative ? "weight" : "sigma";
  const toVariance = relative ? (w: number) => s2 / w : (s: number) => s * s;
  const formula = relative ? `s²/(w₀·m) for ${of}` : `σ₀²/m for ${of}`;
  const symbol = relative ? "w₀" : "σ₀";
  const given = relative ? spec.weight : spec.sigma;
  if (given !== undefined) {
    const shown = given.length === 1 ? `${symbol} = ${given[0]}` : `${symbol} per point`;
    return {
      kind,
      source: `given (option ${kind})`,
      statement: `${formula}, ${shown} (option ${kind})`,
      m,
      known: true,
      variesWithX: given.length > 1,
      at: (_c, n, _r, index) =>
        valued(n, (i) => given[given.length === 1 ? 0 : index ?? i], toVariance),
    };
  }
  return fromExpression(fit, spec.fit, kind, formula, m, toVariance, warn);
}

/** The default: the fit's weights or known_sigma expression at the point. */
function fromExpression(
  fit: Fit,
  fitName: string,
  kind: "weight" | "sigma",
  formula: string,
  m: number,
  toVariance: (v: number) => number,
  warn: (m: string) => void,
): NewObservation {
  const key = kind === "weight" ? "weights" : "known_sigma";
  const text = fit.weightsText ?? "";
  const expr = text === "" ? null : parseExpression(text);
  const names = expr === null ? [] : [...freeNames(expr)];
  const { columns, responseColumn } = fit.model;
  const others = names.filter((c) => c !== responseColumn && !columns.includes(c));
  if (expr === null) others.push("(not recorded)");
  const what = kind === "weight" ? "weight" : "σ";
  if (others.length > 0) {
    const why = `its ${key} "${text}" ${others.length === 1 ? "reads column" : "read columns"} ${
      quoted(others)
    }, which a new point does not give`;
    warn(
      `Prediction intervals are not given: fit "${fitName}" has ${
        kind === "weight" ? "relative weights" : "known standard deviations"
      } per row and ${why}: give the ${what} of a new observation with the option ${kind}`,
    );
    return {
      kind,
      source: `none: ${why.replace(/^its /, "the fit's ")}`,
      statement: `unknown: give the ${what} of a new observation with the option ${kind}`,
      m,
      known: false,
      variesWithX: false,
      at: (_c, n) => valued(n, () => NaN, toVariance),
    };
  }
  const usesResponse = names.includes(responseColumn);
  if (usesResponse) {
    warn(
      `The ${what} of a new observation is fit "${fitName}"'s ${key} "${text}" with "${responseColumn}" at its prediction, as a new point has no observed "${responseColumn}": give the option ${kind} to set it`,
    );
  }
  const f = compile(expr!, names, []);
  const at = usesResponse ? `, "${responseColumn}" at its prediction` : "";
  return {
    kind,
    source: `the fit's ${key} expression "${text}" at the point${at}`,
    statement: `${formula}, ${kind === "weight" ? "w₀" : "σ₀"} = ${text} at the point${at}`,
    m,
    known: true,
    variesWithX: names.some((c) => columns.includes(c)),
    at: (cols, n, response) => {
      const v = f(
        names.map((c) => (c === responseColumn ? response : cols[columns.indexOf(c)])),
        [],
        n,
      );
      return valued(n, (i) => v[i], toVariance);
    },
  };
}

/** w₀ or σ₀ per point and its variance; NaN variance where the value is not finite and positive. */
function valued(n: number, value: (i: number) => number, toVariance: (v: number) => number) {
  const out: NewObservationAt = { value: new Float64Array(n), variance: new Float64Array(n) };
  for (let i = 0; i < n; i++) {
    const v = value(i);
    out.value[i] = v;
    out.variance[i] = v > 0 && v < Infinity ? toVariance(v) : NaN;
  }
  return out;
}

/**
 * The warning for points where w₀ or σ₀ is not finite and positive.
 *
 * @param o The variance model.
 * @param points Point numbers (from 1).
 * @param values The values there.
 * @returns The message.
 * @example
 * ```ts
 * import { invalidValueMessage } from "./new_observation.ts";
 * const m = invalidValueMessage({ kind: "weight", source: "s" } as never, [1], [Infinity]);
 * if (!m.startsWith("Prediction intervals are not given at point 1")) throw new Error(m);
 * ```
 */
export function invalidValueMessage(o: NewObservation, points: number[], values: number[]): string {
  const what = o.kind === "weight" ? "weight" : "σ";
  const list = rowList(points.map((p, k) => `${p} (${values[k]})`));
  return `Prediction intervals are not given at ${points.length === 1 ? "point" : "points"} ${
    list.replace(/^rows? /, "")
  }: the ${what} of a new observation (${o.source}) must be finite and positive there`;
}
