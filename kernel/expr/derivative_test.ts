import assert from "node:assert/strict";
import {
  compile,
  compileDD,
  compileScalar,
  derivative,
  format,
  freeNames,
  parseExpression,
} from "./mod.ts";
import { close, evaluate, rng } from "./_testing.ts";

// Expressions and the box each variable is drawn from (chosen so every
// expression is smooth and defined there).
const RANGES = {
  pos: [0.2, 3],
  any: [-2, 2],
  small: [0.1, 1],
};
type Box = keyof typeof RANGES;

const CASES: [string, Record<string, Box>][] = [
  ["q0 - a*sqrt(cycle)", { q0: "any", a: "any", cycle: "pos" }],
  ["q0 - a*cycle^b", { q0: "any", a: "any", b: "any", cycle: "pos" }],
  ["a*exp(-b*x)", { a: "any", b: "any", x: "any" }],
  ["a + b*log(x)", { a: "any", b: "any", x: "pos" }],
  ["a*x^2 + b*x + c", { a: "any", b: "any", c: "any", x: "any" }],
  ["a/(1 + exp(-(x - x0)/s))", { a: "any", x: "any", x0: "any", s: "pos" }],
  ["abs(a*x - 1)", { a: "any", x: "any" }],
  ["max(a, x) + min(a*x, 1)", { a: "any", x: "any" }],
  ["log10(a*x)", { a: "pos", x: "pos" }],
  ["tan(a*x)", { a: "small", x: "small" }],
  ["atan(x/a)", { a: "pos", x: "any" }],
  ["tanh(a*x + b)", { a: "any", b: "any", x: "any" }],
  ["x^x", { x: "pos" }],
  ["pow(k, a)", { k: "pos", a: "any" }],
  ["e^(k*t)", { k: "any", t: "any" }],
  ["sin(w*t + p)*cos(w*t)", { w: "any", t: "any", p: "any" }],
  ["a/(x + b)^2", { a: "any", x: "pos", b: "pos" }],
  ["sqrt(a^2 + x^2)", { a: "pos", x: "any" }],
  ["-x^-a", { x: "pos", a: "any" }],
  ["log(a)*x/(1 + b*x)", { a: "pos", b: "pos", x: "pos" }],
  ["exp(-(x - m)^2/(2*s^2))/(s*sqrt(2*pi))", { x: "any", m: "any", s: "pos" }],
  ["10^(a - b*x) + pow(x, b)", { a: "small", b: "small", x: "pos" }],
  ["exp(-k*t^n)", { k: "pos", t: "pos", n: "pos" }],
  ["(t/l)^k + sqrt(a*t)", { t: "pos", l: "pos", k: "pos", a: "pos" }],
  ["exp(-b/t) + exp(n*log(t))", { b: "pos", t: "pos", n: "small" }],
];

Deno.test("derivative() agrees with central finite differences at random points", () => {
  // Central difference f'(v) ≈ (f(v+h) - f(v-h)) / 2h, truncation error O(h²):
  // common practice, no source. With h = 1e-5·max(1,|v|) the error is near
  // 1e-10 relative; the check allows 1e-6 relative (about 6 digits).
  const next = rng(20240611);
  for (const [text, boxes] of CASES) {
    const e = parseExpression(text);
    const names = [...freeNames(e)];
    assert.deepEqual(names.toSorted(), Object.keys(boxes).toSorted(), text);
    for (const name of names) {
      const d = derivative(e, name);
      for (let trial = 0; trial < 25; trial++) {
        const env: Record<string, number> = {};
        for (const n of names) {
          const [lo, hi] = RANGES[boxes[n]];
          env[n] = lo + (hi - lo) * next();
        }
        const h = 1e-5 * Math.max(1, Math.abs(env[name]));
        const up = evaluate(e, { ...env, [name]: env[name] + h });
        const down = evaluate(e, { ...env, [name]: env[name] - h });
        const fd = (up - down) / (2 * h);
        const exact = evaluate(d, env);
        assert.ok(
          close(exact, fd, 1e-6, 1e-8),
          `d/d${name} ${text} = ${format(d)}: ${exact} vs ${fd} at ${JSON.stringify(env)}`,
        );
      }
    }
  }
});

Deno.test("derivative() gives readable simplified forms", () => {
  const cases: [string, string, string][] = [
    ["q0 - a*sqrt(cycle)", "a", "-sqrt(cycle)"],
    ["q0 - a*sqrt(cycle)", "q0", "1"],
    ["q0 - a*cycle^b", "a", "-cycle^b"],
    ["q0 - a*cycle^b", "b", "-a * powlog(cycle, b)"],
    ["a*exp(-b*x)", "a", "exp(-b * x)"],
    ["a*exp(-b*x)", "b", "-a * exp(-b * x) * x"],
    ["a*x^2 + b*x + c", "x", "2 * a * x + b"],
    ["a + b*log(x)", "b", "log(x)"],
    ["e^(k*t)", "k", "e^(k * t) * t"],
    ["x^x", "x", "powlog(x, x) + x * x^(x - 1)"],
    ["1/x", "x", "-1 / x^2"],
    ["sqrt(x)", "x", "1 / (2 * sqrt(x))"],
    ["cos(w*t)", "w", "-sin(w * t) * t"],
    ["q0 - a*cycle^b", "temp", "0"],
  ];
  for (const [text, name, expected] of cases) {
    assert.equal(format(derivative(parseExpression(text), name)), expected, `d/d${name} ${text}`);
  }
});

Deno.test("derivative() writes abs, min and max with sign and ifpos", () => {
  const d = (text: string, name: string) => format(derivative(parseExpression(text), name));
  assert.equal(d("abs(a*x)", "a"), "sign(a * x) * x");
  assert.equal(d("max(a, x)", "a"), "ifpos(a - x, 1, 0)");
  assert.equal(d("min(a*x, 1)", "a"), "ifpos(a * x - 1, 0, x)");
  assert.equal(d("sign(a)", "a"), "0");
  // At a tie, max takes the second argument's slope and min the first's.
  const env = { a: 1, x: 1 };
  assert.equal(evaluate(derivative(parseExpression("max(a, x)"), "a"), env), 0);
  assert.equal(evaluate(derivative(parseExpression("min(a, x)"), "a"), env), 1);
});

Deno.test("derivative() treats pi and e as constants", () => {
  assert.equal(format(derivative(parseExpression("pi*e*x"), "e")), "0");
  assert.equal(format(derivative(parseExpression("pi*e*x"), "x")), "pi * e");
});

Deno.test("derivative() takes the limits at a predictor's zero where the textbook form is 0·∞", () => {
  // Each value at t = 0 is the limit of the derivative as t → 0⁺, by the limit rule named beside
  // it; all four compilers (tree walk, compile, compileScalar, compileDD) must give it.
  const cases: [string, string, Record<string, number>, number, string][] = [
    // −k·e^(−k tⁿ)·tⁿ ln t → 0: tⁿ ln t → 0 for n > 0 (L'Hôpital on ln t / t^(−n): −tⁿ/n → 0).
    ["exp(-k*t^n)", "n", { k: 0.7, n: 1.5 }, 0, "t^n ln t → 0"],
    ["exp(-k*t^n)", "n", { k: 0.7, n: 0.5 }, 0, "t^n ln t → 0"],
    // −tⁿ·e^(−k tⁿ) = 0 at t = 0 exactly (0ⁿ = 0 for n > 0).
    ["exp(-k*t^n)", "k", { k: 0.7, n: 0.5 }, 0, "0^n = 0"],
    // (t/l)^k is 0 for every l at t = 0, so its l-derivative is exactly 0 even for k < 1
    // (where the chain rule's (t/l)^(k−1) is infinite).
    ["(t/l)^k", "l", { l: 2, k: 0.5 }, 0, "identically 0 in l"],
    ["(t/l)^k", "k", { l: 2, k: 0.5 }, 0, "u^k ln u → 0"],
    // sqrt(a·t) is 0 for every a at t = 0: derivative exactly 0.
    ["sqrt(a*t)", "a", { a: 3 }, 0, "identically 0 in a"],
    // e^(−b/t)/t → 0 (s = 1/t: s·e^(−bs) → 0 as s → ∞), and e^(n ln t)·ln t = tⁿ ln t → 0.
    ["exp(-b/t)", "b", { b: 2 }, 0, "e^(−b/t)/t → 0"],
    ["exp(n*log(t))", "n", { n: 0.5 }, 0, "t^n ln t → 0"],
  ];
  for (const [text, name, env, limit, rule] of cases) {
    const e = parseExpression(text);
    const d = derivative(e, name);
    const names = [...Object.keys(env)];
    const all = { ...env, t: 0 };
    const what = `d/d${name} ${text} at t = 0 (${rule}): ${format(d)}`;
    // === rather than Object.is: the sign of a zero derivative does not matter.
    const v = evaluate(d, all);
    assert.ok(v === limit, `${what}: ${v}`);
    const c = compile(d, ["t"], names)([[0]], names.map((k) => env[k]), 1)[0];
    assert.ok(c === limit, `${what} (compile): ${c}`);
    const sc = compileScalar(d, ["t", ...names])([0, ...names.map((k) => env[k])]);
    assert.ok(sc === limit, `${what} (compileScalar): ${sc}`);
    const dd = compileDD(d, ["t"], names)([[0]], [null], names.map((k) => env[k]), null, 1);
    assert.ok(dd.hi[0] + dd.lo[0] === limit, `${what} (compileDD): ${dd.hi[0]}`);
  }
});

Deno.test("derivative() keeps NaN and infinity where the derivative truly is not finite", () => {
  // ∂/∂n tⁿ at t = 0 for n ≤ 0 has no finite limit (tⁿ ln t → −∞), and ∂/∂a sqrt(a) at a = 0
  // is infinite (1/(2√a)): the limits above are taken only where they exist.
  const at = (text: string, name: string, env: Record<string, number>) =>
    evaluate(derivative(parseExpression(text), name), env);
  assert.equal(at("t^n", "n", { t: 0, n: -0.5 }), -Infinity);
  assert.equal(at("t^n", "n", { t: 0, n: 0 }), -Infinity);
  assert.equal(at("sqrt(a)", "a", { a: 0 }), Infinity);
  assert.ok(Number.isNaN(at("t^n", "n", { t: -1, n: 0.5 })));
});
