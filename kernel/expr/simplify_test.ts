import assert from "node:assert/strict";
import { format, parseExpression, simplify } from "./mod.ts";
import { close, evaluate, evaluateDefined, randomExpr, rng, show } from "./_testing.ts";

const s = (text: string) => format(simplify(parseExpression(text)));

Deno.test("simplify() applies the 0 and 1 identities", () => {
  // Algebraic identities: common practice, no source.
  const cases: [string, string][] = [
    ["x + 0", "x"],
    ["0 + x", "x"],
    ["x - 0", "x"],
    ["0 - x", "-x"],
    ["x * 1", "x"],
    ["1 * x", "x"],
    ["x * 0", "0"],
    ["0 / x", "0"],
    ["x / 1", "x"],
    ["x / -1", "-x"],
    ["-1 * x", "-x"],
    ["x^1", "x"],
    ["x^0", "1"],
    ["1^x", "1"],
    ["x - x", "0"],
    ["a*sqrt(t) - a*sqrt(t)", "0"],
    ["x / x", "1"],
    ["x + x", "2 * x"],
    ["x * x", "x^2"],
    ["0 + 1*x^1 - (y - y)", "x"],
  ];
  for (const [text, expected] of cases) assert.equal(s(text), expected, text);
});

Deno.test("simplify() folds short finite constants and keeps the rest symbolic", () => {
  const cases: [string, string][] = [
    ["2 * 3 + 1", "7"],
    ["2^10", "1024"],
    ["1/4", "0.25"],
    ["1/3", "1 / 3"],
    ["sqrt(4) + log(1) + exp(0)", "3"],
    ["log(2)", "log(2)"],
    ["2^0.5", "2^0.5"],
    ["exp(1000)", "exp(1000)"],
    ["1/0", "1 / 0"],
    ["-(2)", "-2"],
    ["max(2, -3) * abs(-4)", "8"],
  ];
  for (const [text, expected] of cases) assert.equal(s(text), expected, text);
});

Deno.test("simplify() gathers signs and numeric factors", () => {
  const cases: [string, string][] = [
    ["--x", "x"],
    ["-(a - b)", "b - a"],
    ["a + -b", "a - b"],
    ["-a + b", "b - a"],
    ["a - -b", "a + b"],
    ["a - -2", "a + 2"],
    ["a + -2", "a - 2"],
    ["a*-b", "-a * b"],
    ["-a*-b", "a * b"],
    ["-(2*x)", "-2 * x"],
    ["x*3", "3 * x"],
    ["2*x*3", "6 * x"],
    ["a*(2*x)", "2 * a * x"],
    ["a*(b*c)", "a * b * c"],
    ["a / -b", "-a / b"],
    ["abs(-x)", "abs(x)"],
    ["ifpos(1, a, b) + ifpos(-1, a, b)", "a + b"],
    ["ifpos(x, a, a)", "a"],
  ];
  for (const [text, expected] of cases) assert.equal(s(text), expected, text);
});

Deno.test("simplify() is idempotent on random expressions", () => {
  const next = rng(7);
  for (let i = 0; i < 2000; i++) {
    const once = simplify(randomExpr(next, ["x", "y", "a"], 5));
    assert.equal(show(simplify(once)), show(once));
  }
});

Deno.test("simplify() keeps the value wherever the expression is defined", () => {
  const next = rng(11);
  let compared = 0;
  for (let i = 0; i < 2000; i++) {
    const e = randomExpr(next, ["x", "y", "a"], 5);
    const t = simplify(e);
    for (let k = 0; k < 5; k++) {
      const env = { x: 6 * next() - 3, y: 6 * next() - 3, a: 6 * next() - 3 };
      const v = evaluateDefined(e, env);
      if (!Number.isFinite(v)) continue;
      compared++;
      // Regrouped products round differently; differences then cancel in
      // sums, so the bound is relative to the largest operand scale seen.
      const w = evaluate(t, env);
      assert.ok(
        close(v, w, 1e-9, 1e-9 * Math.max(1, Math.abs(v))),
        `${format(e)} -> ${format(t)}: ${v} vs ${w}`,
      );
    }
  }
  assert.ok(compared > 3000, `only ${compared} finite comparisons`);
});
