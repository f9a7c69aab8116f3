import assert from "node:assert/strict";
import { compile, derivative, parseModel } from "../expr/mod.ts";
import { compiledModel } from "./_compiled_model.ts";

Deno.test("compiledModel() keeps one entry per model text, columns and parameters", () => {
  const a = compiledModel(parseModel("y = a*exp(-b*x) + c", ["x", "y"]));
  assert.equal(compiledModel(parseModel("y = a*exp(-b*x) + c", ["x", "y"])), a);
  // The same text with "c" a column of the table is another model (c is no parameter).
  const other = compiledModel(parseModel("y = a*exp(-b*x) + c", ["x", "y", "c"]));
  assert.notEqual(other, a);
  assert.deepEqual(other.linear, [0]);
  // a and c enter linearly, b does not (∂f/∂b = −a·x·e^(−bx) contains b).
  assert.deepEqual(a.linear, [0, 2]);
});

Deno.test("compiledModel() drops the least recently used of more than 64 models", () => {
  const first = compiledModel(parseModel("y = a*x + b*x^2.5", ["x", "y"]));
  for (let k = 0; k < 64; k++) compiledModel(parseModel(`y = a*exp(-b*x) + ${k}`, ["x", "y"]));
  assert.notEqual(compiledModel(parseModel("y = a*x + b*x^2.5", ["x", "y"])), first);
});

Deno.test("compiledModel().jac() writes each derivative's column as compile() does", () => {
  // The same operations on the same inputs: identical doubles (exact arithmetic).
  const model = parseModel("y = a*exp(-b*x) + c*sin(b*x)", ["x", "y"]);
  const cm = compiledModel(model);
  const x = Float64Array.from({ length: 7 }, (_, i) => i / 3), theta = [1.5, 0.7, -0.3];
  const J = cm.jac([x], theta, 7);
  model.parameters.forEach((k, j) => {
    const col = compile(derivative(model.rhs, k), model.columns, model.parameters)([x], theta, 7);
    assert.deepEqual(J.subarray(j * 7, j * 7 + 7), col);
  });
});
