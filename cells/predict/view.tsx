/**
 * The predict cell's view: a table of points (predictor values, estimate,
 * standard errors of the mean response and of a new observation, the new
 * observation's weight or σ for weighted fits, interval for the mean
 * response, interval for a new observation, and for a log response the two
 * labelled estimates of the mean of y) and a table of inverse predictions
 * (response value, the x that gives it, its interval and the method). Plain
 * markup, shared by the live page and the static record.
 *
 * @module
 */
import type { VNode } from "preact";
import type { PageFace, ViewProps } from "../../kernel/contract/mod.ts";
import type { PredictPointResult, PredictResult, PredictSolveResult } from "./result.ts";
import {
  formatEstimate,
  formatIntervalAt,
  formatNumber,
  formatUncertainty,
  withUnit,
} from "../shared/format.ts";
import { digitsFrom, quarterWidth, solveUncertainty } from "./_digits.ts";

/**
 * Renders a predict result.
 *
 * @param props The cell name and its summary.
 * @returns The block's content.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { PredictView } from "./view.tsx";
 * const html = renderToString(PredictView({ name: "eol", result: {
 *   fit: "line", level: 0.95, response: "y", scale: "response as written",
 *   se_scale: "response as written", distribution: "t(8)", new_observation: "s²/m",
 *   weight_source: "none: the fit is unweighted", covariance: "the fit's: s²(XᵀX)⁻¹",
 *   robust: null, mean_method: "exact",
 *   at: [{ x: { x: 2 }, estimate: 5, se_fit: 0.1, ci: [4.8, 5.2], pi: [4, 6],
 *     se_prediction: 0.44, extrapolated: false, unit: "mAh" }],
 *   solve: [{ y: { y: 5 }, x: { x: 2 }, ci: [1.5, 2.5], method: "fieller",
 *     interval_for: "a new single observation of the response", extrapolated: false, unit: "s" }],
 * } }));
 * if (!html.includes("fieller")) throw new Error(html);
 * ```
 */
export function PredictView({ name, result: r }: ViewProps<PredictResult>): VNode {
  const level = `${formatNumber(100 * r.level, 4)}%`;
  const columns = r.at.length > 0 ? Object.keys(r.at[0].x) : [];
  const own = r.at.some((p) => "weight" in p)
    ? "weight"
    : r.at.some((p) => "sigma" in p)
    ? "sigma"
    : null;
  const means = r.at.find((p) => p.mean_estimates)?.mean_estimates ?? [];
  const yUnit = r.at.find((p) => p.unit)?.unit ?? null;
  // A standard error on the model's scale (log y) sets no digits for an estimate on y's.
  const sameScale = r.se_scale === r.scale;
  return (
    <section class="plumb-predict" aria-label={`Predictions ${name}`}>
      <p class="plumb-predict-basis">
        From fit <code>{r.fit}</code>, response <code>{r.response}</code> on the {r.scale}{" "}
        scale; intervals at {level} from {r.distribution}; covariance:{" "}
        {r.covariance}; a new observation's variance: {r.new_observation}
        {own === null ? "" : `; its ${own}: ${r.weight_source}`}.
        {r.estimate_is ? ` Estimate: ${r.estimate_is}.` : ""}
        {means.map((m) => ` Mean (${m.method}): ${m.label}.`).join("")}
      </p>
      {r.at.length > 0 && (
        <table class="plumb-predict-points">
          <thead>
            <tr>
              {columns.map((c) => <th scope="col" key={c}>{c}</th>)}
              <th scope="col">
                {headed(r.estimate_is ? "Estimate (median)" : "Estimate", yUnit)}
              </th>
              <th scope="col">Standard uncertainty, mean ({r.se_scale})</th>
              <th scope="col">Standard uncertainty, new observation ({r.se_scale})</th>
              {own && <th scope="col">{own === "weight" ? "Weight w₀" : "σ₀"}</th>}
              <th scope="col">{headed(`${level} mean response`, yUnit)}</th>
              <th scope="col">{headed(`${level} new observation`, yUnit)}</th>
              {means.map((m) => <th scope="col" key={m.method}>{meanHeader(m.method, level)}</th>)}
            </tr>
          </thead>
          <tbody>
            {r.at.map((p, i) => (
              <tr key={i}>
                {columns.map((c) => (
                  <td key={c}>
                    {formatNumber(p.x[c], 6)}
                    {p.extrapolated ? " (extrapolated)" : ""}
                  </td>
                ))}
                <td>{formatEstimate(p.estimate, digitsFrom(p.se_fit, p.ci, sameScale))}</td>
                <td>{formatUncertainty(p.se_fit)}</td>
                <td>{formatUncertainty(p.se_prediction)}</td>
                {own && <td>{formatNumber(ownValue(p, own), 4)}</td>}
                <td>{formatIntervalAt(p.ci, digitsFrom(p.se_fit, p.ci, sameScale), p.estimate)}</td>
                <td>
                  {formatIntervalAt(p.pi, digitsFrom(p.se_prediction, p.pi, sameScale), p.estimate)}
                </td>
                {means.map((m, k) => <td key={m.method}>{meanCell(p, k)}</td>)}
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {r.solve.length > 0 && (
        <table class="plumb-predict-solve">
          <thead>
            <tr>
              <th scope="col">Response</th>
              <th scope="col">Solved for</th>
              <th scope="col">{level} interval</th>
              <th scope="col">Method</th>
            </tr>
          </thead>
          <tbody>
            {r.solve.map((s, i) => (
              <tr key={i}>
                <td>{entries(s.y, yUnit)}</td>
                <td>{solved(s)}{s.extrapolated ? " (extrapolated)" : ""}</td>
                <td>{withUnit(solvedInterval(s), s.unit)}</td>
                <td>{s.method}, for {s.interval_for}</td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}

function ownValue(p: PredictPointResult, own: "weight" | "sigma"): number | null {
  return p[own] ?? null;
}

function meanHeader(method: string, level: string): string {
  return method === "lognormal" ? `Mean, lognormal (${level} interval)` : "Mean, Duan smearing";
}

function meanCell(p: PredictPointResult, k: number): string {
  const m = p.mean_estimates?.[k];
  if (m === undefined) return "—";
  return m.ci === null
    ? formatNumber(m.estimate, 6)
    : `${formatNumber(m.estimate, 6)} ${formatIntervalAt(m.ci, quarterWidth(m.ci), m.estimate)}`;
}

/** `capacity = 2300 mAh`: given values as written, with their unit. */
function entries(v: Record<string, number>, unit: string | null): string {
  return Object.entries(v).map(([k, x]) => withUnit(`${k} = ${formatNumber(x, 6)}`, unit)).join(
    ", ",
  );
}

/** The solved x, to the digits its interval supports (a quarter of its width as the uncertainty). */
function solved(s: PredictSolveResult): string {
  const u = solveUncertainty(s);
  return Object.entries(s.x).map(([k, x]) => withUnit(`${k} = ${formatEstimate(x, u)}`, s.unit))
    .join(", ");
}

function solvedInterval(s: PredictSolveResult): string {
  const x = Object.values(s.x)[0] ?? null;
  return formatIntervalAt(s.ci, solveUncertainty(s), x);
}

/** `header (unit)`, or the header alone. */
function headed(text: string, unit: string | null): string {
  return unit ? `${text} (${unit})` : text;
}

/** The `predict` kind's page face: its view, for the live page and the record. */
export const predictPage: PageFace<PredictResult, VNode> = { kind: "predict", view: PredictView };
