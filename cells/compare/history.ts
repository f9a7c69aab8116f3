/**
 * The comparison's face in the run history: the preferred model, each
 * candidate's criterion, Δ and weight, the nested tests; what changed
 * between two records (a change of preferred model first).
 *
 * Δ here is taken the way the comparison reports it: a candidate's criterion
 * minus the best one's, so the preferred model has Δ = 0. A sentence about a
 * change of preferred model states the new preferred model's criterion minus
 * the old one's, in both records: negative now, positive (or zero) before.
 *
 * @module
 */
import type { Change, ChangeContext, HistoryFace } from "../../kernel/contract/mod.ts";
import type { CompareSpec } from "./spec.ts";
import type { CompareResult, Comparison } from "./result.ts";
import { formatNumber } from "../shared/format.ts";

/** What a record keeps of a comparison. */
export interface CompareKept {
  by: string;
  criterion: string;
  preferred: string | null;
  rows: {
    fit: string;
    n: number;
    k: number;
    value: number | null;
    delta: number | null;
    weight: number | null;
  }[];
  nested: { smaller: string; larger: string; p_value: number | null }[];
  significance: number;
  verdict: string;
}

function keep(_out: Comparison, _spec: CompareSpec, r: CompareResult): CompareKept {
  const value = (row: CompareResult["rows"][number]): number | null => {
    const v = (row as unknown as Record<string, unknown>)[r.by === "loo" ? "loo_rmse" : r.by];
    return typeof v === "number" ? v : null;
  };
  return {
    by: r.by,
    criterion: r.criterion,
    preferred: r.preferred,
    rows: r.rows.map((row) => ({
      fit: row.fit,
      n: row.n,
      k: row.k,
      value: value(row),
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

const num = (x: unknown): x is number => typeof x === "number" && Number.isFinite(x);
const signed = (x: number) => `${x > 0 ? "+" : x < 0 ? "−" : ""}${formatNumber(Math.abs(x), 3)}`;

/**
 * Δ-differences of information criteria larger than 2 are commonly read as a
 * real change of support (Burnham & Anderson 2002, §2.6; common practice).
 */
const DELTA_WORTH_SAYING = 2;

function rowsPhrase(ctx: ChangeContext): string {
  const r = ctx.rows;
  if (!r || r.added + r.removed + r.changed === 0) return "";
  const parts = [
    ...(r.added ? [`${r.added} new ${r.added === 1 ? "row" : "rows"}`] : []),
    ...(r.removed ? [`${r.removed} ${r.removed === 1 ? "row" : "rows"} gone`] : []),
    ...(r.changed ? [`${r.changed} ${r.changed === 1 ? "row" : "rows"} changed`] : []),
  ];
  return ` with ${parts.join(", ")}`;
}

function changes(a: CompareKept, b: CompareKept, ctx: ChangeContext): Change[] {
  const cell = ctx.cell;
  const out: Change[] = [];
  if (!Array.isArray(a?.rows) || !Array.isArray(b?.rows)) return out;
  if (a.by !== b.by) {
    out.push({
      code: "criterion-changed",
      weight: "notable",
      sentence:
        `${cell} now ranks by ${b.criterion} (was ${a.criterion}); its rankings are not compared.`,
      numbers: { before: a.by, after: b.by },
    });
    return out;
  }
  const rowA = new Map(a.rows.map((r) => [r.fit, r]));
  const rowB = new Map(b.rows.map((r) => [r.fit, r]));
  const crit = b.criterion;
  if (a.preferred !== b.preferred) {
    const pa = a.preferred, pb = b.preferred;
    const gap = (k: CompareKept, x: string | null, y: string | null) => {
      const m = new Map(k.rows.map((r) => [r.fit, r.value]));
      const vx = x ? m.get(x) : null, vy = y ? m.get(y) : null;
      return num(vx) && num(vy) ? vx - vy : null;
    };
    const before = gap(a, pb, pa), after = gap(b, pb, pa);
    const deltas = before !== null && after !== null
      ? `: Δ${crit} of ${pb} against ${pa} went from ${signed(before)} to ${signed(after)}`
      : "";
    out.push({
      code: "preferred-changed",
      weight: "notable",
      sentence: `The preferred model of ${cell} changed from ${pa ?? "none"} to ${
        pb ?? "none"
      }${deltas}${rowsPhrase(ctx)}.`,
      numbers: {
        before: pa,
        after: pb,
        criterion: crit,
        delta_before: before,
        delta_after: after,
        delta_is: `${crit} of ${pb} minus ${crit} of ${pa}`,
        rows: ctx.rows,
      },
    });
  } else {
    const order = (k: CompareKept) =>
      k.rows.filter((r) => rowB.has(r.fit) && rowA.has(r.fit) && num(r.value))
        .sort((x, y) => (x.value as number) - (y.value as number)).map((r) => r.fit);
    const oa = order(a), ob = order(b);
    if (oa.join("\u0000") !== ob.join("\u0000")) {
      out.push({
        code: "ranking-changed",
        weight: "minor",
        sentence: `${cell}: the ranking by ${crit} is now ${ob.join(", ")} (was ${
          oa.join(", ")
        }); ${b.preferred ?? "none"} is still preferred.`,
        numbers: { before: oa, after: ob },
      });
    }
  }
  const moved = [];
  for (const [fit, r] of rowB) {
    const was = rowA.get(fit);
    if (!was || !num(was.delta) || !num(r.delta)) continue;
    if (Math.abs(r.delta - was.delta) > DELTA_WORTH_SAYING) {
      moved.push({ fit, before: was.delta, after: r.delta });
    }
  }
  if (moved.length > 0) {
    out.push({
      code: "delta-changed",
      weight: "minor",
      sentence: `${cell}: Δ${crit} moved for ${
        moved.map((m) => `${m.fit} (${formatNumber(m.before, 3)} → ${formatNumber(m.after, 3)})`)
          .join(", ")
      }.`,
      numbers: { moved, threshold: DELTA_WORTH_SAYING },
    });
  }
  const addedFits = [...rowB.keys()].filter((f) => !rowA.has(f));
  const goneFits = [...rowA.keys()].filter((f) => !rowB.has(f));
  if (addedFits.length + goneFits.length > 0) {
    out.push({
      code: "candidates-changed",
      weight: "minor",
      sentence: `${cell}: ${addedFits.length ? `now also compares ${addedFits.join(", ")}` : ""}${
        addedFits.length && goneFits.length ? "; " : ""
      }${goneFits.length ? `no longer compares ${goneFits.join(", ")}` : ""}.`,
      numbers: { added: addedFits, removed: goneFits },
    });
  }
  const alpha = num(b.significance) ? b.significance : 1 - ctx.level;
  const testA = new Map((a.nested ?? []).map((t) => [`${t.smaller}\u0000${t.larger}`, t]));
  for (const t of b.nested ?? []) {
    const was = testA.get(`${t.smaller}\u0000${t.larger}`);
    if (!was || !num(was.p_value) || !num(t.p_value)) continue;
    const sigA = was.p_value < alpha, sigB = t.p_value < alpha;
    if (sigA === sigB) continue;
    out.push({
      code: "nested-test-flipped",
      weight: "notable",
      sentence: `${cell}: the F test of ${t.larger} against ${t.smaller} is ${
        sigB ? "now significant" : "no longer significant"
      } at ${formatNumber(alpha, 2)} (p ${formatNumber(was.p_value, 2)} → ${
        formatNumber(t.p_value, 2)
      }).`,
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

/** The comparison's history face. */
export const compareHistory: HistoryFace<CompareSpec, Comparison, CompareResult, CompareKept> = {
  keep,
  changes,
};
