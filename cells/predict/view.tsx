/**
 * The predict cell's view: a table of points (predictor values, estimate,
 * standard errors of the mean response and of a new observation, the new
 * observation's weight or σ for weighted fits, interval for the mean
 * response, interval for a new observation, and for a log response the two
 * labelled estimates of the mean of y) and a table of inverse predictions
 * (response value, the x that gives it, its interval and the method). Plain
 * markup, shared by the live page and the static record.
 *
 * Intervals beyond Wald (issue 19: profile, bootstrap percentile and BCa of
 * the mean response, the bootstrap's for a new observation) sit under the
 * Wald interval in the same cell, one line each, named by method, with the
 * larger Monte Carlo error of a bootstrap interval's limits in text (a
 * printed record has no hover) and notes numbered under the table.
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
import {
  beyondWald,
  digitsFrom,
  end,
  METHOD_WORDS,
  quarterWidth,
  solveUncertainty,
} from "./_digits.ts";
import type { LabelledInterval } from "./result.ts";

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
  const beyond = r.at.some(beyondWald);
  const notes: string[] = [];
  const mark = (text: string) => {
    const k = notes.indexOf(text);
    if (k >= 0) return k + 1;
    notes.push(text);
    return notes.length;
  };
  return (
    <section class="plumb-predict" aria-label={`Predictions ${name}`}>
      <p class="plumb-predict-basis">
        From fit <code>{r.fit}</code>, response <code>{r.response}</code> on the {r.scale}{" "}
        scale; intervals at {level} from {r.distribution}; covariance:{" "}
        {r.covariance}; a new observation's variance: {r.new_observation}
        {own === null ? "" : `; its ${own}: ${r.weight_source}`}.
        {r.estimate_is ? ` Estimate: ${r.estimate_is}.` : ""}
        {means.map((m) => ` Mean (${m.method}): ${m.label}.`).join("")}
        {beyond && r.interval_methods ? ` Interval methods: ${r.interval_methods}.` : ""}
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
                <td>
                  {beyond && <span class="pl-muted">Wald&nbsp;</span>}
                  {formatIntervalAt(p.ci, digitsFrom(p.se_fit, p.ci, sameScale), p.estimate)}
                  {others(p.intervals, digitsFrom(p.se_fit, p.ci, sameScale), p.estimate, mark)}
                </td>
                <td>
                  {beyond && <span class="pl-muted">Wald&nbsp;</span>}
                  {formatIntervalAt(p.pi, digitsFrom(p.se_prediction, p.pi, sameScale), p.estimate)}
                  {others(
                    p.pi_intervals,
                    digitsFrom(p.se_prediction, p.pi, sameScale),
                    p.estimate,
                    mark,
                  )}
                </td>
                {means.map((m, k) => <td key={m.method}>{meanCell(p, k)}</td>)}
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {notes.length > 0 && (
        <ol class="plumb-predict-notes pl-note">
          {notes.map((n) => <li key={n}>{n}</li>)}
        </ol>
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

/**
 * The intervals beyond Wald under the Wald one, a line each: method, limits ("open" for a
 * side not bounded), the larger Monte Carlo error of the two limits, a note's number.
 */
function others(
  list: LabelledInterval[] | undefined,
  u: number | null,
  estimate: number | null,
  mark: (note: string) => number,
): VNode[] {
  return (list ?? []).filter((i) => i.method !== "wald").map((i) => {
    const mc = Math.max(i.mc_error?.lower ?? 0, i.mc_error?.upper ?? 0);
    return (
      <div class="plumb-predict-alt" key={i.method}>
        <span class="pl-muted">{METHOD_WORDS[i.method]}</span> [{end(i.lower, u, estimate)},{" "}
        {end(i.upper, u, estimate)}]
        {mc > 0 && <span class="pl-muted">{` MC ±${formatUncertainty(mc)}`}</span>}
        {i.note && <sup>{mark(i.note)}</sup>}
      </div>
    );
  });
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
