import { equal, ok } from "node:assert/strict";
import { parseModel } from "../../kernel/expr/mod.ts";
import { inverseOf } from "./_inverse.ts";

function inverse(model: string) {
  const m = parseModel(model, ["x", "y"]);
  return inverseOf(m.response, m.responseColumn);
}

Deno.test("inverseOf() undoes common response transforms", () => {
  // Each case: the transform applied to y = 2.5 and undone (identity, common practice, no source).
  const cases: [string, (y: number) => number][] = [
    ["log(y) = a + b*x", Math.log],
    ["log10(y) = a + b*x", Math.log10],
    ["sqrt(y) = a + b*x", Math.sqrt],
    ["1/y = a + b*x", (y) => 1 / y],
    ["y^2 = a + b*x", (y) => y * y],
    ["-(y - 1)/3 = a + b*x", (y) => -(y - 1) / 3],
    ["2^y = a + b*x", (y) => 2 ** y],
  ];
  for (const [model, g] of cases) {
    const inv = inverse(model);
    if ("reason" in inv) throw new Error(`${model}: ${inv.reason}`);
    ok(Math.abs(inv(g(2.5)) - 2.5) < 1e-14, model);
  }
});

Deno.test("inverseOf() gives a reason for a transform it cannot undo", () => {
  const inv = inverse("abs(y) = a + b*x");
  ok("reason" in inv);
  equal(inv.reason, "abs() of the response cannot be undone on a chart");
});
