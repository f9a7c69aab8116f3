/**
 * A drift chart: one estimate of a cell (a fit parameter, a prediction) over
 * the recorded revisions of the run history, drawn with Observable Plot in
 * Plumb's chart look (`_style.ts`). Each revision is a ring at its estimate
 * on a bar spanning its interval, the newest filled; a thin line joins them
 * in order; the interval of the older revision the report compares is a
 * faint strip across the chart, so an estimate that left it shows at once.
 *
 * ```
 *    10.8 ┤                     ┃
 *         │                 ┄┄┄●          ● newest, ○ earlier, ┃ interval
 *    10.2 ┤        ○┄┄┄┄┄┄┄┄    ┃
 *         │▒▒▒▒▒▒▒▒┃▒▒▒▒▒▒▒▒▒▒▒▒▒▒▒▒▒      ▒ the compared revision's interval
 *     9.8 ┤        ┃
 *         └──────────────────────────
 *          119                159   rows used
 * ```
 *
 * The x axis ({@link driftAxis}) is the record time while the revisions are
 * spread out in time; when two of them are too close to tell apart on it
 * (runs minutes apart in a history of weeks, or seconds apart in a test), the
 * rows used, when every revision has a distinct count; otherwise the
 * revision's number. Pure function of its input: the live page draws it with
 * the browser's document, the static record with linkedom's.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import type { Trend } from "../../kernel/history/types.ts";
import { INK } from "../../cells/shared/palette.ts";
import { stackPanels } from "./_svg.ts";
import { axisX, axisY, PLOT_BASE, rings } from "./_style.ts";

/** Size of one drift chart, px (small enough for two side by side at a half screen). */
export const DRIFT_SIZE = { width: 260, height: 150 } as const;

/** What a drift chart's x axis shows. */
export type DriftAxis = "time" | "rows" | "revision";

/** Shortest gap between neighbouring records, as a share of the whole span, to draw against time. */
const LEAST_SHARE = 1 / 25;
/** Shortest whole span, ms, to draw against time (below it, times read as noise). */
const LEAST_SPAN_MS = 60_000;

/**
 * Which x axis a series is drawn against: time when every two neighbouring
 * records are at least 1/25 of the span apart (10 px on a 260 px chart) and
 * the span is a minute or more; else the rows used when every point has a
 * distinct count; else the revision's number.
 *
 * @param points The series' points, oldest first.
 * @returns The axis.
 * @example
 * ```ts
 * import { driftAxis } from "./drift_chart.ts";
 * const p = (time: string, n: number | null) => ({ record: time, time, n, value: 1, lower: null, upper: null });
 * const days = [p("2026-11-01T08:00:00Z", 10), p("2026-11-08T08:00:00Z", 14)];
 * if (driftAxis(days) !== "time") throw new Error("a week apart");
 * const seconds = [p("2026-11-01T08:00:00Z", 10), p("2026-11-01T08:00:04Z", 14)];
 * if (driftAxis(seconds) !== "rows") throw new Error("seconds apart");
 * ```
 */
export function driftAxis(points: Trend["points"]): DriftAxis {
  const ms = points.map((p) => Date.parse(p.time));
  const span = ms[ms.length - 1] - ms[0];
  const spread = ms.every(Number.isFinite) && span >= LEAST_SPAN_MS &&
    ms.slice(1).every((t, i) => t - ms[i] >= span * LEAST_SHARE);
  if (spread) return "time";
  const n = points.map((p) => p.n);
  if (n.every((v) => v !== null) && new Set(n).size === n.length) return "rows";
  return "revision";
}

/** How one drift chart is drawn. */
export interface DriftOptions {
  /** The colour of the series (a fit's own colour; default the neutral ink). */
  color?: string;
  /** The record the report compares against: its interval is drawn as a strip. */
  baseline?: string | null;
  /** The accessible name of the chart. */
  label?: string;
}

const X_LABEL: Record<DriftAxis, string> = {
  time: "record time (UTC)",
  rows: "rows used",
  revision: "revision",
};

const MONTHS = "Jan Feb Mar Apr May Jun Jul Aug Sep Oct Nov Dec".split(" ");

/**
 * How a time tick reads, one short line: the hour within a day, the day
 * within a year, else the month and year (UTC).
 */
function timeTick(first: Date, last: Date): (d: Date) => string {
  const span = last.getTime() - first.getTime();
  if (span < 86_400_000) return (d) => d.toISOString().slice(11, 16);
  if (span < 300 * 86_400_000) return (d) => `${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]}`;
  return (d) => `${MONTHS[d.getUTCMonth()]} ${d.getUTCFullYear()}`;
}

/**
 * Draws one series' drift chart.
 *
 * @param trend The series (two points or more make a line; one point draws alone).
 * @param options Colour, the compared record, accessible name.
 * @param document The DOM document to build with (the browser's, or linkedom's).
 * @returns The `<svg>` element (not attached).
 * @example
 * ```ts
 * import { renderDriftChart } from "./drift_chart.ts";
 * import { chartDocument } from "./svg_document.ts";
 * const pt = (record: string, n: number, value: number) =>
 *   ({ record, time: "2026-11-01T08:00:00Z", n, value, lower: value - 1, upper: value + 1 });
 * const svg = renderDriftChart(
 *   { cell: "f", series: "k", unit: null, points: [pt("r1", 10, 5), pt("r2", 14, 8)] },
 *   { baseline: "r1" },
 *   chartDocument(),
 * );
 * if (!svg.outerHTML.includes("rows used")) throw new Error(svg.outerHTML);
 * ```
 */
export function renderDriftChart(
  trend: Trend,
  options: DriftOptions,
  document: Document,
): SVGSVGElement {
  const color = options.color ?? INK;
  const axis = driftAxis(trend.points);
  const pts = trend.points.map((p, i) => ({
    ...p,
    x: axis === "time" ? new Date(p.time) : axis === "rows" ? p.n! : i + 1,
  }));
  const last = pts[pts.length - 1];
  const earlier = pts.slice(0, -1);
  const base = pts.find((p) =>
    p.record === options.baseline && p.lower !== null && p.upper !== null
  );
  const marks: Plot.Markish[] = [];
  if (base) {
    marks.push(Plot.rect([base], {
      y1: "lower",
      y2: "upper",
      fill: color,
      fillOpacity: 0.1,
      ariaDescription: "interval of the revision compared",
    }));
  }
  marks.push(
    Plot.line(pts, { x: "x", y: "value", stroke: color, strokeWidth: 1, strokeOpacity: 0.45 }),
    Plot.ruleX(pts.filter((p) => p.lower !== null && p.upper !== null), {
      x: "x",
      y1: "lower",
      y2: "upper",
      stroke: color,
      strokeWidth: 1.5,
      ariaDescription: "interval",
    }),
    // rings() is typed for numbers; Plot takes the dates of a time axis the same way.
    rings(earlier.map((p) => p.x) as number[], earlier.map((p) => p.value), "earlier", color),
    Plot.dot([last], { x: "x", y: "value", r: 2.8, fill: color, ariaDescription: "newest" }),
  );
  const xOptions: Record<string, unknown> = axis === "time"
    // The first and the newest record's time: ends a reader can name; the dots show the rest.
    ? {
      type: "utc",
      ticks: [pts[0].x, last.x],
      tickFormat: timeTick(pts[0].x as Date, last.x as Date),
    }
    : {
      type: "linear",
      // A few revisions: a tick at each (its rows or its number); more: three round ones.
      ticks: pts.length <= 4 ? pts.map((p) => p.x as number) : 3,
      tickFormat: axis === "revision" ? "d" : ",d",
    };
  const panel = Plot.plot({
    document,
    ...PLOT_BASE,
    width: DRIFT_SIZE.width,
    height: DRIFT_SIZE.height,
    marginLeft: 50,
    marginRight: 14,
    marginTop: 10,
    marginBottom: 34,
    x: axisX(X_LABEL[axis], { ...xOptions, inset: 10, labelOffset: 30 }),
    y: axisY("", { ticks: 3, nice: true, label: null }),
    marks,
  });
  return stackPanels(document, [panel], DRIFT_SIZE.width, {
    label: options.label ?? `${trend.cell} ${trend.series} over ${pts.length} revisions`,
  });
}
