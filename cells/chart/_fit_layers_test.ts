import { equal, ok, throws } from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { addFit, addTable, type Cells, SETTINGS } from "./_testing.ts";
import type { ChartSpec } from "./spec.ts";
import { drawnFits } from "./_fit_layers.ts";

/** The chart's checked fit named `f`, fitted as `model` on a small table. */
async function drawn(model: string) {
  const cells: Cells = {};
  const x = [1, 2, 3, 4, 5, 6];
  await addTable(cells, "t", { columns: ["x", "y"], rows: x.map((v) => [v, 0.3 * v + 0.05]) });
  await addFit(cells, "f", "t", model);
  // The fields drawnFits reads; the parsing of a chart's options is spec_test.ts's business.
  const spec = { on: "t", x: "x", y: "y", fits: ["f"], band: null } as unknown as ChartSpec;
  const ctx = { name: "c", settings: SETTINGS, inputs: cells, files: {}, warn() {}, progress() {} };
  return () => drawnFits(spec, ctx)[0];
}

Deno.test("drawnFits() back-transforms by the one response inverse", async () => {
  // The cases of kernel/expr/response_inverse_test.ts, through chart's entry point:
  equal((await drawn("y^3 = a + b*x"))().inverse(-8), -2); // exact arithmetic: (−2)³ = −8
  const root = (await drawn("sqrt(y) = a + b*x"))();
  ok(Number.isNaN(root.inverse(-2)), "exact arithmetic: no y has a negative square root");
  equal((await drawn("atan(y) = a + b*x"))().inverse(1), Math.tan(1)); // exact arithmetic
});

Deno.test("drawnFits() refuses a response transform it cannot undo, with the reason", async () => {
  const fits = await drawn("abs(y) = a + b*x");
  throws(fits, {
    name: CellError.name,
    message:
      'Cannot draw fit "f" in chart "c" on the scale of "y": abs() of the response is not one-to-one',
  });
});
