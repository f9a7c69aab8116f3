/**
 * The agreement kind's history face: what it keeps, the changes it reports
 * between two kept results (a difference that turned, an estimate outside
 * its earlier interval), its tolerance of older records, and its trend.
 */
import { deepEqual, equal, ok } from "node:assert/strict";
import { agreementHistory } from "./history.ts";
import { readings, runAgreementCell } from "./_fixtures_test.ts";

const ctx = { cell: "meters", level: 0.95, rows: null };

function kept(b: number, seed: number) {
  const { out, result } = runAgreementCell({}, readings(60, { b, sx: 0.15, sy: 0.15, seed }));
  return agreementHistory.keep(out, {} as never, result);
}

Deno.test("agreement history: a proportional difference that appears is notable, with the slope that moved", () => {
  const before = kept(1.0, 2), after = kept(1.1, 2);
  equal(before.proportional, false);
  equal(after.proportional, true);
  const changes = agreementHistory.changes(before, after, ctx);
  const turned = changes.find((c) => c.code === "difference-turned")!;
  equal(turned.weight, "notable");
  equal(
    turned.sentence,
    `Agreement "meters": a proportional difference now shows (both regressions' intervals, at the 95% level)`,
  );
  deepEqual(turned.numbers, { difference: "proportional", before: false, after: true });
  ok(changes.some((c) => c.code === "estimate-moved" && c.numbers.name === "Deming slope"));
});

Deno.test("agreement history: the same result reports nothing; older records with fields missing are skipped", () => {
  const k = kept(1.0, 2);
  deepEqual(agreementHistory.changes(k, k, ctx), []);
  deepEqual(agreementHistory.changes({} as never, k, ctx), []);
  deepEqual(agreementHistory.changes(k, { n: 3 } as never, ctx), []);
  equal(agreementHistory.trend!({} as never).length, 0);
  const t = agreementHistory.trend!(k);
  deepEqual(t.map((s) => s.series), [
    "Deming slope",
    "Deming intercept",
    "Passing–Bablok slope",
    "Passing–Bablok intercept",
    "bias",
  ]);
  ok(t.every((s) => s.n === 60 && s.lower !== null && s.upper !== null));
});
