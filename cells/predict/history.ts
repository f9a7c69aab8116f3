/**
 * The prediction's face in the run history: each point's estimate with its
 * intervals, each solve's x with its interval; what changed between two
 * records, and each estimate as a drift series.
 *
 * A prediction whose new estimate lies outside its earlier confidence
 * interval is notable. One that stayed inside, but whose interval moved (an
 * end by more than a tenth of the earlier interval's width), is worth a
 * minor sentence: our threshold, common practice, no source; smaller moves
 * are of little consequence at the digits an interval is quoted to. Intervals
 * at two different levels are not compared that way. Numbers in sentences
 * are rounded to their uncertainty (a quarter of the interval's width, as the
 * predict view rounds a solve).
 *
 * Records of older versions may lack fields: a comparison that needs a
 * missing field is skipped, never made against zero.
 *
 * @module
 */
import type { Change, ChangeContext, HistoryFace, TrendSample } from "../../kernel/contract/mod.ts";
import type { PredictSpec } from "./spec.ts";
import type { Predictions, PredictResult } from "./result.ts";
import { formatEstimate, formatIntervalAt, formatNumber, withUnit } from "../shared/format.ts";
import { quarterWidth } from "./_digits.ts";

/** What a record keeps of one point of `at`. */
export interface PointKept {
  /** The point in words, which also identifies it: `cycle = 700`. */
  at: string;
  /** The predictor values. */
  x: Record<string, number>;
  /** The estimate of the mean response. */
  value: number | null;
  ci: [number, number] | null;
  pi: [number, number] | null;
  unit: string | null;
}

/** What a record keeps of one `solve`. */
export interface SolveKept {
  /** The response value in words, which also identifies it: `capacity = 2300`. */
  at: string;
  y: Record<string, number>;
  x: Record<string, number>;
  /** The x solved for (the only value of `x`). */
  value: number | null;
  ci: [number, number] | null;
  /** The unit of x. */
  unit: string | null;
}

/** What a record keeps of a prediction. */
export interface PredictKept {
  fit: string;
  level: number;
  at: PointKept[];
  solve: SolveKept[];
}

/** Values in words at full precision (they are the values written in the cell). */
const place = (x: Record<string, number>) =>
  Object.entries(x).map(([k, v]) => `${k} = ${v}`).join(", ");

function keep(_out: Predictions, _spec: PredictSpec, r: PredictResult): PredictKept {
  return {
    fit: r.fit,
    level: r.level,
    at: r.at.map((p) => ({
      at: place(p.x),
      x: p.x,
      value: p.estimate,
      ci: p.ci,
      pi: p.pi,
      unit: p.unit,
    })),
    solve: r.solve.map((s) => ({
      at: place(s.y),
      y: s.y,
      x: s.x,
      value: Object.values(s.x)[0] ?? null,
      ci: s.ci,
      unit: s.unit,
    })),
  };
}

/**
 * The relative move of an interval worth a minor sentence: an end moved by
 * more than this fraction of the earlier interval's width (our threshold,
 * common practice, no source).
 */
export const INTERVAL_MOVE = 0.1;

type Kept = Partial<PointKept> | Partial<SolveKept>;

const num = (x: unknown): x is number => typeof x === "number" && Number.isFinite(x);
const isInterval = (x: unknown): x is [number, number] =>
  Array.isArray(x) && x.length === 2 && num(x[0]) && num(x[1]);
const str = (x: unknown): x is string => typeof x === "string";

/** An estimate and its interval, rounded to the interval's quarter width: `2241.3 [2239.7, 2242.9] mAh`. */
function shown(p: Kept): string {
  const ci = isInterval(p.ci) ? p.ci : null;
  const u = quarterWidth(ci);
  const interval = ci ? ` ${formatIntervalAt(ci, u, p.value as number)}` : "";
  return withUnit(`${formatEstimate(p.value as number, u)}${interval}`, p.unit);
}

/** What a sentence calls a point or a solve. */
function label(what: "prediction" | "solve", p: Kept): string {
  if (what === "prediction") return `the prediction at ${p.at}`;
  const x = (p as Partial<SolveKept>).x;
  const name = x && typeof x === "object" ? Object.keys(x)[0] : undefined;
  return name ? `the ${name} that gives ${p.at}` : `the solution for ${p.at}`;
}

function moved(
  cell: string,
  what: "prediction" | "solve",
  was: Kept,
  p: Kept,
  sameLevel: boolean,
): Change | null {
  if (!num(was.value) || !num(p.value)) return null;
  const before = isInterval(was.ci) ? was.ci : null, after = isInterval(p.ci) ? p.ci : null;
  const outside = before !== null && (p.value < before[0] || p.value > before[1]);
  const width = before ? before[1] - before[0] : 0;
  const shift = before && after
    ? Math.max(Math.abs(after[0] - before[0]), Math.abs(after[1] - before[1]))
    : 0;
  const drifted = sameLevel && width > 0 && shift > INTERVAL_MOVE * width;
  if (!outside && !drifted) return null;
  return {
    code: what === "prediction" ? "prediction-moved" : "solve-moved",
    weight: outside ? "notable" : "minor",
    sentence: `${cell}: ${label(what, p)} is ${shown(p)} (was ${shown(was)})${
      outside
        ? ", outside its earlier interval"
        : `, inside its earlier interval; an end of the interval moved by ${
          formatNumber(100 * shift / width, 2)
        } % of its earlier width`
    }.`,
    numbers: {
      at: p.at,
      before: was.value,
      after: p.value,
      before_ci: before,
      after_ci: after,
      outside_previous_interval: outside,
      interval_shift: before && after ? shift / width : null,
      unit: str(p.unit) ? p.unit : null,
    },
  };
}

function compare(
  cell: string,
  what: "prediction" | "solve",
  a: Kept[],
  b: Kept[],
  sameLevel: boolean,
): Change[] {
  const listed = (list: Kept[]) => list.filter((p) => str(p?.at));
  const before = new Map(listed(a).map((p) => [p.at, p]));
  const after = new Map(listed(b).map((p) => [p.at, p]));
  const out: Change[] = [];
  for (const [at, p] of after) {
    const was = before.get(at);
    const c = was && moved(cell, what, was, p, sameLevel);
    if (c) out.push(c);
  }
  const added = [...after.keys()].filter((at) => !before.has(at));
  const removed = [...before.keys()].filter((at) => !after.has(at));
  if (added.length + removed.length > 0) {
    const many = what === "prediction" ? "points" : "solves";
    const parts = [
      ...(added.length ? [`new ${many} ${added.join("; ")}`] : []),
      ...(removed.length ? [`no longer ${removed.join("; ")}`] : []),
    ];
    out.push({
      code: `${many}-changed`,
      weight: "minor",
      sentence: `${cell}: ${parts.join("; ")}.`,
      numbers: { added, removed },
    });
  }
  return out;
}

function changes(a: PredictKept, b: PredictKept, ctx: ChangeContext): Change[] {
  if (!Array.isArray(a?.at) || !Array.isArray(b?.at)) return [];
  if (str(a.fit) && str(b.fit) && a.fit !== b.fit) {
    return [{
      code: "fit-changed",
      weight: "notable",
      sentence:
        `${ctx.cell} now predicts from ${b.fit} (was ${a.fit}); its values are not compared.`,
      numbers: { before: a.fit, after: b.fit },
    }];
  }
  const sameLevel = num(a.level) && a.level === b.level;
  return [
    ...compare(ctx.cell, "prediction", a.at, b.at, sameLevel),
    ...(Array.isArray(a.solve) && Array.isArray(b.solve)
      ? compare(ctx.cell, "solve", a.solve, b.solve, sameLevel)
      : []),
  ];
}

/** Each point's estimate and each solved x, with its confidence interval. */
function trend(k: PredictKept): TrendSample[] {
  if (!Array.isArray(k?.at)) return [];
  const sample = (series: string, p: Kept): TrendSample => ({
    series,
    unit: str(p.unit) ? p.unit : null,
    value: p.value as number,
    lower: isInterval(p.ci) ? p.ci[0] : null,
    upper: isInterval(p.ci) ? p.ci[1] : null,
    n: null,
  });
  const ok = (p: Kept) => str(p?.at) && num(p.value);
  return [
    ...k.at.filter(ok).map((p) => sample(p.at, p)),
    ...(Array.isArray(k.solve) ? k.solve : []).filter(ok).map((s) =>
      sample(label("solve", s).replace(/^the /, ""), s)
    ),
  ];
}

/**
 * The prediction's history face.
 *
 * @example
 * ```ts
 * import { predictHistory } from "./history.ts";
 * const kept = (value: number, ci: [number, number]) => ({
 *   fit: "root", level: 0.95, solve: [],
 *   at: [{ at: "cycle = 700", x: { cycle: 700 }, value, ci, pi: null, unit: "mAh" }],
 * });
 * const [c] = predictHistory.changes(kept(2250, [2248, 2252]), kept(2241, [2239, 2243]), {
 *   cell: "p", level: 0.95, rows: null,
 * });
 * if (c.code !== "prediction-moved" || c.weight !== "notable") throw new Error(c.sentence);
 * ```
 */
export const predictHistory: HistoryFace<PredictSpec, Predictions, PredictResult, PredictKept> = {
  keep,
  changes,
  trend,
};
