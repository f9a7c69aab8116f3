/**
 * The `predict` cell kind: predictions from a fit cell, with intervals.
 *
 * ```predict end-of-life
 * fit: power
 * at: { cycle: [500, 1000] }
 * solve: { capacity: 2000 }
 * ```
 *
 * At each point of `at` (lists paired element by element): the mean response
 * with its standard error and confidence interval, and the prediction
 * interval for a new observation (`mean_response.ts`,
 * `interval_settings.ts`). For fits with one predictor, `solve` gives the x
 * that yields a response value, with a Fieller interval for straight lines
 * and an inverted prediction band otherwise (`inverse_prediction.ts`).
 * Transformed responses are reported back-transformed to the original scale
 * (`response_scale.ts`), with the mean of y by two labelled estimates for a
 * log response (`log_mean.ts`). A new observation's variance follows the
 * fit's weights or known σ at the point (`new_observation.ts`); `robust:`
 * uses a heteroscedasticity-consistent covariance (`interval_settings.ts`).
 * Warnings: extrapolation beyond the fitted range, points where the model is
 * not finite, weights that cannot be had at a point.
 *
 * @example
 * ```ts
 * import { predictKind } from "./mod.ts";
 * if (predictKind.kind !== "predict" || predictKind.output !== "Predictions") throw new Error();
 * ```
 *
 * @module
 */
import type { CellKind } from "../../kernel/contract/mod.ts";
import { parsePredictSpec, type PredictSpec } from "./spec.ts";
import type { Predictions, PredictResult } from "./result.ts";
import { runPredict } from "./run.ts";
import { PREDICT_OPTIONS } from "./spec.ts";
import { predictHistory } from "./history.ts";
import type { TemplateContext } from "../../kernel/contract/mod.ts";
import { cellsOf, fitColumns } from "../shared/template_cells.ts";
import { formatEstimate, formatIntervalAt, formatNumber, withUnit } from "../shared/format.ts";
import { digitsFrom, predictDetails, solveUncertainty } from "./_digits.ts";

export type { PredictSpec } from "./spec.ts";
export type {
  Predictions,
  PredictPointResult,
  PredictResult,
  PredictSolveResult,
} from "./result.ts";

/** The `predict` kind record. */
export const predictKind: CellKind<PredictSpec, Predictions, PredictResult> = {
  kind: "predict",
  body: "yaml",
  output: "Predictions",
  description: "predicts from a fit with confidence and prediction intervals, and inverts it",
  parse: parsePredictSpec,
  inputs: (spec) => [{ name: spec.fit, accepts: ["Fit"], path: ["fit"] }],
  run: runPredict,
  summary: (out) => out.result,
  line: predictLine,
  // Points with intervals beyond Wald: every interval named by its method (issue 19).
  details: predictDetails,
  options: PREDICT_OPTIONS,
  template: predictTemplate,
  history: predictHistory,
};

/**
 * One human line: the first point and the first inverse prediction, and counts.
 *
 * @param r The result.
 * @returns The line.
 * @example
 * ```ts
 * import { predictLine } from "./mod.ts";
 * const line = predictLine({ fit: "line", level: 0.95, at: [], solve: [], response: "y",
 *   scale: "", se_scale: "", distribution: "t(3)", new_observation: "", weight_source: "",
 *   covariance: "", robust: null, mean_method: "" });
 * if (!line.startsWith("from line")) throw new Error(line);
 * ```
 */
export function predictLine(r: PredictResult): string {
  const parts = [`from ${r.fit} at ${formatNumber(100 * r.level, 4)}%`];
  const p = r.at[0];
  if (p !== undefined) {
    const x = Object.entries(p.x).map(([k, v]) => `${k} = ${formatNumber(v, 6)}`).join(", ");
    const more = r.at.length > 1 ? ` (+${r.at.length - 1} points)` : "";
    const same = r.se_scale === r.scale;
    const at = digitsFrom(p.se_fit, p.ci, same);
    const pi = formatIntervalAt(p.pi, digitsFrom(p.se_prediction, p.pi, same), p.estimate);
    parts.push(`${x}: ${withUnit(formatEstimate(p.estimate, at), p.unit)}, PI ${pi}${more}`);
  }
  const s = r.solve[0];
  if (s !== undefined) {
    const [[yk, yv]] = Object.entries(s.y), [[xk, xv]] = Object.entries(s.x);
    const more = r.solve.length > 1 ? ` (+${r.solve.length - 1})` : "";
    parts.push(
      `${yk} = ${formatNumber(yv, 6)} at ${xk} = ${
        withUnit(formatEstimate(xv, solveUncertainty(s)), s.unit)
      } ${formatIntervalAt(s.ci, solveUncertainty(s), xv)}${more}`,
    );
  }
  return parts.join(" · ");
}

/** A new prediction from the last fit, at 1 on its first predictor (in the domain of log, sqrt, powers). */
function predictTemplate(ctx: TemplateContext): string {
  const fit = cellsOf(ctx, "Fit").at(-1);
  const x = fit ? fitColumns(ctx, fit).predictors[0] ?? "x" : "x";
  return `fit: ${fit?.name ?? "fit1"}\nat: { ${x}: [1] }\n`;
}
