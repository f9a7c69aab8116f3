/**
 * The joint fit's face in the run history: the estimates with their Wald
 * intervals and each sharing test's p-value and verdict; what changed between
 * two records (a sharing verdict that turned first, then an estimate that
 * left its earlier interval); the estimates drawn over the revisions.
 *
 * Records of older versions may lack fields: a comparison that needs a
 * missing field is skipped, never made against zero.
 *
 * @module
 */
import type { Change, ChangeContext, HistoryFace, TrendSample } from "../../kernel/contract/mod.ts";
import type { JointSpec } from "./spec.ts";
import type { JointFit } from "./joint.ts";
import type { JointResult } from "./result.ts";
import { formatNumber, formatPPhrase } from "../shared/format.ts";

/** What a record keeps of a joint fit. */
export interface JointKept {
  n: number;
  level: number;
  parameters: {
    name: string;
    unit: string | null;
    estimate: number;
    lower: number | null;
    upper: number | null;
  }[];
  sharing: { parameters: string[]; p_value: number | null; shareable: boolean | null }[];
}

function keep(_out: JointFit, _spec: JointSpec, r: JointResult): JointKept {
  return {
    n: r.n,
    level: r.confidence,
    parameters: r.parameters.map((p) => ({
      name: p.name,
      unit: p.unit,
      estimate: p.estimate,
      lower: p.ci?.[0] ?? null,
      upper: p.ci?.[1] ?? null,
    })),
    sharing: r.sharing.map((s) => ({
      parameters: s.parameters,
      p_value: s.p_value,
      shareable: s.shareable,
    })),
  };
}

const num = (x: unknown): x is number => typeof x === "number" && Number.isFinite(x);

function changes(a: JointKept, b: JointKept, ctx: ChangeContext): Change[] {
  const out: Change[] = [];
  const before = new Map(
    (Array.isArray(a?.sharing) ? a.sharing : []).map((s) => [s.parameters?.join(","), s]),
  );
  for (const s of Array.isArray(b?.sharing) ? b.sharing : []) {
    const old = before.get(s.parameters?.join(","));
    if (
      old === undefined || typeof old.shareable !== "boolean" || typeof s.shareable !== "boolean"
    ) continue;
    if (old.shareable === s.shareable) continue;
    const what = s.parameters.map((k) => `"${k}"`).join(", ");
    out.push({
      code: "sharing-turned",
      weight: "notable",
      sentence: `Joint fit "${ctx.cell}": sharing ${what} ${
        s.shareable ? "now holds" : "is now rejected"
      } (${num(old.p_value) ? formatPPhrase(old.p_value) : "p unknown"} before, ${
        num(s.p_value) ? formatPPhrase(s.p_value) : "p unknown"
      } now)`,
      numbers: { parameters: s.parameters, p_before: old.p_value, p_after: s.p_value },
    });
  }
  const old = new Map((Array.isArray(a?.parameters) ? a.parameters : []).map((p) => [p.name, p]));
  for (const p of Array.isArray(b?.parameters) ? b.parameters : []) {
    const q = old.get(p.name);
    if (q === undefined || !num(q.lower) || !num(q.upper) || !num(p.estimate)) continue;
    if (p.estimate >= q.lower && p.estimate <= q.upper) continue;
    out.push({
      code: "parameter-moved",
      weight: "notable",
      sentence: `Joint fit "${ctx.cell}": ${p.name} moved to ${formatNumber(p.estimate, 5)}${
        p.unit ? ` ${p.unit}` : ""
      }, outside its earlier interval ${formatNumber(q.lower, 5)} … ${formatNumber(q.upper, 5)}`,
      numbers: {
        name: p.name,
        before: q.estimate,
        after: p.estimate,
        before_ci: [q.lower, q.upper],
        after_ci: [p.lower, p.upper],
        unit: p.unit ?? null,
      },
    });
  }
  return out;
}

function trend(k: JointKept): TrendSample[] {
  if (!Array.isArray(k?.parameters)) return [];
  return k.parameters.filter((p) => num(p.estimate)).map((p) => ({
    series: p.name,
    unit: p.unit ?? null,
    value: p.estimate,
    lower: num(p.lower) ? p.lower : null,
    upper: num(p.upper) ? p.upper : null,
    n: num(k.n) ? k.n : null,
  }));
}

/** The `joint` kind's history face. */
export const jointHistory: HistoryFace<JointSpec, JointFit, JointResult, JointKept> = {
  keep,
  changes,
  trend,
};
