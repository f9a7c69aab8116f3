import assert from "node:assert/strict";
import type { Table } from "../../kernel/contract/mod.ts";
import { fitResult, makeTable } from "./_fixtures_test.ts";
import { fitOf, predict } from "../predict/_fixtures_test.ts";

// Units by dimensional analysis, worked by hand: only quantities of one kind add and a
// function such as exp takes a pure number (Bridgman 1922, ch. 1; from memory). Data invented.
const CYCLE = [0, 50, 100, 200, 300, 400, 500, 600];
const CAPACITY = [2500.1, 2470.3, 2457.6, 2440.2, 2426.9, 2415.3, 2405.8, 2397.1];

function withUnits(t: Table, units: Record<string, string>): Table {
  return { ...t, columns: t.columns.map((c) => ({ ...c, unit: units[c.name] ?? null })) };
}

const TABLE = withUnits(makeTable({ cycle: CYCLE, capacity: CAPACITY }), {
  cycle: "cycles",
  capacity: "mAh",
});

Deno.test("fit result: each parameter's unit, sigma_unit, and a term whose units disagree", () => {
  const { result } = fitResult("root", "capacity = q0 - a*sqrt(cycle)", TABLE);
  assert.deepEqual(
    result.parameters.map((p) => [p.name, p.unit, p.unit_note]),
    [["q0", "mAh", null], ["a", "mAh/cycles^0.5", null]],
  );
  assert.equal(result.sigma_unit, "mAh");
  const mixed = fitResult("mixed", "capacity = q0 + cycle + a*cycle", TABLE);
  assert.ok(
    mixed.warnings.some((w) => /^Units in ".*" do not agree: .*\(fit "mixed"\)$/.test(w)),
    mixed.warnings.join("\n"),
  );
  const power = fitResult("power", "capacity = q0 - a*cycle^b", TABLE, {
    start: { q0: 2500, a: 5, b: 0.5 },
  });
  const a = power.result.parameters.find((p) => p.name === "a")!;
  assert.equal(a.unit, null);
  assert.match(a.unit_note!, /raises a quantity with a unit to a fitted power/);
  const bare = fitResult(
    "bare",
    "capacity = q0 - a*sqrt(cycle)",
    makeTable({ cycle: CYCLE, capacity: CAPACITY }),
  );
  assert.deepEqual(bare.result.parameters.map((p) => p.unit), [null, null]);
  assert.equal(bare.result.sigma_unit, null);
});

Deno.test("predict result: estimates in the response's unit, solved x in the predictor's", () => {
  const plain = fitOf({ cycle: CYCLE, capacity: CAPACITY }, "capacity = q0 - a*sqrt(cycle)");
  assert.equal(predict(plain, { at: { cycle: 700 } }).result.at[0].unit, null);
  const fit = fitOf({ cycle: CYCLE, capacity: CAPACITY }, "capacity = q0 - a*sqrt(cycle)", {}, {
    cycle: "cycles",
    capacity: "mAh",
  });
  const { result } = predict(fit, { at: { cycle: 700 }, solve: { capacity: 2400 } });
  assert.equal(result.at[0].unit, "mAh");
  assert.equal(result.solve[0].unit, "cycles");
});

Deno.test("fitKind.details() gives each estimate with its uncertainty, unit and interval", async () => {
  const { fitKind } = await import("./mod.ts");
  const { result } = fitResult("root", "capacity = q0 - a*sqrt(cycle)", TABLE);
  const lines = fitKind.details!(result);
  assert.equal(lines.length, 2);
  // Rounded at the standard uncertainty's second significant digit (GUM §7.2.6).
  const q0 = result.parameters[0];
  assert.match(lines[0], /^q0 = [\d.]+, u [\d.]+ mAh, 95% [\d.]+ … [\d.]+$/);
  const digits = lines[0].split(", u ")[1].split(" ")[0].replace(/^0\.0*/, "").replace(".", "");
  assert.equal(digits.length, 2, `two significant digits in u = ${q0.std_error}: ${lines[0]}`);
  assert.match(lines[1], /^a = [\d.]+, u [\d.]+ mAh\/cycles\^0\.5, 95% /);
});
