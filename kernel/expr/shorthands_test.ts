import assert from "node:assert/strict";
import { ExprError, format, parseExpression, parseModel } from "./mod.ts";

// Expected expansions follow the shorthand rules documented in _shorthands.ts
// and mod.ts (our own syntax; common practice, no source).
const COLUMNS = ["x", "y", "z", "x1", "x2", "x3", "b0"];

function throwsAt(text: string, message: string, offset: number, columns = COLUMNS) {
  assert.throws(
    () => parseModel(text, columns),
    (err: unknown) => {
      assert.ok(err instanceof ExprError, text);
      assert.equal(err.message, message, text);
      assert.equal(err.offset, offset, text);
      return true;
    },
  );
}

Deno.test("parseModel() expands polynomial(x, 3) into b0 + b1*x + b2*x^2 + b3*x^3", () => {
  const m = parseModel("y = polynomial(x, 3)", ["x", "y"]);
  assert.equal(format(m.rhs), "b0 + b1 * x + b2 * x^2 + b3 * x^3");
  assert.deepEqual(m.parameters, ["b0", "b1", "b2", "b3"]);
  assert.deepEqual(m.columns, ["x"]);
  assert.equal(m.text, "y = polynomial(x, 3)");
  assert.deepEqual(m.warnings, []);
});

Deno.test("parseModel() expands polynomial of degree 0 and 1 without powers", () => {
  assert.equal(format(parseModel("y = polynomial(x, 0)", ["x", "y"]).rhs), "b0");
  assert.equal(format(parseModel("y = polynomial(x, 1)", ["x", "y"]).rhs), "b0 + b1 * x");
});

Deno.test("parseModel() expands linear(x1, x2, x3) with an intercept and b_column names", () => {
  const m = parseModel("y = linear(x1, x2, x3)", ["x1", "x2", "x3", "y"]);
  assert.equal(format(m.rhs), "b0 + b_x1 * x1 + b_x2 * x2 + b_x3 * x3");
  assert.deepEqual(m.parameters, ["b0", "b_x1", "b_x2", "b_x3"]);
});

Deno.test("parseModel() lets a shorthand be one operand of a larger model", () => {
  const m = parseModel("y = polynomial(x, 2) + c*exp(-k*x)", ["x", "y"]);
  assert.equal(format(m.rhs), "b0 + b1 * x + b2 * x^2 + c * exp(-k * x)");
  assert.deepEqual(m.parameters, ["b0", "b1", "b2", "c", "k"]);
});

Deno.test("parseModel() moves a shorthand to the next free letter when a name clashes", () => {
  // "b1" is written elsewhere in the model
  const m = parseModel("y = polynomial(x, 1) + b1*z", ["x", "y", "z"]);
  assert.deepEqual(m.parameters, ["c0", "c1", "b1"]);
  // "b0" is a column
  assert.deepEqual(parseModel("y = linear(x1)", COLUMNS).parameters, ["c0", "c_x1"]);
  // a second shorthand takes the next letter after the first
  const two = parseModel("y = polynomial(x, 1) + polynomial(z, 1)", ["x", "y", "z"]);
  assert.deepEqual(two.parameters, ["b0", "b1", "c0", "c1"]);
  // only whole names clash: a parameter "c" does not move "c0"
  const three = parseModel("y = polynomial(x, 1) + polynomial(z, 1) + c", ["x", "y", "z"]);
  assert.deepEqual(three.parameters, ["b0", "b1", "c0", "c1", "c"]);
});

Deno.test("parseModel() does not warn that generated names look like columns", () => {
  const m = parseModel("y = polynomial(x, 1)", ["x", "y", "c0"]);
  assert.deepEqual(m.warnings, []);
});

Deno.test("parseModel() rejects a degree that is not a whole-number literal, at the degree", () => {
  const tail = "is not a whole number from 0 to 30: write it as a number, as in polynomial(x, 3)";
  throwsAt("y = polynomial(x, 2.5)", `Degree "2.5" of polynomial() ${tail}`, 18);
  throwsAt("y = polynomial(x, -1)", `Degree "-1" of polynomial() ${tail}`, 18);
  throwsAt("y = polynomial(x, k)", `Degree "k" of polynomial() ${tail}`, 18);
  throwsAt("y = polynomial(x, 31)", `Degree "31" of polynomial() ${tail}`, 18);
});

Deno.test("parseModel() rejects shorthand arguments that are not columns, with did-you-mean", () => {
  throwsAt("y = polynomial(xx, 2)", 'Unknown column "xx" in polynomial(): did you mean "x"?', 15);
  throwsAt(
    "y = linear(x1, 2*x2)",
    "Argument 2 of linear() is not a column: linear() takes column names",
    15,
  );
  throwsAt("y = linear(x1, x1)", 'Column "x1" appears twice in linear()', 15);
  throwsAt(
    "y = polynomial(x)",
    'Shorthand "polynomial" takes 2 arguments, a column and a degree, got 1',
    4,
  );
  throwsAt("y = linear()", 'Shorthand "linear" needs at least one column, as in linear(x1, x2)', 4);
  throwsAt("y = polynomail(x, 2)", 'Unknown function "polynomail": did you mean "polynomial"?', 4);
});

Deno.test("parseModel() refuses a shorthand in the response and parseExpression() everywhere", () => {
  throwsAt(
    "polynomial(y, 1) = x",
    'Shorthand "polynomial" may be used only on the right side of a model',
    0,
  );
  assert.throws(
    () => parseExpression("linear(x)"),
    (e) =>
      e instanceof ExprError &&
      e.message === 'Shorthand "linear" may be used only on the right side of a model',
  );
});

Deno.test("parseModel() rejects the response column inside a shorthand", () => {
  throwsAt("y = linear(x1, y)", 'Column "y" is the response and cannot appear on the right', 15);
});
