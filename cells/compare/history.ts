/**
 * The comparison's face in the run history: the preferred model, each
 * candidate's criterion, Δ and weight, the nested tests; what changed
 * between two records (a change of preferred model first).
 *
 * Δ in a kept row is taken the way the comparison reports it: a candidate's
 * criterion minus the best one's, so the preferred model has Δ = 0. A
 * sentence about a change of preferred model states the new preferred
 * model's criterion minus the old one's, in both records: lower is better
 * for every criterion `by` accepts (AIC, AICc, BIC, leave-one-out RMSE), so
 * it is negative now and was positive (or zero) before.
 *
 * Records of older versions may lack fields: a comparison that needs a
 * missing field is skipped, never made against zero.
 *
 * @module
 */
import type { Change, ChangeContext, HistoryFace } from "../../kernel/contract/mod.ts";
import type { CompareSpec } from "./spec.ts";
import type { CompareResult, Comparison } from "./result.ts";
import { LABELS } from "./verdict.ts";
import { formatNumber, formatP } from "../shared/format.ts";

/** What a record keeps of one candidate. */
export interface CandidateKept {
  fit: string;
  n: number;
  k: number;
  /** The criterion `by` of this fit (leave-one-out RMSE for `loo`); null where it does not exist. */
  value: number | null;
  delta: number | null;
  weight: number | null;
}

/** What a record keeps of a comparison. */
export interface CompareKept {
  /** The criterion's key: aic, aicc, bic or loo. */
  by: string;
  /** Its name as printed: AIC, AICc, BIC, leave-one-out RMSE. */
  criterion: string;
  preferred: string | null;
  rows: CandidateKept[];
  nested: { smaller: string; larger: string; p_value: number | null }[];
  /** The level the verdict reads the nested F tests at. */
  significance: number;
  verdict: string;
}

function keep(_out: Comparison, _spec: CompareSpec, r: CompareResult): CompareKept {
  const key = r.by === "loo" ? "loo_rmse" : r.by;
  return {
    by: r.by,
    criterion: r.criterion,
    preferred: r.preferred,
    rows: r.rows.map((row) => ({
      fit: row.fit,
      n: row.n,
      k: row.k,
      value: row[key],
      delta: row.delta,
      weight: row.weight,
    })),
    nested: r.nested_tests.map((t) => ({
      smaller: t.smaller,
      larger: t.larger,
      p_value: t.p_value,
    })),
    significance: r.significance,
    verdict: r.verdict,
  };
}

/**
 * A change of Δ larger than 2 is worth a sentence: 2 is the first step of
 * the information criteria's evidence scales (Burnham & Anderson 2002,
 * §2.6; Kass & Raftery 1995); as a threshold for a change, common practice,
 * no source. Not applied to leave-one-out RMSE, whose Δ is in the
 * response's units.
 */
export const DELTA_WORTH_SAYING = 2;

const num = (x: unknown): x is number => typeof x === "number" && Number.isFinite(x);
const str = (x: unknown): x is string => typeof x === "string";
/** A signed Δ as the verdict prints Δ (three significant digits), with a true minus sign. */
const signed = (x: number) => `${x > 0 ? "+" : x < 0 ? "−" : ""}${formatNumber(Math.abs(x), 3)}`;

/** The candidates of a kept value, those with a name; null when it kept none (an older record). */
function candidates(k: Partial<CompareKept> | null): Map<string, Partial<CandidateKept>> | null {
  if (!Array.isArray(k?.rows)) return null;
  const rows = k.rows.filter((r) => str(r?.fit));
  return new Map(rows.map((r) => [r.fit, r]));
}

/** " with 40 new rows", " with 3 rows gone, 2 rows changed", or "". */
function rowsPhrase(ctx: ChangeContext): string {
  const r = ctx.rows;
  if (!r || r.added + r.removed + r.changed === 0) return "";
  const rows = (n: number) => `${n} ${n === 1 ? "row" : "rows"}`;
  const parts = [
    ...(r.added ? [`${r.added} new ${r.added === 1 ? "row" : "rows"}`] : []),
    ...(r.removed ? [`${rows(r.removed)} gone`] : []),
    ...(r.changed ? [`${rows(r.changed)} changed`] : []),
  ];
  return ` with ${parts.join(", ")}`;
}

function changes(a: CompareKept, b: CompareKept, ctx: ChangeContext): Change[] {
  const rowA = candidates(a), rowB = candidates(b);
  if (rowA === null || rowB === null) return [];
  const out: Change[] = [];
  const crit = str(b.criterion)
    ? b.criterion
    : LABELS[b.by as keyof typeof LABELS] ?? "the criterion";
  if (str(a.by) && str(b.by) && a.by !== b.by) {
    out.push(criterionChanged(a, b, ctx));
  } else {
    // Values are on one scale only when both records name the same criterion.
    const scale = str(a.by) && a.by === b.by ? { by: b.by, crit, rowA, rowB } : null;
    out.push(...preferredOrRanking(a, b, ctx, scale));
    if (scale && scale.by !== "loo") out.push(...deltaChanged(scale, ctx));
  }
  out.push(...candidatesChanged(rowA, rowB, ctx));
  out.push(...testsFlipped(a, b, ctx));
  return out;
}

function criterionChanged(a: CompareKept, b: CompareKept, ctx: ChangeContext): Change {
  const name = (k: CompareKept) => str(k.criterion) ? k.criterion : k.by;
  const known = "preferred" in a && "preferred" in b;
  const prefers = known && a.preferred !== b.preferred
    ? ` and prefers ${b.preferred ?? "none"} (was ${a.preferred ?? "none"})`
    : "";
  return {
    code: "criterion-changed",
    weight: "notable",
    sentence: `${ctx.cell} now ranks by ${name(b)} (was ${
      name(a)
    })${prefers}; its criterion values are not compared across the two.`,
    numbers: {
      before: a.by,
      after: b.by,
      preferred_before: known ? a.preferred : null,
      preferred_after: known ? b.preferred : null,
    },
  };
}

interface Scale {
  by: string;
  crit: string;
  rowA: Map<string, Partial<CandidateKept>>;
  rowB: Map<string, Partial<CandidateKept>>;
}

/** A change of preferred model (with Δ when both records have the values), else of ranking. */
function preferredOrRanking(
  a: CompareKept,
  b: CompareKept,
  ctx: ChangeContext,
  scale: Scale | null,
): Change[] {
  const known = (k: CompareKept) => "preferred" in k && (k.preferred === null || str(k.preferred));
  if (known(a) && known(b) && a.preferred !== b.preferred) {
    return [preferredChanged(a.preferred, b.preferred, ctx, scale)];
  }
  if (!scale) return [];
  // Fits with a value in both records, best first (lower is better for every criterion).
  const order = (rows: Map<string, Partial<CandidateKept>>, other: typeof rows) =>
    [...rows.values()]
      .filter((r) => num(r.value) && num(other.get(r.fit!)?.value))
      .sort((x, y) => x.value! - y.value!).map((r) => r.fit!);
  const before = order(scale.rowA, scale.rowB), after = order(scale.rowB, scale.rowA);
  if (before.join("\u0000") === after.join("\u0000")) return [];
  const still = known(b) && b.preferred !== null ? `; ${b.preferred} is still preferred` : "";
  return [{
    code: "ranking-changed",
    weight: "minor",
    sentence: `${ctx.cell}: the ranking by ${scale.crit} is now ${after.join(", ")} (was ${
      before.join(", ")
    })${still}.`,
    numbers: { before, after },
  }];
}

function preferredChanged(
  pa: string | null,
  pb: string | null,
  ctx: ChangeContext,
  scale: Scale | null,
): Change {
  // Δ of the new preferred model against the old one, in each record: new minus old.
  const gap = (rows: Map<string, Partial<CandidateKept>> | undefined) => {
    const vNew = pb === null ? undefined : rows?.get(pb)?.value;
    const vOld = pa === null ? undefined : rows?.get(pa)?.value;
    return num(vNew) && num(vOld) ? vNew - vOld : null;
  };
  const before = gap(scale?.rowA), after = gap(scale?.rowB);
  const crit = scale?.crit ?? "the criterion";
  const what = scale?.by === "loo"
    ? `the difference in ${crit} of ${pb} against ${pa}`
    : `Δ${crit} of ${pb} against ${pa}`;
  const deltas = before !== null && after !== null
    ? `: ${what} (${pb}'s minus ${pa}'s) went from ${signed(before)} to ${signed(after)}`
    : "";
  return {
    code: "preferred-changed",
    weight: "notable",
    sentence: `The preferred model of ${ctx.cell} changed from ${pa ?? "none"} to ${
      pb ?? "none"
    }${deltas}${rowsPhrase(ctx)}.`,
    numbers: {
      before: pa,
      after: pb,
      criterion: scale ? crit : null,
      delta_before: before,
      delta_after: after,
      delta_is: before !== null && after !== null
        ? `${crit} of ${pb} minus ${crit} of ${pa}`
        : null,
      rows: ctx.rows,
    },
  };
}

function deltaChanged(scale: Scale, ctx: ChangeContext): Change[] {
  const moved = [];
  for (const [fit, r] of scale.rowB) {
    const was = scale.rowA.get(fit);
    if (!num(was?.delta) || !num(r.delta)) continue;
    if (Math.abs(r.delta - was.delta) > DELTA_WORTH_SAYING) {
      moved.push({ fit, before: was.delta, after: r.delta });
    }
  }
  if (moved.length === 0) return [];
  const shown = (x: number) => formatNumber(x, 3);
  return [{
    code: "delta-changed",
    weight: "minor",
    sentence: `${ctx.cell}: Δ${scale.crit} moved by more than ${DELTA_WORTH_SAYING} for ${
      moved.map((m) => `${m.fit} (${shown(m.before)} → ${shown(m.after)})`).join(", ")
    }.`,
    numbers: { moved, threshold: DELTA_WORTH_SAYING },
  }];
}

function candidatesChanged(
  rowA: Map<string, unknown>,
  rowB: Map<string, unknown>,
  ctx: ChangeContext,
): Change[] {
  const added = [...rowB.keys()].filter((f) => !rowA.has(f));
  const removed = [...rowA.keys()].filter((f) => !rowB.has(f));
  if (added.length + removed.length === 0) return [];
  const parts = [
    ...(added.length ? [`now also compares ${added.join(", ")}`] : []),
    ...(removed.length ? [`no longer compares ${removed.join(", ")}`] : []),
  ];
  return [{
    code: "candidates-changed",
    weight: "minor",
    sentence: `${ctx.cell}: ${parts.join("; ")}.`,
    numbers: { added, removed },
  }];
}

/**
 * Nested F tests whose verdict flipped. They are read at the comparison's
 * own `significance` (the level its verdict states), or at 1 − the
 * document's confidence level when the record kept none.
 */
function testsFlipped(a: CompareKept, b: CompareKept, ctx: ChangeContext): Change[] {
  if (!Array.isArray(a.nested) || !Array.isArray(b.nested)) return [];
  const alpha = num(b.significance) ? b.significance : 1 - ctx.level;
  const key = (t: { smaller?: unknown; larger?: unknown }) => `${t?.smaller}\u0000${t?.larger}`;
  const before = new Map(a.nested.map((t) => [key(t), t]));
  const out: Change[] = [];
  for (const t of b.nested) {
    const was = before.get(key(t));
    if (!was || !num(was.p_value) || !num(t?.p_value)) continue;
    const now = t.p_value < alpha;
    if ((was.p_value < alpha) === now) continue;
    out.push({
      code: "nested-test-flipped",
      weight: "notable",
      sentence: `${ctx.cell}: the F test of ${t.larger} against ${t.smaller} is ${
        now ? "now significant" : "no longer significant"
      } at ${formatNumber(alpha, 2)} (p = ${formatP(was.p_value)} before, ${
        formatP(t.p_value)
      } now).`,
      numbers: {
        smaller: t.smaller,
        larger: t.larger,
        before: was.p_value,
        after: t.p_value,
        level: alpha,
      },
    });
  }
  return out;
}

/**
 * The comparison's history face.
 *
 * @example
 * ```ts
 * import { compareHistory } from "./history.ts";
 * const kept = (root: number, linear: number) => ({
 *   by: "aicc", criterion: "AICc", preferred: root < linear ? "root" : "linear",
 *   rows: [{ fit: "root", n: 20, k: 3, value: root, delta: null, weight: null },
 *     { fit: "linear", n: 20, k: 4, value: linear, delta: null, weight: null }],
 *   nested: [], significance: 0.05, verdict: "",
 * });
 * const [c] = compareHistory.changes(kept(10, 11), kept(10, 6), { cell: "fade", level: 0.95, rows: null });
 * if (c.sentence !== "The preferred model of fade changed from root to linear: ΔAICc of linear against root (linear's minus root's) went from +1 to −4.") throw new Error(c.sentence);
 * ```
 */
export const compareHistory: HistoryFace<CompareSpec, Comparison, CompareResult, CompareKept> = {
  keep,
  changes,
};
