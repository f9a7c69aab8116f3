/**
 * Which uncertainty sets the digits of a prediction (shared by the view and
 * the CLI line, so both round alike; GUM, JCGM 100:2008, §7.2.6), and a
 * point's labelled intervals as text (issue 19), for the CLI summary's lines
 * and the page: each named by its method, its ends at the digits the point's
 * uncertainty supports, "open" for a side that is not bounded.
 *
 * ```
 *  conc = 0.05: 93.2, u 4.8 · 95% mean Wald 82.4 … 104.0; profile 82.2 … 104.6;
 *      bootstrap percentile 84.6 … 103.7; bootstrap BCa 86.3 … 106.4
 *      · new observation Wald 66.5 … 119.8; bootstrap percentile 73.5 … 121.2
 * ```
 *
 * @module
 */
import type {
  LabelledInterval,
  PredictPointResult,
  PredictResult,
  PredictSolveResult,
} from "./result.ts";
import {
  formatEstimate,
  formatIntervalAt,
  formatNumber,
  formatUncertainty,
  withUnit,
} from "../shared/format.ts";

/**
 * The uncertainty that sets an estimate's digits: its standard error when
 * on the estimate's scale, else a quarter of its interval's width (an
 * interval of ±2 standard uncertainties; our rule, in the spirit of GUM §7.2.6).
 */
export function digitsFrom(
  se: number | null,
  interval: [number, number] | null,
  sameScale: boolean,
): number | null {
  return sameScale && se !== null && se > 0 ? se : quarterWidth(interval);
}

/** A quarter of an interval's width, or null when it has none. */
export function quarterWidth(ci: readonly [number | null, number | null] | null): number | null {
  if (ci === null || ci[0] === null || ci[1] === null) return null;
  const w = (ci[1] - ci[0]) / 4;
  return Number.isFinite(w) && w > 0 ? w : null;
}

/** An inverse prediction has no standard error of its own (Fieller's interval or the band's). */
export function solveUncertainty(s: PredictSolveResult): number | null {
  return quarterWidth(s.ci);
}

/** How each method is named (CLI and page). */
export const METHOD_WORDS: Record<LabelledInterval["method"], string> = {
  wald: "Wald",
  profile: "profile",
  "bootstrap-percentile": "bootstrap percentile",
  "bootstrap-bca": "bootstrap BCa",
};

/** Most points the CLI summary details one line each; the rest are counted. */
export const DETAIL_POINTS = 10;

/**
 * Whether a point carries an interval beyond Wald (then it is detailed).
 *
 * @param p A point.
 * @returns True when its `intervals` or `pi_intervals` name another method.
 */
export function beyondWald(p: PredictPointResult): boolean {
  return [...(p.intervals ?? []), ...(p.pi_intervals ?? [])].some((i) => i.method !== "wald");
}

/**
 * One end at the digits of `u`; "open" for a side that is not bounded.
 *
 * @param v The end, or null.
 * @param u The uncertainty that sets the digits (null: six significant digits).
 * @param estimate The estimate (the digits' place).
 * @returns The text.
 */
export function end(v: number | null, u: number | null, estimate: number | null): string {
  if (v === null) return "open";
  return formatIntervalAt([v, v], u, estimate ?? v, { open: "", sep: "|", close: "" }).split(
    "|",
  )[0];
}

/**
 * Intervals named by method, `Wald a … b; profile c … d`, with `*` after a limit's
 * text when the interval has a note (said in full in RUN-JSON and on the page).
 *
 * @param list The labelled intervals.
 * @param u The uncertainty that sets the digits.
 * @param estimate The estimate.
 * @returns The text, or "—" for none.
 * @example
 * ```ts
 * import { labelledText } from "./_digits.ts";
 * const t = labelledText([
 *   { method: "wald", level: 0.95, lower: 1.234, upper: 2.345 },
 *   { method: "profile", level: 0.95, lower: 1.3, upper: null, note: "does not close above" },
 * ], 0.1, 1.8);
 * if (t !== "Wald 1.23 … 2.35; profile 1.30 … open*") throw new Error(t);
 * ```
 */
export function labelledText(
  list: readonly LabelledInterval[],
  u: number | null,
  estimate: number | null,
): string {
  if (list.length === 0) return "—";
  return list.map((i) =>
    `${METHOD_WORDS[i.method]} ${end(i.lower, u, estimate)} … ${end(i.upper, u, estimate)}${
      i.note ? "*" : ""
    }`
  ).join("; ");
}

/**
 * The CLI summary's lines below the predict line: one per point that carries
 * intervals beyond Wald (the first {@link DETAIL_POINTS}), each interval named.
 *
 * @param r The result.
 * @returns The lines (none when every interval is Wald's).
 * @example
 * ```ts
 * import { predictDetails } from "./_digits.ts";
 * const lines = predictDetails({ fit: "mm", level: 0.95, response: "y", scale: "s", se_scale: "s",
 *   distribution: "t(10)", new_observation: "", weight_source: "", covariance: "", robust: null,
 *   mean_method: "", solve: [], at: [{ x: { x: 2 }, estimate: 5, se_fit: 0.1, ci: [4.8, 5.2],
 *   pi: [4, 6], se_prediction: 0.4, extrapolated: false, unit: null,
 *   intervals: [{ method: "wald", level: 0.95, lower: 4.8, upper: 5.2 },
 *     { method: "profile", level: 0.95, lower: 4.75, upper: 5.3 }],
 *   pi_intervals: [{ method: "wald", level: 0.95, lower: 4, upper: 6 }] }] });
 * if (!lines[0].includes("profile 4.75 … 5.30")) throw new Error(lines[0]);
 * ```
 */
export function predictDetails(r: PredictResult): string[] {
  const level = `${formatNumber(100 * r.level, 4)}%`;
  const same = r.se_scale === r.scale;
  const shown = r.at.filter(beyondWald);
  const lines = shown.slice(0, DETAIL_POINTS).map((p) => {
    const x = Object.entries(p.x).map(([k, v]) => `${k} = ${formatNumber(v, 6)}`).join(", ");
    const um = digitsFrom(p.se_fit, p.ci, same);
    const up = digitsFrom(p.se_prediction, p.pi, same);
    const u = same && p.se_fit !== null ? `, u ${formatUncertainty(p.se_fit)}` : "";
    const est = withUnit(`${formatEstimate(p.estimate, um)}${u}`, p.unit);
    return `${x}: ${est} · ${level} mean ${
      labelledText(p.intervals ?? [], um, p.estimate)
    } · new observation ${labelledText(p.pi_intervals ?? [], up, p.estimate)}`;
  });
  if (shown.length > DETAIL_POINTS) {
    lines.push(`(+${shown.length - DETAIL_POINTS} more points with intervals beyond Wald)`);
  }
  if (shown.some((p) => [...(p.intervals ?? []), ...(p.pi_intervals ?? [])].some((i) => i.note))) {
    lines.push("* see the note of that interval (RUN-JSON, page)");
  }
  return lines;
}
