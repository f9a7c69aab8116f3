import { deepEqual, equal } from "node:assert/strict";
import { calcHistory } from "./history.ts";
import type { CalcResult } from "./result.ts";

const result = (value: unknown): CalcResult => ({
  value,
  gives: "value",
  table: null,
  console: "",
  console_cut: 0,
  run_ms: 1,
});
// deno-lint-ignore no-explicit-any
const keep = (v: unknown) => calcHistory.keep(null as any, null as any, result(v));
const ctx = { cell: "crossing", level: 0.95, rows: null };

Deno.test("calc history keeps a record's named numbers and says which moved, by how much", () => {
  const before = keep({ cycle: 2000, u: 40, note: "power law" });
  deepEqual(before.numbers, { cycle: 2000, u: 40 });
  const c = calcHistory.changes(before, keep({ cycle: 2100, u: 40, note: "power law" }), ctx);
  equal(c.length, 1);
  equal(c[0].code, "value-moved");
  equal(c[0].weight, "minor");
  // Exact arithmetic: (2100 - 2000) / 2000 = 5 %.
  equal(c[0].sentence, "crossing: cycle is 2100 (was 2000, +5 %).");
  deepEqual(calcHistory.trend!(before).map((t) => [t.series, t.value]), [["cycle", 2000], [
    "u",
    40,
  ]]);
});

Deno.test("calc history says a value without numbers changed, and nothing when it did not", () => {
  equal(calcHistory.changes(keep(["a"]), keep(["a"]), ctx).length, 0);
  equal(calcHistory.changes(keep(["a"]), keep(["b"]), ctx)[0].code, "value-changed");
  // An older record without fields is compared on nothing.
  equal(calcHistory.changes({} as ReturnType<typeof keep>, keep({ x: 1 }), ctx).length, 0);
});
