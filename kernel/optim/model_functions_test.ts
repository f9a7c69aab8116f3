import assert from "node:assert/strict";
import { parseModel } from "../expr/mod.ts";
import { modelFunctions } from "./model_functions.ts";

Deno.test("modelFunctions() gives the Jacobian's limits at t = 0 for a power of the predictor", () => {
  // f = exp(−k·tⁿ): ∂f/∂k = −tⁿ·e^(−k tⁿ) = 0 at t = 0 (0ⁿ = 0 for n > 0), ∂f/∂n = −k·tⁿ·ln t·e^(−k tⁿ)
  // → 0 (limit rule: tⁿ ln t → 0 as t → 0⁺ for n > 0). At t = 1: ∂f/∂k = −e^(−k), ∂f/∂n = 0
  // (ln 1 = 0): exact.
  const model = parseModel("y = exp(-k*t^n)", ["t", "y"]);
  const fns = modelFunctions({
    model,
    n: 2,
    columns: [Float64Array.from([0, 1])],
    y: Float64Array.from([1, 0.5]),
  });
  const J = new Float64Array(4);
  fns.jac(Float64Array.from([0.7, 0.5]), J);
  assert.ok(J[0] === 0 && J[2] === 0, `${J}`);
  assert.equal(J[1], -Math.exp(-0.7));
  assert.ok(J[3] === 0, `${J}`);
  assert.equal(fns.notFinite(Float64Array.from([0.7, 0.5])), null);
});

Deno.test("modelFunctions().notFinite() names the model's term, else a derivative's", () => {
  const model = parseModel("y = a*sqrt(t - c) + b*log(t)", ["t", "y"]);
  const fns = modelFunctions({
    model,
    n: 3,
    columns: [Float64Array.from([0, 1, 2])],
    y: Float64Array.from([0, 1, 2]),
  });
  // Parameters in model order: a, c, b.
  const model0 = fns.notFinite(Float64Array.from([1, -1, 1]));
  assert.deepEqual(model0, {
    term: "log(t)",
    start: "y = a*sqrt(t - c) + b*".length,
    rows: [0],
    columns: ["t"],
    usesParameters: false,
  });
  const derivative = parseModel("y = a*sqrt(t - c)", ["t", "y"]);
  const d = modelFunctions({
    model: derivative,
    n: 3,
    columns: [Float64Array.from([1, 2, 3])],
    y: Float64Array.from([0, 1, 2]),
  }).notFinite(Float64Array.from([1, 1]));
  assert.equal(d?.derivativeBy, "c");
  assert.deepEqual(d?.rows, [0]); // t = c: ∂/∂c = a/(2√(t − c)) is infinite
  assert.equal(d?.usesParameters, true);
});

Deno.test("modelFunctions().notFinite() names the innermost term: the exp that overflows, the division by 0", () => {
  const at = (text: string, x: number[]) => {
    const fns = modelFunctions({
      model: parseModel(text, ["t", "y"]),
      n: 4,
      columns: [Float64Array.from([0, 1, 2, 0])],
      y: new Float64Array(4),
    });
    const r = fns.notFinite(Float64Array.from(x));
    return r === null ? null : { term: r.term, rows: r.rows, uses: r.usesParameters };
  };
  assert.deepEqual(at("y = a*exp(b*t)", [1, 1000]), {
    term: "exp(b * t)",
    rows: [1, 2],
    uses: true,
  });
  // Parameters in order of appearance: b = 2, a = 1, so t − a = 0 at row index 1.
  assert.deepEqual(at("y = b/(t - a)", [2, 1]), { term: "b / (t - a)", rows: [1], uses: true });
  // t·log(t) is 0·(−∞) in the model itself: the model has no limit, its log is named.
  assert.deepEqual(at("y = a*t*log(t)", [1]), { term: "log(t)", rows: [0, 3], uses: false });
  assert.equal(at("y = a*exp(-b*t)", [1, 1]), null);
});
