import { equal, ok, throws } from "node:assert/strict";
import { compileScalar, parseModel } from "../../kernel/expr/mod.ts";
import { CellError } from "../../kernel/errors.ts";
import type { Fit } from "../fit/mod.ts";
import { originalScale } from "./original_scale.ts";

/** The parts of a fit originalScale reads, for a response written as `response` of column y. */
function fitOf(response: string, y: number[]): Fit {
  const model = parseModel(`${response} = a + b*x`, ["x", "y"]);
  const g = compileScalar(model.response, ["y"]);
  return {
    model,
    responseText: response,
    y: Float64Array.from(y, (v) => g([v])),
    rows: Int32Array.from(y, (_, i) => i + 1),
  } as unknown as Fit;
}

Deno.test("originalScale() undoes the response by the one response inverse", () => {
  // The cases of kernel/expr/response_inverse_test.ts, through compare's entry point:
  const cube = originalScale(fitOf("y^3", [-2, 1, 3]), "cmp", ["fits", 0]);
  equal(cube.values[0], -2); // exact arithmetic: (−2)³ = −8 and back
  equal(cube.inverse(-8), -2); // exact arithmetic: odd powers are one-to-one
  const root = originalScale(fitOf("sqrt(y)", [1, 4, 9]), "cmp", ["fits", 0]);
  ok(Number.isNaN(root.inverse(-2)), "exact arithmetic: no y has a negative square root");
  const atan = originalScale(fitOf("atan(y)", [0.5, 1, 2]), "cmp", ["fits", 0]);
  ok(Math.abs(atan.values[2] - 2) < 1e-15 * 2, "exact arithmetic: tan(atan 2) = 2, to rounding");
  // Exact arithmetic: the log-Jacobian of atan is Σ ln 1/(1 + y²).
  const want = -[0.5, 1, 2].reduce((s, y) => s + Math.log(1 + y * y), 0);
  ok(Math.abs(atan.logJacobian - want) < 1e-14, `${atan.logJacobian} vs ${want}`);
});

Deno.test("originalScale() refuses a response with no inverse", () => {
  throws(() => originalScale(fitOf("abs(y)", [1, 2]), "cmp", ["fits", 1]), {
    name: CellError.name,
    message:
      'Cannot compare "cmp": the response "abs(y)" cannot be undone to column "y": the criteria on the original scale need a one-to-one transform such as log(y), sqrt(y) or 1/y',
  });
});
