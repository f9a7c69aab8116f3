import assert from "node:assert/strict";
import { compare, fitOf, makeTable, wiggle } from "./_fixtures_test.ts";
import { criteriaOf } from "./criteria.ts";

const N = 30;
const x = Float64Array.from({ length: N }, (_, i) => i + 1);

Deno.test("compare: with n = 30 the BIC penalty of 4 over 2 parameters differs by 2 ln 30 ≈ 6.80", () => {
  // 2 ln 30 = 6.802394763324311 and BIC = k ln n − 2 log L: common practice, no source.
  const noise = wiggle(N, 0.4);
  const y = x.map((v, i) => 1 + 0.3 * v - 0.01 * v * v + noise[i]);
  const table = makeTable({ x, y });
  const { result } = compare({
    line: fitOf("line", "y = a + b*x", table),
    cubic: fitOf("cubic", "y = polynomial(x, 3)", table),
  }, { by: "bic" });
  const [line, cubic] = result.rows;
  assert.equal(line.k - cubic.k, -2, "k = p + 1: 3 and 5");
  const penalty = (r: typeof line) => r.bic! + 2 * r.log_likelihood!;
  const gap = penalty(cubic) - penalty(line);
  assert.ok(Math.abs(gap - 2 * Math.log(30)) < 1e-12, `${gap}`);
  assert.equal(gap.toFixed(2), "6.80");
  // AIC charges 2 per parameter whatever n: the gap is 4 (common practice, no source).
  assert.ok(
    Math.abs(cubic.aic! + 2 * cubic.log_likelihood! - line.aic! - 2 * line.log_likelihood! - 4) <
      1e-12,
  );
});

Deno.test("compare: one more parameter lowers BIC only when log L rises by more than ln(n)/2", () => {
  // DESIGN.md §5; common practice, no source: ΔBIC = ln n − 2 Δlog L for one more parameter.
  const half = Math.log(N) / 2;
  const noise = wiggle(N, 0.5);
  const cases = [
    { curvature: 0.05, lowers: true },
    { curvature: 0, lowers: false },
  ];
  for (const c of cases) {
    const y = x.map((v, i) => 2 + 0.5 * v + c.curvature * v * v + noise[i]);
    const table = makeTable({ x, y });
    const { result } = compare({
      line: fitOf("line", "y = a + b*x", table),
      quad: fitOf("quad", "y = polynomial(x, 2)", table),
    }, { by: "bic" });
    const [line, quad] = result.rows;
    const rise = quad.log_likelihood! - line.log_likelihood!;
    const lower = quad.bic! < line.bic!;
    assert.equal(lower, c.lowers, `curvature ${c.curvature}: rise ${rise}`);
    assert.equal(lower, rise > half, `rise ${rise} against ln(30)/2 = ${half}`);
    assert.ok(Math.abs(quad.bic! - line.bic! - (Math.log(N) - 2 * rise)) < 1e-9);
    assert.equal(result.preferred, c.lowers ? "quad" : "line");
  }
});

Deno.test("criteriaOf() leaves AICc undefined when n − k − 1 ≤ 0 and everything null without log L", () => {
  // AICc = AIC + 2k(k+1)/(n−k−1) (Burnham & Anderson 2002, §2.4).
  assert.deepEqual(criteriaOf(-1, 3, 4), { aic: 8, aicc: null, bic: 3 * Math.log(4) + 2 });
  assert.deepEqual(criteriaOf(null, 3, 10), { aic: null, aicc: null, bic: null });
  assert.equal(criteriaOf(-1, 2, 10).aicc, 6 + 12 / 7);
});
