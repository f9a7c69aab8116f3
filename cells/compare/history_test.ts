import { deepEqual, equal, ok } from "node:assert/strict";
import type { Change } from "../../kernel/contract/mod.ts";
import { cellRun, changeContext, fadeRun } from "./_history_fixtures_test.ts";
import { fitOf, makeTable, wiggle } from "./_fixtures_test.ts";
import { compareKind } from "./mod.ts";
import { compareHistory, type CompareKept, DELTA_WORTH_SAYING } from "./history.ts";
import type { CompareResult } from "./result.ts";
import { formatNumber } from "../shared/format.ts";

const codes = (cs: Change[]) => cs.map((c) => `${c.code} ${c.weight}`);
const FADE = { fits: ["line", "root", "root-linear", "power"], by: "aicc" };

/** The fade example's comparison (examples/fade/fade.md), before and after batch7-later.csv. */
async function fade(later: boolean) {
  const { fits } = await fadeRun(later);
  return await cellRun<CompareResult, CompareKept>(compareKind, "fade", FADE, fits);
}

/** Fits of a parabola y = (x − 5.5)² (with a small fixed wiggle) on x = 1…n: quad, line, flat. */
function parabola(n: number, extra: Record<string, string> = {}) {
  const x = Array.from({ length: n }, (_, i) => i + 1);
  const w = wiggle(n, 0.05);
  const t = makeTable({ x, y: x.map((v, i) => (v - 5.5) ** 2 + w[i]) });
  const models: Record<string, string> = {
    quad: "y = a + b*x + c*x^2",
    line: "y = a + b*x",
    flat: "y = a",
    ...extra,
  };
  return Object.fromEntries(Object.entries(models).map(([name, m]) => [name, fitOf(name, m, t)]));
}

async function shape(n: number, options: Record<string, unknown> = {}, extra = {}) {
  const fits = parabola(n, extra);
  return (await cellRun<CompareResult, CompareKept>(compareKind, "shape", {
    fits: Object.keys(fits),
    ...options,
  }, fits)).kept;
}

Deno.test("compareHistory.keep() keeps by, preferred, each row's criterion, Δ and weight, the nested tests and the verdict", async () => {
  const { result, kept } = await fade(false);
  equal(kept.by, "aicc");
  equal(kept.criterion, "AICc");
  equal(kept.preferred, result.preferred);
  equal(kept.verdict, result.verdict);
  // The kept value of each row is the row's AICc, its Δ and weight as the comparison gave them.
  deepEqual(
    kept.rows,
    result.rows.map((r) => ({
      fit: r.fit,
      n: r.n,
      k: r.k,
      value: r.aicc,
      delta: r.delta,
      weight: r.weight,
    })),
  );
  deepEqual(kept.nested.map((t) => [t.smaller, t.larger]), [["line", "root-linear"], [
    "root",
    "root-linear",
  ]]);
  // Plain JSON: the history writes it as it is.
  deepEqual(JSON.parse(JSON.stringify(kept)), kept);
});

Deno.test("compareHistory.changes() on the fade example: the preferred model changes from root to root-linear with 40 new rows", async () => {
  const before = await fade(false), after = await fade(true);
  const aicc = (r: CompareResult, fit: string) => r.rows.find((x) => x.fit === fit)!.aicc!;
  const c = compareHistory.changes(
    before.kept,
    after.kept,
    changeContext("fade", { added: 40, removed: 0, changed: 0 }),
  );
  deepEqual(codes(c), [
    "preferred-changed notable",
    "delta-changed minor",
    "nested-test-flipped notable",
  ]);
  const p = c[0];
  deepEqual([p.numbers.before, p.numbers.after, p.numbers.criterion], [
    "root",
    "root-linear",
    "AICc",
  ]);
  // Δ is the new preferred model's AICc minus the old one's, in each record (exact arithmetic
  // on the comparison's own values): positive before (root was preferred), negative now.
  const dBefore = aicc(before.result, "root-linear") - aicc(before.result, "root");
  const dAfter = aicc(after.result, "root-linear") - aicc(after.result, "root");
  equal(p.numbers.delta_before, dBefore);
  equal(p.numbers.delta_after, dAfter);
  ok(dBefore > 0 && dAfter < 0, `${dBefore} ${dAfter}`);
  equal(p.numbers.delta_is, "AICc of root-linear minus AICc of root");
  // Three significant digits, as the verdict prints Δ; a true minus sign.
  equal(
    p.sentence,
    `The preferred model of fade changed from root to root-linear: ΔAICc of root-linear against root (root-linear's minus root's) went from +${
      formatNumber(dBefore, 3)
    } to −${formatNumber(-dAfter, 3)} with 40 new rows.`,
  );
  // The plumb run of this invented data: ΔAICc +0.884 before, −112 after.
  ok(p.sentence.includes("from +0.884 to −112"), p.sentence);

  // Every Δ that moved by more than 2, with the comparison's own Δ values.
  const moved = c[1].numbers.moved as { fit: string; before: number; after: number }[];
  for (const m of moved) {
    equal(m.before, before.result.rows.find((r) => r.fit === m.fit)!.delta);
    equal(m.after, after.result.rows.find((r) => r.fit === m.fit)!.delta);
    ok(Math.abs(m.after - m.before) > DELTA_WORTH_SAYING);
  }
  deepEqual(moved.map((m) => m.fit), ["line", "root", "power"]);
  equal(c[1].numbers.threshold, 2);

  // root within root-linear: not significant at 0.05 before, significant now.
  const f = c[2].numbers;
  deepEqual([f.smaller, f.larger, f.level], ["root", "root-linear", 0.05]);
  ok((f.before as number) > 0.05 && (f.after as number) < 0.05);
  ok(c[2].sentence.includes("the F test of root-linear against root is now significant at 0.05"));
});

Deno.test("compareHistory.changes() reports a new ranking under the same preferred model, the Δ that moved and a flipped F test", async () => {
  // On x = 1…10 the parabola is symmetric about 5.5, so the line's least-squares slope is
  // (nearly) 0 and its AICc only adds a parameter to the flat fit's: quad, flat, line.
  // x = 11…14 break the symmetry: the line now explains part of the rise: quad, line, flat.
  const c = compareHistory.changes(
    await shape(10),
    await shape(14),
    changeContext("shape", { added: 4, removed: 0, changed: 0 }),
  );
  deepEqual(codes(c), [
    "ranking-changed minor",
    "delta-changed minor",
    "nested-test-flipped notable",
  ]);
  deepEqual(c[0].numbers, { before: ["quad", "flat", "line"], after: ["quad", "line", "flat"] });
  equal(
    c[0].sentence,
    "shape: the ranking by AICc is now quad, line, flat (was quad, flat, line); quad is still preferred.",
  );
  deepEqual(c[2].numbers.smaller, "flat");
  deepEqual(c[2].numbers.larger, "line");
});

Deno.test("compareHistory.changes() reports fits added to the comparison and a change of criterion", async () => {
  const three = await shape(10);
  const four = await shape(10, {}, { cubic: "y = a + b*x + c*x^2 + d*x^3" });
  const c = compareHistory.changes(three, four, changeContext("shape"));
  deepEqual(codes(c), ["candidates-changed minor"]);
  deepEqual(c[0].numbers, { added: ["cubic"], removed: [] });
  equal(c[0].sentence, "shape: now also compares cubic.");

  const bic = await shape(10, { by: "bic" });
  const k = compareHistory.changes(three, bic, changeContext("shape"));
  deepEqual(codes(k), ["criterion-changed notable"]);
  deepEqual(k[0].numbers, {
    before: "aicc",
    after: "bic",
    preferred_before: "quad",
    preferred_after: "quad",
  });
  equal(
    k[0].sentence,
    "shape now ranks by BIC (was AICc); its criterion values are not compared across the two.",
  );
});

/** A kept comparison by hand: Δ of each fit as given, the value = 10 + Δ. */
function handKept(deltas: Record<string, number>, by = "aicc"): CompareKept {
  const rows = Object.entries(deltas).map(([fit, delta]) => ({
    fit,
    n: 20,
    k: 3,
    value: 10 + delta,
    delta,
    weight: null,
  }));
  return {
    by,
    criterion: by === "loo" ? "leave-one-out RMSE" : "AICc",
    preferred: rows.find((r) => r.delta === 0)!.fit,
    rows,
    nested: [],
    significance: 0.05,
    verdict: "",
  };
}

Deno.test("compareHistory.changes() says a Δ moved only beyond 2, and never for leave-one-out RMSE", () => {
  // Exact arithmetic: |2.9 − 1| = 1.9 ≤ 2; |3.5 − 1| = 2.5 > 2.
  const a = handKept({ best: 0, next: 1 });
  equal(compareHistory.changes(a, handKept({ best: 0, next: 2.9 }), changeContext("c")).length, 0);
  const c = compareHistory.changes(a, handKept({ best: 0, next: 3.5 }), changeContext("c"));
  deepEqual(codes(c), ["delta-changed minor"]);
  deepEqual(c[0].numbers.moved, [{ fit: "next", before: 1, after: 3.5 }]);
  equal(c[0].sentence, "c: ΔAICc moved by more than 2 for next (1 → 3.5).");
  const loo = compareHistory.changes(
    handKept({ best: 0, next: 1 }, "loo"),
    handKept({ best: 0, next: 30 }, "loo"),
    changeContext("c"),
  );
  deepEqual(loo, []);
  // A new preferred model by leave-one-out RMSE: the difference in RMSE, new minus old.
  const swap = compareHistory.changes(
    handKept({ best: 0, next: 1 }, "loo"),
    handKept({ best: 2, next: 0 }, "loo"),
    changeContext("c"),
  );
  equal(
    swap[0].sentence,
    "The preferred model of c changed from best to next: the difference in leave-one-out RMSE of next against best (next's minus best's) went from +1 to −2.",
  );
});

Deno.test("compareHistory.changes() reads kept values with fields missing (older records) without guessing", async () => {
  const now = await shape(14);
  for (const old of [null, {}, { preferred: "flat" }, { rows: "x" }]) {
    deepEqual(compareHistory.changes(old as never, now, changeContext("c")), []);
  }
  // An older record without `by`, values, Δ or nested tests: the preferred model is still
  // compared, without Δ (missing is not zero), and no ranking, Δ or F test is claimed.
  const old = {
    preferred: "flat",
    rows: [{ fit: "quad" }, { fit: "line" }, { fit: "flat" }],
  } as unknown as CompareKept;
  const c = compareHistory.changes(old, now, changeContext("c"));
  deepEqual(codes(c), ["preferred-changed notable"]);
  equal(c[0].sentence, "The preferred model of c changed from flat to quad.");
  equal(c[0].numbers.delta_before, null);
  equal(c[0].numbers.delta_after, null);
  // Without `preferred` in the older record: nothing said about it; rows without a name skipped.
  const noPreferred = { by: "aicc", rows: [{ fit: "quad" }, { n: 3 }] } as unknown as CompareKept;
  deepEqual(codes(compareHistory.changes(noPreferred, now, changeContext("c"))), [
    "candidates-changed minor",
  ]);
});
