/**
 * The prediction's face in the run history: each point's estimate with its
 * intervals, each solve's x with its interval; what changed between two
 * records. A prediction that left its earlier confidence interval is notable;
 * one whose interval moved by more than a tenth of its width is worth a
 * minor sentence (our threshold: smaller moves are rounding of little
 * consequence; common practice, no source).
 *
 * @module
 */
import type { Change, ChangeContext, HistoryFace, TrendSample } from "../../kernel/contract/mod.ts";
import type { PredictSpec } from "./spec.ts";
import type { Predictions, PredictResult } from "./result.ts";
import { formatNumber, withUnit } from "../shared/format.ts";

/** What a record keeps of one point or solve. */
export interface PointKept {
  /** The point, in words: `cycle = 700` or `capacity = 2300`. */
  at: string;
  value: number | null;
  ci: [number, number] | null;
  pi: [number, number] | null;
  unit: string | null;
}

/** What a record keeps of a prediction. */
export interface PredictKept {
  fit: string;
  level: number;
  at: PointKept[];
  solve: PointKept[];
}

const place = (x: Record<string, number>) =>
  Object.entries(x).map(([k, v]) => `${k} = ${formatNumber(v, 6)}`).join(", ");

function keep(_out: Predictions, _spec: PredictSpec, r: PredictResult): PredictKept {
  return {
    fit: r.fit,
    level: r.level,
    at: r.at.map((p) => ({ at: place(p.x), value: p.estimate, ci: p.ci, pi: p.pi, unit: p.unit })),
    solve: r.solve.map((s) => {
      const [name] = Object.keys(s.x);
      return {
        at: place(s.y),
        value: name === undefined ? null : s.x[name],
        ci: s.ci,
        pi: null,
        unit: s.unit,
      };
    }),
  };
}

const num = (x: unknown): x is number => typeof x === "number" && Number.isFinite(x);
const iv = (ci: [number, number] | null, unit: string | null) =>
  ci ? withUnit(`[${formatNumber(ci[0], 5)}, ${formatNumber(ci[1], 5)}]`, unit) : "no interval";

function compare(
  cell: string,
  what: "prediction" | "solve",
  a: PointKept[],
  b: PointKept[],
): Change[] {
  const out: Change[] = [];
  const before = new Map(a.map((p) => [p.at, p]));
  for (const p of b) {
    const was = before.get(p.at);
    if (!was || !num(was.value) || !num(p.value)) continue;
    const outside = was.ci !== null && (p.value < was.ci[0] || p.value > was.ci[1]);
    const width = was.ci ? was.ci[1] - was.ci[0] : null;
    const shift = was.ci && p.ci
      ? Math.max(Math.abs(p.ci[0] - was.ci[0]), Math.abs(p.ci[1] - was.ci[1]))
      : null;
    const moved = width !== null && shift !== null && width > 0 && shift > width / 10;
    if (!outside && !moved) continue;
    const label = what === "prediction" ? `the prediction at ${p.at}` : `the solution for ${p.at}`;
    out.push({
      code: what === "prediction" ? "prediction-moved" : "solve-moved",
      weight: outside ? "notable" : "minor",
      sentence: `${cell}: ${label} is ${formatNumber(p.value, 6)} ${iv(p.ci, p.unit)} (was ${
        formatNumber(was.value, 6)
      } ${iv(was.ci, was.unit)})${outside ? ", outside its earlier interval" : ""}.`,
      numbers: {
        at: p.at,
        before: was.value,
        after: p.value,
        before_ci: was.ci,
        after_ci: p.ci,
        outside_previous_interval: outside,
        unit: p.unit,
      },
    });
  }
  const added = b.filter((p) => !before.has(p.at)).map((p) => p.at);
  const gone = a.filter((p) => !b.some((q) => q.at === p.at)).map((p) => p.at);
  if (added.length + gone.length > 0) {
    out.push({
      code: what === "prediction" ? "points-changed" : "solves-changed",
      weight: "minor",
      sentence: `${cell}: ${
        added.length ? `new ${what === "prediction" ? "points" : "solves"} ${added.join("; ")}` : ""
      }${added.length && gone.length ? "; " : ""}${
        gone.length ? `no longer ${gone.join("; ")}` : ""
      }.`,
      numbers: { added, removed: gone },
    });
  }
  return out;
}

function changes(a: PredictKept, b: PredictKept, ctx: ChangeContext): Change[] {
  if (!Array.isArray(a?.at) || !Array.isArray(b?.at)) return [];
  if (a.fit !== b.fit) {
    return [{
      code: "fit-changed",
      weight: "notable",
      sentence: `${ctx.cell} now predicts from ${b.fit} (was ${a.fit}).`,
      numbers: { before: a.fit, after: b.fit },
    }];
  }
  return [
    ...compare(ctx.cell, "prediction", a.at, b.at),
    ...compare(ctx.cell, "solve", a.solve ?? [], b.solve ?? []),
  ];
}

function trend(k: PredictKept): TrendSample[] {
  if (!Array.isArray(k?.at)) return [];
  return [...k.at, ...(k.solve ?? [])].filter((p) => num(p.value)).map((p) => ({
    series: p.at,
    unit: p.unit,
    value: p.value as number,
    lower: p.ci ? p.ci[0] : null,
    upper: p.ci ? p.ci[1] : null,
    n: null,
  }));
}

/** The prediction's history face. */
export const predictHistory: HistoryFace<PredictSpec, Predictions, PredictResult, PredictKept> = {
  keep,
  changes,
  trend,
};
