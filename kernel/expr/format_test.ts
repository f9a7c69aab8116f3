import assert from "node:assert/strict";
import { derivative, type Expr, format, parseExpression, simplify } from "./mod.ts";
import { randomExpr, rng, show } from "./_testing.ts";

Deno.test("format() writes the fewest parentheses", () => {
  const cases: [string, string][] = [
    ["((a*b))+(c)", "a * b + c"],
    ["a - (b - c)", "a - (b - c)"],
    ["a - (b + c)", "a - (b + c)"],
    ["(a - b) - c", "a - b - c"],
    ["a / (b * c)", "a / (b * c)"],
    ["(a / b) * c", "a / b * c"],
    ["a^(b^c)", "a^b^c"],
    ["(a^b)^c", "(a^b)^c"],
    ["-(x^2)", "-x^2"],
    ["(-x)^2", "(-x)^2"],
    ["(-2)^x", "(-2)^x"],
    ["2^(-1)", "2^-1"],
    ["-(a*b)", "-(a * b)"],
    ["(-a)*b", "-a * b"],
    ["-(-x)", "- -x"],
    ["--x", "- -x"],
    ["a * (-b)", "a * -b"],
    ["a - (-2)", "a - -2"],
    ["pow(x,2)+min( a ,b )", "pow(x, 2) + min(a, b)"],
    ["1.5e-3*x + 1e21", "0.0015 * x + 1e+21"],
  ];
  for (const [text, expected] of cases) assert.equal(format(parseExpression(text)), expected, text);
});

Deno.test("format() writes special numbers so they parse back", () => {
  const at = { start: 0, end: 0 };
  const n = (value: number): Expr => ({ op: "num", value, ...at });
  assert.equal(format(n(Infinity)), "1e999");
  assert.equal(format(n(-Infinity)), "-1e999");
  assert.equal(format(n(-0)), "-0");
  assert.equal(format(n(5e-7)), "5e-7");
  assert.ok(Number.isNaN((parseExpression(format(n(NaN))) as { value?: number }).value ?? NaN));
  for (const v of [Infinity, -Infinity, -0, 5e-7, 1e21, 0.1, 123456789.125]) {
    assert.equal(show(parseExpression(format(n(v)))), show(n(v)), String(v));
  }
});

Deno.test("format() round-trips random, simplified and differentiated trees", () => {
  // Round trip: parseExpression(format(e)) is e again, spans aside.
  const next = rng(3);
  for (let i = 0; i < 3000; i++) {
    const e = randomExpr(next, ["x", "y", "a"], 6);
    for (const t of [e, simplify(e), derivative(e, "x")]) {
      assert.equal(show(parseExpression(format(t))), show(t), format(t));
    }
  }
});
