import { deepEqual, equal, ok } from "node:assert/strict";
import type { Change } from "../../kernel/contract/mod.ts";
import { cellRun, changeContext, fadeRun } from "../compare/_history_fixtures_test.ts";
import { wiggle } from "../compare/_fixtures_test.ts";
import { fitOf } from "./_fixtures_test.ts";
import { predictKind } from "./mod.ts";
import { INTERVAL_MOVE, predictHistory, type PredictKept } from "./history.ts";
import type { PredictResult } from "./result.ts";

const codes = (cs: Change[]) => cs.map((c) => `${c.code} ${c.weight}`);
const END_OF_LIFE = { fit: "root", at: { cycle: [700, 800] }, solve: { capacity: 2300 } };

/** The fade example's prediction (examples/fade/fade.md), before and after batch7-later.csv. */
async function fadePredict(later: boolean) {
  const { fits } = await fadeRun(later);
  return await cellRun<PredictResult, PredictKept>(predictKind, "end-of-life", END_OF_LIFE, {
    root: fits.root,
  });
}

/** Predictions of a straight line through y = 1 + 2x plus a small fixed wiggle on x = 1…n. */
async function linePredict(n: number, options: Record<string, unknown> = {}) {
  const x = Array.from({ length: n }, (_, i) => i + 1);
  const w = wiggle(n, 0.3);
  const fit = fitOf({ x, y: x.map((v, i) => 1 + 2 * v + w[i]) }, "y = a + b*x", {}, {
    x: "s",
    y: "mm",
  });
  return await cellRun<PredictResult, PredictKept>(predictKind, "p", {
    fit: "model",
    at: { x: [5] },
    solve: { y: 30 },
    ...options,
  }, { model: fit });
}

Deno.test("predictHistory.keep() keeps the level, each point's x, estimate, intervals and unit, each solve's y, x and interval", async () => {
  const { result, kept } = await fadePredict(false);
  equal(kept.level, 0.95);
  equal(kept.fit, "root");
  deepEqual(
    kept.at,
    result.at.map((p) => ({
      at: `cycle = ${p.x.cycle}`,
      x: p.x,
      value: p.estimate,
      ci: p.ci,
      pi: p.pi,
      unit: "mAh",
    })),
  );
  deepEqual(kept.at.map((p) => p.at), ["cycle = 700", "cycle = 800"]);
  const s = result.solve[0];
  deepEqual(kept.solve, [{
    at: "capacity = 2300",
    y: { capacity: 2300 },
    x: s.x,
    value: s.x.cycle,
    ci: s.ci,
    unit: "cycles",
  }]);
  deepEqual(JSON.parse(JSON.stringify(kept)), kept);
});

Deno.test("predictHistory.changes() on the fade example: both points and the solve leave their earlier intervals", async () => {
  const before = await fadePredict(false), after = await fadePredict(true);
  const c = predictHistory.changes(before.kept, after.kept, changeContext("end-of-life"));
  deepEqual(codes(c), [
    "prediction-moved notable",
    "prediction-moved notable",
    "solve-moved notable",
  ]);
  // Outside: each new estimate lies below its earlier interval (the plumb runs' own values).
  for (const [i, p] of after.result.at.entries()) {
    const was = before.result.at[i];
    ok(p.estimate! < was.ci![0], `${p.estimate} ${was.ci}`);
    deepEqual(c[i].numbers.before_ci, was.ci);
    equal(c[i].numbers.after, p.estimate);
    equal(c[i].numbers.outside_previous_interval, true);
  }
  ok(after.result.solve[0].x.cycle < before.result.solve[0].ci![0]);
  // The plumb runs of this invented data; digits by GUM §7.2.6 at a quarter of each
  // interval's width (cycle 700 now: width 3.15 → 0.79 → last digit 0.01; the solve
  // now: width 104 → 26 → last digit 1).
  equal(
    c[0].sentence,
    "end-of-life: the prediction at cycle = 700 is 2241.32 [2239.74, 2242.89] mAh (was 2250.81 [2250.19, 2251.44] mAh), outside its earlier interval.",
  );
  equal(
    c[2].sentence,
    "end-of-life: the cycle that gives capacity = 2300 is 438 [388, 492] cycles (was 461.4 [446.7, 476.3] cycles), outside its earlier interval.",
  );
});

Deno.test("predictHistory.changes() says an estimate that stayed inside its interval when the interval moved by over a tenth of its width", async () => {
  // 40 more rows on the same line: the estimates stay inside their intervals, which narrow.
  // The solve asks for y = 100, beyond the first 20 rows (x ≈ 49.5), where the line's own
  // uncertainty, which the new rows shrink, dominates its interval.
  const far = { solve: { y: 100 } };
  const before = await linePredict(20, far), after = await linePredict(60, far);
  const c = predictHistory.changes(
    before.kept,
    after.kept,
    changeContext("p", { added: 40, removed: 0, changed: 0 }),
  );
  deepEqual(codes(c), ["prediction-moved minor", "solve-moved minor"]);
  for (const m of c) {
    const [lo, hi] = m.numbers.before_ci as [number, number];
    const [lo2, hi2] = m.numbers.after_ci as [number, number];
    const after = m.numbers.after as number;
    ok(after >= lo && after <= hi);
    equal(m.numbers.outside_previous_interval, false);
    // The larger move of an end, as a fraction of the earlier width (exact arithmetic).
    const shift = Math.max(Math.abs(lo2 - lo), Math.abs(hi2 - hi)) / (hi - lo);
    equal(m.numbers.interval_shift, shift);
    ok(shift > INTERVAL_MOVE);
  }
  ok(c[0].sentence.startsWith("p: the prediction at x = 5 is "), c[0].sentence);
  ok(c[0].sentence.includes(" mm (was "), c[0].sentence);
  ok(
    /inside its earlier interval; an end of the interval moved by \d+ % of its earlier width\.$/
      .test(c[0].sentence),
    c[0].sentence,
  );
  ok(c[1].sentence.startsWith("p: the x that gives y = 100 is "), c[1].sentence);
  // The same run twice: nothing to say.
  deepEqual(predictHistory.changes(after.kept, after.kept, changeContext("p")), []);
});

Deno.test("predictHistory.changes() reports points and solves added or removed, and another fit", async () => {
  const a = await linePredict(20);
  const b = await linePredict(20, { at: { x: [5, 8] }, solve: { y: 20 } });
  const c = predictHistory.changes(a.kept, b.kept, changeContext("p"));
  deepEqual(codes(c), ["points-changed minor", "solves-changed minor"]);
  deepEqual(c[0].numbers, { added: ["x = 8"], removed: [] });
  deepEqual(c[1].numbers, { added: ["y = 20"], removed: ["y = 30"] });
  equal(c[1].sentence, "p: new solves y = 20; no longer y = 30.");
  const other = predictHistory.changes(a.kept, { ...a.kept, fit: "quad" }, changeContext("p"));
  deepEqual(codes(other), ["fit-changed notable"]);
  equal(other[0].sentence, "p now predicts from quad (was model); its values are not compared.");
});

/** A kept prediction by hand: one point at x = 1 with the estimate and interval given. */
function handKept(value: number, ci: [number, number], level = 0.95): PredictKept {
  return {
    fit: "f",
    level,
    at: [{ at: "x = 1", x: { x: 1 }, value, ci, pi: null, unit: null }],
    solve: [],
  };
}

Deno.test("predictHistory.changes() compares intervals at two levels only by the estimate", () => {
  // Exact arithmetic: [9, 11] → [9.5, 11.5] moves an end by 0.5 = 25 % of the width 2.
  // Digits: GUM §7.2.6, two digits of the uncertainty, a quarter of the width 2 = 0.50.
  const a = handKept(10, [9, 11]);
  const c = predictHistory.changes(a, handKept(10.5, [9.5, 11.5]), changeContext("p"));
  deepEqual(codes(c), ["prediction-moved minor"]);
  equal(c[0].numbers.interval_shift, 0.25);
  equal(
    c[0].sentence,
    "p: the prediction at x = 1 is 10.50 [9.50, 11.50] (was 10.00 [9.00, 11.00]), inside its earlier interval; an end of the interval moved by 25 % of its earlier width.",
  );
  // The same move at another level: not compared; an estimate outside still is.
  deepEqual(predictHistory.changes(a, handKept(10.5, [9.2, 11.8], 0.99), changeContext("p")), []);
  deepEqual(codes(predictHistory.changes(a, handKept(12, [11, 13], 0.99), changeContext("p"))), [
    "prediction-moved notable",
  ]);
  // A tenth of the width exactly is not more than a tenth: 1 of 10 (exact in binary).
  deepEqual(
    predictHistory.changes(handKept(5, [0, 10]), handKept(5, [1, 11]), changeContext("p")),
    [],
  );
});

Deno.test("predictHistory.changes() and trend() read kept values with fields missing (older records) without guessing", async () => {
  const now = (await linePredict(20)).kept;
  for (const old of [null, {}, { at: "x" }]) {
    deepEqual(predictHistory.changes(old as never, now, changeContext("p")), []);
    deepEqual(predictHistory.trend!(old as never), []);
  }
  // No level, no interval, no estimate, no solves: nothing is compared against zero.
  const old = {
    at: [{ at: "x = 5", value: 0 }, { at: "x = 6" }, { value: 3 }],
  } as unknown as PredictKept;
  const c = predictHistory.changes(old, now, changeContext("p"));
  deepEqual(codes(c), ["points-changed minor"]);
  deepEqual(c[0].numbers, { added: [], removed: ["x = 6"] });
  // An estimate without an interval before: only "outside" could be said, and it cannot.
  const noCi = { ...now, at: now.at.map((p) => ({ ...p, ci: undefined, value: p.value! + 100 })) };
  deepEqual(predictHistory.changes(noCi as unknown as PredictKept, now, changeContext("p")), []);
  deepEqual(
    predictHistory.trend!(old).map((s) => [s.series, s.value, s.lower, s.unit]),
    [["x = 5", 0, null, null]],
  );
});

Deno.test("predictHistory.trend() draws each point's estimate and each solved x with its interval", async () => {
  const { result, kept } = await fadePredict(true);
  const t = predictHistory.trend!(kept);
  deepEqual(t.map((s) => [s.series, s.unit]), [
    ["cycle = 700", "mAh"],
    ["cycle = 800", "mAh"],
    ["cycle that gives capacity = 2300", "cycles"],
  ]);
  deepEqual([t[0].value, t[0].lower, t[0].upper], [
    result.at[0].estimate,
    ...result.at[0].ci!,
  ]);
  deepEqual([t[2].value, t[2].lower, t[2].upper], [
    result.solve[0].x.cycle,
    ...result.solve[0].ci!,
  ]);
});
