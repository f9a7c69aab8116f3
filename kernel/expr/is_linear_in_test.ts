import assert from "node:assert/strict";
import { isLinearIn, parseModel } from "./mod.ts";

const COLUMNS = ["x", "z", "y", "cycle"];

function linear(text: string): boolean {
  const m = parseModel(text, COLUMNS);
  return isLinearIn(m.rhs, m.parameters);
}

Deno.test("isLinearIn() accepts models linear in their parameters", () => {
  // Linear in the parameters: each term is a column function times one
  // parameter (the definition of a linear model): common practice, no source.
  for (
    const text of [
      "y = a + b*x",
      "y = a + b*x + c*x^2 + d*x^3",
      "y = a + b*log(x)",
      "log(y) = a + b*x + c*z",
      "y = q0 - a*sqrt(cycle)",
      "y = a*exp(-x) + b*sin(2*pi*x)",
      "y = (a + b)*x",
      "y = a/3 - b*x/z",
      "y = 2*x",
    ]
  ) {
    assert.equal(linear(text), true, text);
  }
});

Deno.test("isLinearIn() rejects models nonlinear in a parameter", () => {
  for (
    const text of [
      "y = a*exp(-b*x)",
      "y = q0 - a*cycle^b",
      "y = a*b*x",
      "y = a^2*x",
      "y = x^p",
      "y = a/(1 + b*x)",
      "y = log(a*x)",
      "y = abs(a)*x",
      "y = max(a, x)",
      "y = sin(w*x)",
    ]
  ) {
    assert.equal(linear(text), false, text);
  }
});

Deno.test("isLinearIn() counts only the listed names as parameters", () => {
  const m = parseModel("y = a*exp(-b*x)", COLUMNS);
  // With b held fixed the model is linear in a alone.
  assert.equal(isLinearIn(m.rhs, ["a"]), true);
  assert.equal(isLinearIn(m.rhs, ["b"]), false);
});
