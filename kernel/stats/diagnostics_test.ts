import assert from "node:assert/strict";
import { durbinWatson, durbinWatsonTest } from "./durbin_watson.ts";
import { jarqueBera } from "./jarque_bera.ts";
import { signRuns } from "./sign_runs.ts";
import { lackOfFit } from "./lack_of_fit.ts";
import { varianceInflation } from "./variance_inflation.ts";
import { conditionNumber } from "./condition_number.ts";
import { breuschPagan } from "./breusch_pagan.ts";
import { ramseyReset } from "./ramsey_reset.ts";
import { robustCovarianceOfFactor } from "./robust_covariance.ts";
import { factorOfQR, householderQR, inverseGramForms } from "../linalg/mod.ts";

const f = (...v: number[]) => new Float64Array(v);

Deno.test("durbinWatsonTest() moments equal the Durbin & Watson (1950) mean for a mean-only model", () => {
  // Mean-only model: E d = 2 exactly... hand computation tr(MA) = tr(A) − 1ᵀA1/n = 2(n − 1), so
  // E d = 2(n − 1)/(n − 1) = 2.
  const e = f(0.5, -0.2, 0.1, 0.3, -0.9, 0.2);
  const t = durbinWatsonTest(e, [new Float64Array(6).fill(1)], null)!;
  assert.ok(Math.abs(t.expected - 2) < 1e-14);
  assert.equal(t.statistic, durbinWatson(e));
  assert.equal(durbinWatson(f(0, 0)), null);
});

Deno.test("jarqueBera() uses biased moments and K, not the excess", () => {
  // x = (0, 0, 0, 3): m2 = 27/16, m3 = (3·(−3/4)³ + (9/4)³)/4, hand computation.
  const jb = jarqueBera([0, 0, 0, 3])!;
  const m2 = 27 / 16, m3 = (3 * (-0.75) ** 3 + 2.25 ** 3) / 4, m4 = (3 * 0.75 ** 4 + 2.25 ** 4) / 4;
  assert.ok(Math.abs(jb.skewness - m3 / m2 ** 1.5) < 1e-14);
  assert.ok(Math.abs(jb.kurtosis - m4 / m2 ** 2) < 1e-14);
  assert.equal(jarqueBera([1, 1, 1]), null);
});

Deno.test("signRuns() counts runs in the given order and drops zeros", () => {
  const t = signRuns(f(1, -1, 0, 2, 3), [4, 3, 2, 1, 0])!;
  // Order 3, 2, 0, −1, 1 → + + (0) − + : 3 runs, n₁ = 3, n₂ = 1.
  assert.equal(t.runs, 3);
  assert.equal(t.positive, 3);
  assert.equal(signRuns(f(1, 2, 3)), null);
});

Deno.test("lackOfFit() follows the pure-error partition and needs replicates", () => {
  // Draper & Smith §2.1 formula, by hand: groups {1, 1}, {2, 2}, {3, 3} of y = x² ± 0.1.
  const x = f(1, 1, 2, 2, 3, 3), y = f(0.9, 1.1, 3.9, 4.1, 8.9, 9.1);
  const e = y.map((v, i) => v - (4 * x[i] - 10 / 3));
  const t = lackOfFit([x], y, e, 2, null)!;
  const rss = e.reduce((a, v) => a + v * v, 0);
  assert.ok(Math.abs(t.ss_lack_of_fit - (rss - 0.06)) < 1e-12);
  assert.ok(Math.abs(t.f - (t.ss_lack_of_fit / 1) / (0.06 / 3)) < 1e-9);
  assert.equal(lackOfFit([f(1, 2, 3, 4)], f(1, 2, 3, 5), f(0, 0, 0, 1), 2, null), null);
});

Deno.test("varianceInflation() is 1/(1 − r²) for two predictors", () => {
  // With two predictors R_j² is their squared correlation (hand formula).
  const one = new Float64Array(5).fill(1), a = f(1, 2, 3, 4, 5), b = f(2, 1, 4, 3, 6);
  const v = varianceInflation([one, a, b], ["b0", "a", "b"], null);
  const r2 = 100 / 148; // corr(a, b)² = Sab²/(Saa·Sbb) = 10²/(10·14.8) (hand computation)
  assert.ok(Math.abs(v.a! - 1 / (1 - r2)) < 1e-12 && Math.abs(v.b! - v.a!) < 1e-12);
  assert.deepEqual(Object.keys(v), ["a", "b"]);
});

Deno.test("conditionNumber() is the ratio of singular values, null for a singular design", () => {
  // [[1, 1], [1, −1]]/… columns orthogonal with norms √2 and √8: ratio 2 (hand computation).
  assert.ok(Math.abs(conditionNumber([f(1, 1), f(2, -2)], null)! - 2) < 1e-14);
  assert.equal(conditionNumber([f(1, 1), f(2, 2)], null), null);
});

Deno.test("breuschPagan() Koenker and original forms agree in their auxiliary F", () => {
  const one = new Float64Array(8).fill(1), x = f(1, 2, 3, 4, 5, 6, 7, 8);
  const e = f(0.1, -0.1, 0.3, -0.2, 0.6, -0.5, 1.1, -0.9);
  const k = breuschPagan(e, [one, x], null, "koenker")!,
    o = breuschPagan(e, [one, x], null, "original")!;
  assert.equal(k.f, o.f);
  assert.ok(k.p_value < 0.05, "variance grows with x");
  assert.equal(k.df, 1);
});

Deno.test("ramseyReset() is null when ŷ takes two values (ŷ², ŷ³ add nothing)", () => {
  const one = new Float64Array(6).fill(1),
    x = f(8, 8, 8, 8, 8, 19),
    fitted = x.map((v) => 3 + 0.5 * v);
  assert.equal(ramseyReset(f(1, -1, 0.5, -0.5, 0, 0), fitted, [one, x], null), null);
});

Deno.test("robustCovarianceOfFactor() HC0 of a slope equals White's hand formula", () => {
  // Var(b) = Σ(xᵢ − x̄)²eᵢ²/Sxx² for a straight line (White 1980; hand computation).
  const x = [1, 2, 3, 4, 5], e = f(0.3, -0.5, 0.1, 0.6, -0.5);
  const one = new Float64Array(5).fill(1), xs = new Float64Array(x);
  const factor = factorOfQR(householderQR(new Float64Array([...one, ...xs]), 5, 2), f(1, 1));
  const columns = [{ hi: one, lo: null }, { hi: xs, lo: null }];
  const of = (type: "hc0" | "hc3") =>
    robustCovarianceOfFactor({ factor, columns, residuals: e, weights: null, type });
  const r = of("hc0"), sxx = 10;
  const want = x.reduce((a, v, i) => a + (v - 3) ** 2 * e[i] ** 2, 0) / sxx ** 2;
  assert.ok(Math.abs(r.covariance[3] - want) < 1e-15);
  assert.ok(of("hc3").stdErrors[1]! > r.stdErrors[1]!);
  // The middle in Q's coordinates gives the slope's variance back through R̃: zᵀMz, R̃ᵀz = (0, 1).
  const g = [{ hi: [0], lo: null }, { hi: [1], lo: null }];
  const v = inverseGramForms(factor, g, 1, null, r.middle!)[0];
  assert.ok(Math.abs(v - want) < 1e-15 * want, `${v} vs ${want}`);
});
