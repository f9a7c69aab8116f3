import assert from "node:assert/strict";
import { fitResult, makeTable, parseContext, runContext } from "./_fixtures_test.ts";
import { fitKind } from "./mod.ts";
import type { Fit } from "./fit.ts";
import { fitLeverage } from "./fit_leverage.ts";
import { exactPolynomial, RESPONSES, YEARS } from "./_raw_years_test.ts";

function fitOf(cols: Record<string, ArrayLike<number>>, model: string, extra = {}): Fit {
  const spec = fitKind.parse(parseContext("f", { on: "data", model, ...extra }));
  return fitKind.run(spec, runContext("f", "data", makeTable(cols))) as Fit;
}

for (const degree of [3, 5]) {
  Deno.test(`fitLeverage() keeps 13 digits on a degree-${degree} polynomial in raw calendar years`, () => {
    // Exact rational arithmetic (BigInt fractions, _raw_years_test.ts): hᵢ = xᵢᵀ(XᵀX)⁻¹xᵢ.
    // Through the columns of Q (before) the worst hᵢ was 1.7e−10 (degree 3) and 1.8e−7 (degree 5)
    // relative off; through the double-double factor it is exact to the double's rounding.
    const exact = exactPolynomial(degree).leverage();
    const h = fitLeverage(fitOf({ x: YEARS, y: RESPONSES }, `y = polynomial(x, ${degree})`));
    const worst = Math.max(...exact.map((v, i) => Math.abs(h[i] - v) / v));
    assert.ok(worst <= 1e-13, `degree ${degree}: worst relative error ${worst.toExponential(2)}`);
  });
}

Deno.test("fitLeverage() of a weighted line is wᵢ(1/Σw + (xᵢ − x̄_w)²/Σw(x − x̄_w)²)", () => {
  // Weighted hat values: the leverage of row i in √W·X (Cook & Weisberg 1982, §2.3; from memory),
  // for a straight line the weighted form of 1/n + (xᵢ − x̄)²/Sxx (hand formula).
  const x = [1, 2, 3, 5, 8, 13], w = [1, 0.5, 2, 1, 0.25, 4];
  const y = x.map((v, i) => 3 + 0.7 * v + 0.1 * Math.cos(i));
  const h = fitLeverage(fitOf({ x, y, w }, "y = a + b*x", { weights: "w" }));
  const sw = w.reduce((a, b) => a + b), xm = x.reduce((a, v, i) => a + w[i] * v, 0) / sw;
  const sxx = x.reduce((a, v, i) => a + w[i] * (v - xm) ** 2, 0);
  x.forEach((v, i) => {
    const want = w[i] * (1 / sw + (v - xm) ** 2 / sxx);
    assert.ok(Math.abs(h[i] - want) < 1e-14, `row ${i}: ${h[i]} vs ${want}`);
  });
});

Deno.test("fitLeverage() of a nonlinear fit leaves out a parameter held at its bound", () => {
  // Σhᵢ is the rank of the (free) Jacobian (Belsley, Kuh & Welsch 1980, §2.1): with c held at
  // its lower limit, two free parameters, Σh = 2.
  const x = [0, 1, 2, 3, 4, 5, 6, 7];
  const y = x.map((v, i) => 5 * Math.exp(-0.4 * v) + 0.02 * Math.sin(3 * i));
  const fit = fitOf({ x, y }, "y = a*exp(-k*x) + c", {
    start: { a: 4, k: 0.3, c: 0.5 },
    within: { c: [0.5, null] },
  });
  assert.deepEqual(fit.atBound, [false, false, true]);
  const h = fitLeverage(fit);
  assert.ok(Math.abs(h.reduce((a, b) => a + b) - 2) < 1e-12, `Σh = ${h.reduce((a, b) => a + b)}`);
  const free = fitOf({ x, y }, "y = a*exp(-k*x) + 0.5", { start: { a: 4, k: 0.3 } });
  fitLeverage(free).forEach((v, i) => assert.ok(Math.abs(v - h[i]) < 1e-9, `row ${i}`));
});

Deno.test("fitResult() of the raw-years fit gives its standard errors to 12 digits", () => {
  // Exact rational arithmetic (_raw_years_test.ts): √(s²·(XᵀX)⁻¹_jj).
  const exact = exactPolynomial(5);
  const { result } = fitResult("f", "y = polynomial(x, 5)", makeTable({ x: YEARS, y: RESPONSES }));
  result.parameters.forEach((p: { std_error: number | null }, j: number) => {
    const err = Math.abs(p.std_error! - exact.stdErrors[j]) / exact.stdErrors[j];
    assert.ok(err <= 1e-12, `b${j}: ${err}`);
  });
});
