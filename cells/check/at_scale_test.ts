/**
 * The check's linear-time routes (issue 16) through a real fit and check:
 * RESET and Breusch–Pagan through the fit's own QR against exact rational
 * arithmetic (BigInt fractions by the normal equations,
 * cells/predict/_exact_test.ts, each double taken as the exact fraction it
 * is), the runs test's order by x and the Durbin–Watson moments beyond the
 * exact law's df against the routes they replaced. Invented, seeded data.
 *
 * Where F is small the direct sum of what the added columns explain keeps
 * digits that RSS₀ − RSS₁ loses: on the bench design (cells/check/check_bench.ts)
 * at n = 2,000 and 5,000, RESET's F was 1.6e-15 and 4.6e-16 from exact
 * rational arithmetic against 4.8e-12 and 3.3e-12 by the full QR before
 * (measured once, 36 s and 172 s of BigInt arithmetic: too slow to repeat
 * here), and Koenker's statistic 6e-16 against 1e-14.
 * The kernel routes themselves: kernel/stats/diagnostics_at_scale_test.ts.
 *
 * @module
 */
import assert from "node:assert/strict";
import { seededRandom } from "../../kernel/random.ts";
import { durbinWatsonTest, signRuns } from "../../kernel/stats/mod.ts";
import { exact, exactFit, int, mul, type Q, sub, sum, val } from "../predict/_exact_test.ts";
import { check, fitOf } from "./_fixtures_test.ts";

const rnd = seededRandom(2026);

/** y = 1 + x1 − 0.5·x2 + 0.2·x3 + noise, n rows (three decimals), with no curvature to find. */
function linear(n: number) {
  const round = (v: number) => Math.round(v * 1000) / 1000;
  const x1 = Float64Array.from({ length: n }, () => round(rnd.normal()));
  const x2 = Float64Array.from({ length: n }, () => round(3 * rnd.normal()));
  const x3 = Float64Array.from({ length: n }, () => round(10 * rnd()));
  const y = x1.map((v, i) => round(1 + v - 0.5 * x2[i] + 0.2 * x3[i] + rnd.normal()));
  return fitOf({ x1, x2, x3, y }, "y = b0 + b1*x1 + b2*x2 + b3*x3");
}

/** The exact residual sum of squares of v regressed on the rows. */
function exactRss(rows: Q[][], v: Q[]): Q {
  return sum(exactFit(rows, v, null).residuals.map((e) => mul(e, e)));
}

Deno.test("check RESET and Breusch–Pagan through the fit's QR equal exact rational arithmetic", () => {
  const fit = linear(150), n = 150;
  const r = check(fit), b = check(fit, { variance_test: "original" });
  const x = (i: number) => fit.design.map((c) => exact(c[i]));
  const e = Array.from(fit.residuals, exact);
  // RESET: e on [X, ŷ², ŷ³] (ŷ² and ŷ³ as the doubles the check forms), F on 2 and n − p − 2 df.
  const rows = Array.from({ length: n }, (_, i) => {
    const v = fit.fitted[i];
    return [...x(i), exact(v * v), exact(v * v * v)];
  });
  const rss1 = exactRss(rows, e), rss0 = sum(e.map((v) => mul(v, v)));
  const f = val(sub(rss0, rss1)) / 2 / (val(rss1) / (n - 6));
  assert.ok(Math.abs(r.reset!.f - f) <= 1e-13 * f, `RESET F ${r.reset!.f} vs ${f}`);
  // Breusch–Pagan: e² (as doubles) on X; Koenker's n·R², the original ESS·(n/RSS)²/2.
  const e2 = Array.from(fit.residuals, (v) => exact(v * v));
  const mean = mul(sum(e2), [1n, BigInt(n)]);
  const tss = sum(e2.map((v) => mul(sub(v, mean), sub(v, mean))));
  const ess = sub(tss, exactRss(Array.from({ length: n }, (_, i) => x(i)), e2));
  const koenker = n * val(mul(ess, [tss[1], tss[0]]));
  const rssE = sum(e.map((v) => mul(v, v)));
  const original = val(mul(mul(ess, mul(int(n * n), [rssE[1] * rssE[1], rssE[0] * rssE[0]])), [
    1n,
    2n,
  ]));
  const got = r.breusch_pagan!.statistic, orig = b.breusch_pagan!.statistic;
  assert.ok(Math.abs(got - koenker) <= 1e-13 * koenker, `Koenker ${got} vs ${koenker}`);
  assert.ok(Math.abs(orig - original) <= 1e-13 * original, `original ${orig} vs ${original}`);
});

Deno.test("check runs test reads signs in x order (radix order, ties in row order)", () => {
  const n = 400;
  // x with many ties, not sorted: the order is by value, then row.
  const x = Float64Array.from({ length: n }, () => Math.floor(rnd() * 40) / 4);
  const y = x.map((v) => 2 + 0.5 * v + 0.1 * v * v + rnd.normal());
  const fit = fitOf({ x, y }, "y = a + b*x");
  const r = check(fit);
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => x[a] - x[b] || a - b);
  const want = signRuns(fit.residuals, order)!;
  assert.equal(r.runs!.order, "x");
  assert.equal(r.runs!.runs, want.runs);
  assert.equal(r.runs!.z, want.z);
});

Deno.test("check Durbin–Watson beyond the exact law's df: moments from the factor equal the basis route", () => {
  const fit = linear(2200);
  const r = check(fit).durbin_watson_test!;
  const want = durbinWatsonTest(fit.residuals, fit.design, null)!;
  assert.equal(r.distribution, "beta");
  for (const k of ["expected", "variance", "p_value", "p_value_negative"] as const) {
    assert.ok(Math.abs(r[k] - want[k]) <= 1e-12 * Math.abs(want[k]), `${k}: ${r[k]} vs ${want[k]}`);
  }
});
