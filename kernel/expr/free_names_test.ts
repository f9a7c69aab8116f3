import assert from "node:assert/strict";
import { derivative, freeNames, parseExpression } from "./mod.ts";

Deno.test("freeNames() lists identifiers in order, without constants or functions", () => {
  const names = freeNames(parseExpression("b*exp(-a*x) + pi*e + max(b, y)"));
  assert.deepEqual([...names], ["b", "a", "x", "y"]);
});

Deno.test("freeNames() of a number or a pure constant is empty", () => {
  assert.equal(freeNames(parseExpression("2*pi + e^2")).size, 0);
  assert.equal(freeNames(derivative(parseExpression("a*x"), "x")).has("x"), false);
});
