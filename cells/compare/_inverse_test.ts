import assert from "node:assert/strict";
import { compileScalar, parseExpression } from "../../kernel/expr/mod.ts";
import { inverseOf } from "./_inverse.ts";

Deno.test("inverseOf() undoes one-to-one transforms of the response column", () => {
  const cases = [
    "log(y)",
    "log10(y)",
    "sqrt(y)",
    "1/y",
    "2*y + 1",
    "-y/3",
    "y^3",
    "exp(y)",
    "10^y",
    "1/sqrt(y) - 2",
    "tanh(y/4)",
  ];
  for (const text of cases) {
    const g = parseExpression(text);
    const inv = inverseOf(g, "y");
    assert.ok(inv !== null, text);
    const forward = compileScalar(g, ["y"]);
    for (const y of [0.3, 1.7, 4.2]) {
      const back = inv(forward([y]));
      assert.ok(Math.abs(back - y) < 1e-14 * 8, `${text} at ${y}: ${back}`);
    }
  }
});

Deno.test("inverseOf() refuses transforms that are not one-to-one step by step", () => {
  for (const text of ["y + y^2", "abs(y)", "sin(y)", "max(y, 1)", "y*y"]) {
    assert.equal(inverseOf(parseExpression(text), "y"), null, text);
  }
});
