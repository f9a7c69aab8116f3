import assert from "node:assert/strict";
import { ExprError, format, parseModel } from "./mod.ts";

const COLUMNS = ["cycle", "capacity", "temp", "conc", "signal", "y", "x"];

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

Deno.test("parseModel() sorts identifiers into columns, parameters and constants", () => {
  const m = parseModel("capacity = q0 - a*cycle^b + 0*pi*temp - a*e", COLUMNS);
  assert.equal(m.text, "capacity = q0 - a*cycle^b + 0*pi*temp - a*e");
  assert.equal(m.responseColumn, "capacity");
  assert.equal(format(m.response), "capacity");
  assert.deepEqual(m.parameters, ["q0", "a", "b"]);
  assert.deepEqual(m.columns, ["cycle", "temp"]);
  assert.deepEqual(m.warnings, []);
  assert.equal(m.rhs.start, 11);
});

Deno.test("parseModel() warns about a parameter one edit away from a column, once", () => {
  const m = parseModel("capacity = q0 - a*sqrt(cylce) + b*cylce", COLUMNS);
  assert.deepEqual(m.parameters, ["q0", "a", "cylce", "b"]);
  assert.deepEqual(m.warnings, [
    { message: '"cylce" is taken as a parameter: did you mean column "cycle"?', offset: 23 },
  ]);
});

Deno.test("parseModel() warns about a differently cased column name", () => {
  const m = parseModel("y = a + b*Temp", COLUMNS);
  assert.deepEqual(m.warnings.map((w) => w.message), [
    '"Temp" is taken as a parameter: did you mean column "temp"?',
  ]);
});

Deno.test("parseModel() does not warn about parameters two edits from a column", () => {
  assert.deepEqual(parseModel("y = a + b*cyc", COLUMNS).warnings, []);
});

Deno.test("parseModel() warns when a constant hides a column of the same name", () => {
  const m = parseModel("y = a*e + e", [...COLUMNS, "e"]);
  assert.deepEqual(m.warnings, [{
    message: '"e" is taken as the constant e, not column "e"',
    offset: 6,
  }]);
  assert.deepEqual(m.columns, []);
});

Deno.test("parseModel() accepts transformed responses", () => {
  const cases: [string, string][] = [
    ["log(y) = a + b*x", "log(y)"],
    ["sqrt(y) = a + b*x", "sqrt(y)"],
    ["1/y = a + b*x", "1 / y"],
    ["y^2 = a + b*x", "y^2"],
    ["log10(conc) = a + b*signal", "log10(conc)"],
    ["-y = a*x", "-y"],
    ["log(y/2) = a*x", "log(y / 2)"],
  ];
  for (const [text, response] of cases) {
    const m = parseModel(text, COLUMNS);
    assert.equal(format(m.response), response, text);
    assert.ok(["y", "conc"].includes(m.responseColumn), text);
  }
});

Deno.test("parseModel() rejects responses that are not one transformed column", () => {
  throwsAt(
    "log(y*k) = a*x",
    'Unknown column "k" in the response: the left side is a column or a transformed column such as log(y)',
    6,
  );
  throwsAt("cylce = a*x", 'Unknown column "cylce" in the response: did you mean "cycle"?', 0);
  throwsAt(
    "y + x = a",
    'Response uses more than one column, "y" and "x": the left side contains exactly one column',
    4,
  );
  throwsAt(
    "2*pi = a*x",
    'Response "2*pi" contains no column: the left side is a column or a transformed column such as log(y)',
    0,
  );
});

Deno.test("parseModel() rejects a missing, repeated or one-sided equals sign", () => {
  throwsAt("q0 - a*sqrt(cycle)", 'Missing "=": a model is written response = expression', 0);
  throwsAt("y = a = b", 'Unexpected "=" at column 7: a model has one "="', 6);
  throwsAt(" = a*x", 'Missing response before "=": a model is written response = expression', 1);
  throwsAt("y =  ", 'Missing expression after "=": a model is written response = expression', 2);
});

Deno.test("parseModel() reports syntax errors with offsets into the whole text", () => {
  throwsAt("capacity = q0 - a*sqr(cycle)", 'Unknown function "sqr": did you mean "sqrt"?', 18);
  throwsAt("log(y = a", 'Unexpected "=" at column 7', 6);
  throwsAt("y = (a + b*x", 'Missing ")" to close "(" at column 5', 4);
  throwsAt("y = a + exp", 'Function "exp" needs its argument in parentheses, as in exp(x)', 8);
  throwsAt("y = a + min", 'Function "min" needs its arguments in parentheses, as in min(x, y)', 8);
});

Deno.test("parseModel() rejects the response column on the right", () => {
  throwsAt("log(y) = a + b*y", 'Column "y" is the response and cannot appear on the right', 15);
});

Deno.test("parseModel() lets a column named like a function be used bare", () => {
  const m = parseModel("y = a + b*max", [...COLUMNS, "max"]);
  assert.deepEqual(m.columns, ["max"]);
  assert.deepEqual(m.parameters, ["a", "b"]);
});

Deno.test("parseModel() allows a right side without parameters", () => {
  const m = parseModel("y = 2*x", COLUMNS);
  assert.deepEqual(m.parameters, []);
  assert.deepEqual(m.columns, ["x"]);
});
