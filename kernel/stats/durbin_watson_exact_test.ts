import { ok } from "node:assert/strict";
import { durbinWatsonCdf } from "./durbin_watson_exact.ts";
import { durbinWatsonTest } from "./durbin_watson.ts";
import { orthonormalBasis } from "./_orthonormal_basis.ts";

/** Orthonormal basis of the mean-only design on n rows. */
const meanOnly = (n: number) => [new Float64Array(n).fill(1 / Math.sqrt(n))];

/** tr(B²) for B = M(A − d₀I)M with M's eigen-part given by eigenvalues ν of MAM (m of them). */
const traceB2 = (nu: number[], d0: number) => nu.reduce((s, v) => s + (v - d0) ** 2, 0);

/** Eigenvalues of MAM for the mean-only model: 2 − 2cos(kπ/n), k = 1 … n − 1. */
const pathEigen = (n: number) =>
  Array.from({ length: n - 1 }, (_, k) => 2 - 2 * Math.cos(((k + 1) * Math.PI) / n));

Deno.test("durbinWatsonCdf() gives the Cauchy-ratio law for the mean-only model on 3 rows", () => {
  // d = (ξ₁² + 3ξ₂²)/(ξ₁² + ξ₂²), the eigenvalues of MAM being 1 and 3; so
  // P(d ≤ d₀) = P(ξ₂²/ξ₁² ≤ (d₀ − 1)/(3 − d₀)) = (2/π)·atan(√((d₀ − 1)/(3 − d₀))),
  // ξ₂/ξ₁ being standard Cauchy (exact arithmetic on a known law).
  for (const d0 of [1.05, 1.2, 1.5, 2, 2.5, 2.9, 2.99]) {
    const want = (2 / Math.PI) * Math.atan(Math.sqrt((d0 - 1) / (3 - d0)));
    const got = durbinWatsonCdf(d0, meanOnly(3), 3, traceB2([1, 3], d0));
    ok(Math.abs(got - want) < 1e-12, `d0 ${d0}: ${got} vs ${want}`);
  }
});

Deno.test("durbinWatsonCdf() agrees with Imhof's integral over the explicit eigenvalues", () => {
  // Mean-only model on 12 rows: MAM has the path Laplacian's eigenvalues 2 − 2cos(kπ/n)
  // (Anderson 1971, The Statistical Analysis of Time Series, §6.5; exact). Imhof's
  // integral (Biometrika 1961, eq. 3.2) is summed here over those eigenvalues with a
  // plain fine trapezoid rule, independent of the determinant route.
  const n = 12, nu = pathEigen(n);
  for (const d0 of [0.9, 1.6, 2, 2.7]) {
    const lambda = nu.map((v) => v - d0);
    const f = (u: number) => {
      let theta = 0, logRho = 0;
      for (const l of lambda) {
        theta += 0.5 * Math.atan(l * u);
        logRho += 0.25 * Math.log1p(l * l * u * u);
      }
      return Math.sin(theta) / (u * Math.exp(logRho));
    };
    let sum = 0;
    const h = 1e-3, top = 60;
    for (let u = h; u < top; u += h) sum += f(u);
    sum = (sum + f(top) / 2 + lambda.reduce((s, l) => s + l, 0) / 4) * h;
    const want = 1 - (0.5 + sum / Math.PI);
    const got = durbinWatsonCdf(d0, meanOnly(n), n, traceB2(nu, d0));
    ok(Math.abs(got - want) < 1e-7, `d0 ${d0}: ${got} vs ${want}`);
  }
});

Deno.test("durbinWatsonCdf() is symmetric about 2 for the mean-only model", () => {
  // The eigenvalues 2 − 2cos(kπ/n) are symmetric about 2, hence so is d's law:
  // F(2 − x) = 1 − F(2 + x) (exact arithmetic on the eigenvalues).
  const n = 40, nu = pathEigen(n);
  for (const x of [0.1, 0.4, 0.8]) {
    const lo = durbinWatsonCdf(2 - x, meanOnly(n), n, traceB2(nu, 2 - x));
    const hi = durbinWatsonCdf(2 + x, meanOnly(n), n, traceB2(nu, 2 + x));
    ok(Math.abs(lo - (1 - hi)) < 1e-13, `${x}: ${lo} vs ${1 - hi}`);
  }
});

Deno.test("durbinWatsonTest() has the exact mean of d for a straight-line design", () => {
  // E d = ∫₀⁴ (1 − F(x)) dx must equal tr(MA)/(n − p), the moment of Durbin & Watson
  // (1950, §3), for a design with an intercept and a slope on 15 rows.
  const n = 15;
  const x = Float64Array.from({ length: n }, (_, i) => i + 1);
  const one = new Float64Array(n).fill(1);
  const residuals = Float64Array.from({ length: n }, (_, i) => Math.sin(i));
  const t = durbinWatsonTest(residuals, [one, x], null)!;
  const basis = orthonormalBasis([one, x], null);
  const m = n - 2, P = t.expected * m, Q = (t.variance * m * m * (m + 2)) / 2 / m + (P * P) / m;
  // ∫₀⁴ (1 − F) by 40 Gauss–Legendre panels of 10 points (the CDF is smooth inside (0, 4)).
  const gx = [
    0.1488743389816312,
    0.4333953941292472,
    0.6794095682990244,
    0.8650633666889845,
    0.9739065285171717,
  ];
  const gw = [
    0.2955242247147529,
    0.2692667193099963,
    0.2190863625159820,
    0.1494513491505806,
    0.0666713443086881,
  ];
  let mean = 0;
  const panels = 40, w = 4 / panels;
  for (let k = 0; k < panels; k++) {
    for (let j = 0; j < 10; j++) {
      const xi = j < 5 ? -gx[4 - j] : gx[j - 5], wi = j < 5 ? gw[4 - j] : gw[j - 5];
      const d0 = k * w + (w * (xi + 1)) / 2;
      mean += (wi * w / 2) * (1 - durbinWatsonCdf(d0, basis, n, Q - 2 * d0 * P + d0 * d0 * m));
    }
  }
  ok(Math.abs(mean - t.expected) < 1e-8, `${mean} vs ${t.expected}`);
  ok(t.distribution === "exact" && Math.abs(t.p_value + t.p_value_negative - 1) < 1e-15);
});

Deno.test("durbinWatsonTest() finds alternating residuals significant on the negative side", () => {
  // Residuals alternating in sign: d near 4 − ε, far above E d ≈ 2 (hand computation).
  const n = 30, one = new Float64Array(n).fill(1);
  const x = Float64Array.from({ length: n }, (_, i) => i);
  const e = Float64Array.from(
    { length: n },
    (_, i) => (i % 2 === 0 ? 1 : -1) * (1 + 0.1 * Math.cos(i)),
  );
  const t = durbinWatsonTest(e, [one, x], null)!;
  ok(t.statistic > 3 && t.p_value_negative < 1e-6 && t.p_value > 0.999, JSON.stringify(t));
});

Deno.test("the beta approximation (Durbin & Watson 1971) is close to the exact law at 2,000 df", () => {
  // Common practice, no source for the tolerance: the two agree to about 1e-3 here.
  const n = 2002, one = new Float64Array(n).fill(1);
  const x = Float64Array.from({ length: n }, (_, i) => i);
  const e = Float64Array.from({ length: n }, (_, i) => Math.sin(0.7 * i) + Math.cos(1.3 * i * i));
  const exact = durbinWatsonTest(e, [one, x], null)!;
  ok(exact.distribution === "exact");
  // The same d against the beta law: one more row puts the design beyond EXACT_DF.
  const e2 = Float64Array.from({ length: n + 1 }, (_, i) => (i < n ? e[i] : 0));
  const one2 = new Float64Array(n + 1).fill(1),
    x2 = Float64Array.from({ length: n + 1 }, (_, i) => i);
  const beta = durbinWatsonTest(e2, [one2, x2], null)!;
  ok(beta.distribution === "beta");
  ok(Math.abs(beta.statistic - exact.statistic) < 1e-3);
  ok(Math.abs(beta.p_value - exact.p_value) < 2e-3, `${beta.p_value} vs ${exact.p_value}`);
});
