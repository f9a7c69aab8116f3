import assert from "node:assert/strict";
import { fitKind } from "./mod.ts";
import { refit, refitProblem } from "./refit.ts";
import { makeTable, parseContext, runContext } from "./_fixtures_test.ts";
import type { Fit } from "./fit.ts";

function fitOf(model: string, x: Float64Array, y: Float64Array, extra = {}): Fit {
  const spec = fitKind.parse(parseContext("f", { on: "data", model, ...extra }));
  return fitKind.run(spec, runContext("f", "data", makeTable({ x, y }))) as Fit;
}

const x = Float64Array.from({ length: 8 }, (_, i) => i);
const y = x.map((v) => 3 * Math.exp(-0.4 * v) + 0.01 * Math.cos(5 * v));

Deno.test("refit() on every row reproduces the fit's own estimates", () => {
  for (const model of ["y = a + b*x + c*x^2", "y = a*exp(-b*x)"]) {
    const fit = fitOf(model, x, y, model.includes("exp") ? { start: { a: 2, b: 0.3 } } : {});
    const s = refit(fit, Array.from(x, (_, i) => i));
    fit.estimates.forEach((e, j) => assert.ok(Math.abs(s.estimates[j] / e - 1) < 1e-9, model));
  }
});

Deno.test("refit() on a subset equals fitting that subset from scratch", () => {
  // The even rows lie exactly on y = 1 + 2x (the 0.1 bumps are on odd x): hand computation.
  const line = fitOf("y = a + b*x", x, x.map((v) => 1 + 2 * v + (v % 2) * 0.1));
  const keep = [0, 2, 4, 6];
  const sub = refit(line, keep);
  assert.ok(Math.abs(sub.estimates[0] - 1) < 1e-14 && Math.abs(sub.estimates[1] - 2) < 1e-14);
  const p = refitProblem(line, keep);
  assert.deepEqual(Array.from(p.rows), [1, 3, 5, 7]);
  assert.deepEqual(p.start, { a: line.estimates[0], b: line.estimates[1] });
  assert.equal(p.weights, null);
});

Deno.test("refitProblem() keeps the weights of the rows kept and refuses bad indexes", () => {
  const w = fitOf("y = a + b*x", x, y, { weights: "1/(x + 1)" });
  assert.deepEqual(Array.from(refitProblem(w, [1, 3]).weights!), [1 / 2, 1 / 4]);
  assert.throws(() => refitProblem(w, [8]), (e: unknown) => {
    assert.ok(e instanceof RangeError);
    assert.equal(e.message, 'Cannot refit: row index "8" is outside 0…7');
    return true;
  });
});
