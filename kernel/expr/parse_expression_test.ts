import assert from "node:assert/strict";
import { ExprError, parseExpression } from "./mod.ts";
import { show } from "./_testing.ts";

// Precedence and associativity of the grammar (DESIGN.md, expression
// language; conventional mathematical precedence: common practice, no source).
const PRECEDENCE: [string, string][] = [
  ["a + b * c", "(+ a (* b c))"],
  ["a * b + c", "(+ (* a b) c)"],
  ["a - b - c", "(- (- a b) c)"],
  ["a / b / c", "(/ (/ a b) c)"],
  ["a / b * c", "(* (/ a b) c)"],
  ["a - b + c", "(+ (- a b) c)"],
  ["a ^ b ^ c", "(^ a (^ b c))"],
  ["-x^2", "(neg (^ x 2))"],
  ["-2^2", "(neg (^ 2 2))"],
  ["2^-1", "(^ 2 -1)"],
  ["2^-x^2", "(^ 2 (neg (^ x 2)))"],
  ["a*-b", "(* a (neg b))"],
  ["-a*b", "(* (neg a) b)"],
  ["a - -b", "(- a (neg b))"],
  ["--x", "(neg (neg x))"],
  ["+x", "x"],
  ["-2", "-2"],
  ["-(2)", "-2"],
  ["(a + b) * c", "(* (+ a b) c)"],
  ["a^b*c", "(* (^ a b) c)"],
  ["a*b^c", "(* a (^ b c))"],
  ["(-x)^2", "(^ (neg x) 2)"],
  ["x^(a+b)", "(^ x (+ a b))"],
  ["pow(x, 2) + min(a, b)", "(+ (pow x 2) (min a b))"],
  ["exp(-b*x)", "(exp (* (neg b) x))"],
  ["1.5e-3 * x", "(* 0.0015 x)"],
  [".5 + 5. + 1E2", "(+ (+ 0.5 5) 100)"],
  ["2 * pi * e", "(* (* 2 pi) e)"],
];

Deno.test("parseExpression() follows the precedence and associativity table", () => {
  for (const [text, tree] of PRECEDENCE) {
    assert.equal(show(parseExpression(text)), tree, text);
  }
});

Deno.test("parseExpression() records spans covering parentheses and signs", () => {
  const e = parseExpression(" (a + b) * -c");
  assert.equal(e.start, 1);
  assert.equal(e.end, 13);
  assert.ok(e.op === "*");
  assert.deepEqual([e.left.start, e.left.end], [1, 8]);
  assert.deepEqual([e.right.start, e.right.end], [11, 13]);
});

// [text, message, offset, length]
const ERRORS: [string, string, number, number][] = [
  ["q0 - a*sqrt(x))", 'Unexpected ")" at column 15', 14, 1],
  ["a + ", "Unexpected end of expression at column 5", 4, 0],
  ["sqr(x)", 'Unknown function "sqr": did you mean "sqrt"?', 0, 3],
  ["a * (b + c", 'Missing ")" to close "(" at column 5', 4, 1],
  ["2 $ x", 'Unexpected character "$" at column 3', 2, 1],
  ["1.2.3 + x", 'Malformed number "1.2.3" at column 1: more than one decimal point', 0, 5],
  ["x * 1e", 'Malformed number "1e" at column 5: the exponent needs digits', 4, 2],
  ["2 * 3e+", 'Malformed number "3e+" at column 5: the exponent needs digits', 4, 3],
  ["pow(x)", 'Function "pow" takes 2 arguments, got 1', 0, 6],
  ["exp(x, y)", 'Function "exp" takes 1 argument, got 2', 0, 9],
  ["min()", 'Function "min" takes 2 arguments, got 0', 0, 5],
  ["2 x", 'Unexpected "x" at column 3: a product needs "*"', 2, 1],
  ["a (b)", 'Unexpected "(" at column 3: a product needs "*"', 2, 1],
  ["a * * b", 'Unexpected "*" at column 5', 4, 1],
  ["a = b", 'Unexpected "=" at column 3', 2, 1],
  [
    "f(x)",
    'Unknown function "f": the functions are ' +
    "exp, log, log10, sqrt, abs, sin, cos, tan, atan, tanh, pow, min, max",
    0,
    1,
  ],
  ["   ", "Empty expression", 3, 0],
  ["(a, b)", 'Unexpected "," at column 3', 2, 1],
];

Deno.test("parseExpression() throws ExprError with message, offset and length", () => {
  for (const [text, message, offset, length] of ERRORS) {
    assert.throws(
      () => parseExpression(text),
      (err: unknown) => {
        assert.ok(err instanceof ExprError, text);
        assert.equal(err.message, message, text);
        assert.equal(err.offset, offset, text);
        assert.equal(err.length, length, text);
        return true;
      },
    );
  }
});

Deno.test("parseExpression() accepts the internal functions of derivatives", () => {
  assert.equal(
    show(parseExpression("sign(x) * ifpos(x - 1, a, b)")),
    "(* (sign x) (ifpos (- x 1) a b))",
  );
});
