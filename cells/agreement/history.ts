/**
 * The agreement cell's face in the run history: the two regressions' slopes
 * and intercepts and the bias with their intervals, and the verdict; what
 * changed between two records (a verdict on a constant or proportional
 * difference that turned first, then a slope or bias that left its earlier
 * interval); the slope and bias drawn over the revisions.
 *
 * Records of older versions may lack fields: a comparison that needs a
 * missing field is skipped, never made against zero.
 *
 * @module
 */
import type { Change, ChangeContext, HistoryFace, TrendSample } from "../../kernel/contract/mod.ts";
import type { AgreementSpec } from "./spec.ts";
import type { Agreement } from "./agreement.ts";
import type { AgreementResult, Estimated } from "./result.ts";
import { formatNumber } from "../shared/format.ts";

/** One kept estimate. */
interface KeptEstimate {
  name: string;
  unit: string | null;
  estimate: number;
  lower: number | null;
  upper: number | null;
}

/** What a record keeps of an agreement cell. */
export interface AgreementKept {
  n: number;
  level: number;
  estimates: KeptEstimate[];
  constant: boolean | null;
  proportional: boolean | null;
}

const kept = (name: string, unit: string | null, e: Estimated): KeptEstimate => ({
  name,
  unit,
  estimate: e.estimate,
  lower: e.intervals[0]?.lower ?? null,
  upper: e.intervals[0]?.upper ?? null,
});

/** A difference counts as found when both regressions find it. */
const both = (v: { deming: boolean; passing_bablok: boolean | null }) =>
  v.passing_bablok === null ? v.deming : v.deming && v.passing_bablok;

function keep(_out: Agreement, _spec: AgreementSpec, r: AgreementResult): AgreementKept {
  return {
    n: r.n,
    level: r.confidence,
    estimates: [
      kept("Deming slope", null, r.deming.slope),
      kept("Deming intercept", r.unit, r.deming.intercept),
      kept("Passing–Bablok slope", null, r.passing_bablok.slope),
      kept("Passing–Bablok intercept", r.unit, r.passing_bablok.intercept),
      kept("bias", r.agreement.unit, r.agreement.bias),
    ],
    constant: both(r.verdict.constant),
    proportional: both(r.verdict.proportional),
  };
}

const num = (x: unknown): x is number => typeof x === "number" && Number.isFinite(x);

function changes(a: AgreementKept, b: AgreementKept, ctx: ChangeContext): Change[] {
  const out: Change[] = [];
  for (const what of ["constant", "proportional"] as const) {
    const before = a?.[what], after = b?.[what];
    if (typeof before !== "boolean" || typeof after !== "boolean" || before === after) continue;
    out.push({
      code: "difference-turned",
      weight: "notable",
      sentence: `Agreement "${ctx.cell}": ${
        after ? `a ${what} difference now shows` : `the ${what} difference no longer shows`
      } (both regressions' intervals, at the ${formatNumber(100 * ctx.level, 4)}% level)`,
      numbers: { difference: what, before, after },
    });
  }
  const old = new Map((Array.isArray(a?.estimates) ? a.estimates : []).map((e) => [e.name, e]));
  for (const e of Array.isArray(b?.estimates) ? b.estimates : []) {
    const q = old.get(e.name);
    if (q === undefined || !num(q.lower) || !num(q.upper) || !num(e.estimate)) continue;
    if (e.estimate >= q.lower && e.estimate <= q.upper) continue;
    out.push({
      code: "estimate-moved",
      weight: "notable",
      sentence: `Agreement "${ctx.cell}": the ${e.name} moved to ${formatNumber(e.estimate, 5)}${
        e.unit ? ` ${e.unit}` : ""
      }, outside its earlier interval ${formatNumber(q.lower, 5)} … ${formatNumber(q.upper, 5)}`,
      numbers: {
        name: e.name,
        before: q.estimate,
        after: e.estimate,
        before_ci: [q.lower, q.upper],
        after_ci: [e.lower, e.upper],
        unit: e.unit ?? null,
      },
    });
  }
  return out;
}

function trend(k: AgreementKept): TrendSample[] {
  if (!Array.isArray(k?.estimates)) return [];
  return k.estimates.filter((e) => num(e.estimate)).map((e) => ({
    series: e.name,
    unit: e.unit ?? null,
    value: e.estimate,
    lower: num(e.lower) ? e.lower : null,
    upper: num(e.upper) ? e.upper : null,
    n: num(k.n) ? k.n : null,
  }));
}

/** The `agreement` kind's history face. */
export const agreementHistory: HistoryFace<
  AgreementSpec,
  Agreement,
  AgreementResult,
  AgreementKept
> = { keep, changes, trend };
