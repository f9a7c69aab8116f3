/**
 * Deming regression: the closed form against exact rational arithmetic, its
 * limits as one method's error vanishes, its symmetry, the weighted form's
 * fixed point, and the jackknife against a brute-force leave-one-out.
 */
import { equal, ok, throws } from "node:assert/strict";
import { deming, DemingError, demingLine, jackknifeSe, weightedDemingLine } from "./deming.ts";
import { studentT } from "../../kernel/stats/mod.ts";

// Invented readings of eight samples by two methods, one decimal each.
const X = [2.1, 3.4, 4.0, 5.7, 6.2, 7.9, 8.3, 9.6];
const Y = [2.3, 3.2, 4.4, 5.9, 6.0, 8.4, 8.2, 10.1];

/** ⌊√v⌋ of a non-negative BigInt by Newton's method on integers. */
function isqrt(v: bigint): bigint {
  if (v < 2n) return v;
  // Newton from above decreases monotonically to ⌊√v⌋.
  let x = v, next = (x + 1n) >> 1n;
  while (next < x) {
    x = next;
    next = (x + v / x) >> 1n;
  }
  return x;
}

/**
 * Deming's slope in exact arithmetic: with the readings as integers (tenths),
 * U = nΣX² − (ΣX)², Q likewise for Y, P = nΣXY − ΣXΣY are exact; δ = dn/dd;
 * b = (dd·Q − dn·U + √((dd·Q − dn·U)² + 4·dn·dd·P²)) / (2·dd·P), the common
 * factor of U, Q, P cancelling. The square root is taken on integers scaled
 * by 10⁸⁰, so b comes out to 40 digits.
 */
function exactSlope(x: number[], y: number[], dn: bigint, dd: bigint): number {
  const X = x.map((v) => BigInt(Math.round(v * 10)));
  const Y = y.map((v) => BigInt(Math.round(v * 10)));
  const n = BigInt(X.length);
  const sum = (a: bigint[]) => a.reduce((s, v) => s + v, 0n);
  const dot = (a: bigint[], b: bigint[]) => a.reduce((s, v, i) => s + v * b[i], 0n);
  const U = n * dot(X, X) - sum(X) ** 2n;
  const Q = n * dot(Y, Y) - sum(Y) ** 2n;
  const P = n * dot(X, Y) - sum(X) * sum(Y);
  const E = dd * Q - dn * U;
  const scale = 10n ** 40n;
  const root = isqrt((E * E + 4n * dn * dd * P * P) * scale * scale);
  // ⌊b·10⁴⁰⌋ (P > 0 here), printed with the decimal point put back.
  const digits = ((E * scale + root) / (2n * dd * P)).toString().padStart(41, "0");
  return Number(`${digits.slice(0, -40)}.${digits.slice(-40)}`);
}

Deno.test("demingLine() equals the closed form in exact rational arithmetic to 1e-12", () => {
  // Exact arithmetic (above), for three ratios δ = σ²(y)/σ²(x).
  for (const [dn, dd] of [[1n, 1n], [3n, 2n], [1n, 4n]] as const) {
    const got = demingLine(X, Y, Number(dn) / Number(dd), null);
    const want = exactSlope(X, Y, dn, dd);
    ok(Math.abs(got.slope - want) < 1e-12 * Math.abs(want), `δ ${dn}/${dd}: ${got.slope} ${want}`);
    // a = ȳ − b·x̄ (Linnet 1993), means exact in tenths.
    const xm = X.reduce((s, v) => s + v, 0) / 8, ym = Y.reduce((s, v) => s + v, 0) / 8;
    ok(Math.abs(got.intercept - (ym - want * xm)) < 1e-12);
  }
});

Deno.test("demingLine() tends to least squares of y on x as δ → ∞ and of x on y as δ → 0", () => {
  // Exact limits of the closed form (Linnet 1993: λ = 1/δ → 0 is ordinary least squares).
  const n = X.length, xm = X.reduce((s, v) => s + v, 0) / n, ym = Y.reduce((s, v) => s + v, 0) / n;
  let sxx = 0, syy = 0, sxy = 0;
  for (let i = 0; i < n; i++) {
    sxx += (X[i] - xm) ** 2;
    syy += (Y[i] - ym) ** 2;
    sxy += (X[i] - xm) * (Y[i] - ym);
  }
  ok(Math.abs(demingLine(X, Y, 1e12, null).slope - sxy / sxx) < 1e-9);
  ok(Math.abs(demingLine(X, Y, 1e-12, null).slope - syy / sxy) < 1e-9);
});

Deno.test("demingLine() is symmetric: x on y with 1/δ gives the reciprocal slope", () => {
  // Identity of the criterion Σ(x − x̂)² + Σ(y − ŷ)²/δ under swapping the axes (exact).
  for (const d of [0.3, 1, 2.5]) {
    const b = demingLine(X, Y, d, null).slope;
    const c = demingLine(Y, X, 1 / d, null).slope;
    ok(Math.abs(b * c - 1) < 1e-14, `${b} ${c}`);
  }
});

Deno.test("demingLine() refuses readings that do not vary together", () => {
  throws(() => demingLine([1, 2, 3, 2], [5, 7, 5, 3], 1, null), DemingError);
});

Deno.test("weightedDemingLine() is a fixed point of Linnet's reweighting, scale-free, and exact on a line", () => {
  // Independent re-derivation of one step (Linnet 1990, the steps as we recall them): weights
  // 1/ℓ², ℓ = (δx̂ + ŷ)/(δ + 1), the nearest points on the line; then the weighted closed form.
  const d = 0.8;
  const w = weightedDemingLine(X, Y, d);
  ok(w.iterations > 0);
  const weights = X.map((x, i) => {
    const r = Y[i] - w.intercept - w.slope * x;
    const xh = x + (w.slope * r) / (d + w.slope ** 2);
    const yh = Y[i] - (d * r) / (d + w.slope ** 2);
    return 1 / ((d * xh + yh) / (d + 1)) ** 2;
  });
  const again = demingLine(X, Y, d, weights);
  ok(Math.abs(again.slope - w.slope) < 1e-11 && Math.abs(again.intercept - w.intercept) < 1e-10);
  // Readings ×10: the same slope, ten times the intercept (weights rescale uniformly; exact).
  const big = weightedDemingLine(X.map((v) => 10 * v), Y.map((v) => 10 * v), d);
  ok(Math.abs(big.slope - w.slope) < 1e-11 && Math.abs(big.intercept - 10 * w.intercept) < 1e-9);
  // Points on y = 1.1·x: the line itself (exact).
  const on = weightedDemingLine(X, X.map((v) => 1.1 * v), 1);
  ok(Math.abs(on.slope - 1.1) < 1e-13 && Math.abs(on.intercept) < 1e-12);
});

Deno.test("deming() jackknife SEs equal a brute-force leave-one-out by pseudo-values", () => {
  // Brute force: the slope without each sample by an independent closed form (sample
  // covariances, Linnet 1993's formula with λ = 1/δ), pseudo-values nθ − (n − 1)θ₍₋ᵢ₎, and
  // SE² = Σ(ψᵢ − ψ̄)²/(n(n − 1)) (Quenouille–Tukey; algebraically the (n − 1)/n Σ(θ₍₋ᵢ₎ − θ̄)² form).
  const d = 1.5, lambda = 1 / d;
  const slope = (x: number[], y: number[]) => {
    const n = x.length, xm = x.reduce((s, v) => s + v, 0) / n;
    const ym = y.reduce((s, v) => s + v, 0) / n;
    let u = 0, q = 0, p = 0;
    x.forEach((xi, i) => {
      u += (xi - xm) ** 2 / (n - 1);
      q += (y[i] - ym) ** 2 / (n - 1);
      p += (xi - xm) * (y[i] - ym) / (n - 1);
    });
    const b = (lambda * q - u + Math.sqrt((u - lambda * q) ** 2 + 4 * lambda * p * p)) /
      (2 * lambda * p);
    return { b, a: ym - b * xm };
  };
  const n = X.length, all = slope(X, Y);
  const psiB: number[] = [], psiA: number[] = [];
  for (let i = 0; i < n; i++) {
    const l = slope(X.filter((_, j) => j !== i), Y.filter((_, j) => j !== i));
    psiB.push(n * all.b - (n - 1) * l.b);
    psiA.push(n * all.a - (n - 1) * l.a);
  }
  const se = (psi: number[]) => {
    const m = psi.reduce((s, v) => s + v, 0) / n;
    return Math.sqrt(psi.reduce((s, v) => s + (v - m) ** 2, 0) / (n * (n - 1)));
  };
  const got = deming(X, Y, d, false, 0.95);
  ok(Math.abs(got.slope - all.b) < 1e-13);
  ok(Math.abs(got.seSlope - se(psiB)) < 1e-12 * se(psiB), `${got.seSlope} ${se(psiB)}`);
  ok(Math.abs(got.seIntercept - se(psiA)) < 1e-12 * se(psiA));
  // The interval is estimate ± t(n − 2)·SE; t(0.975, 6) = 2.446912 (printed t tables).
  const t = studentT(6).quantile(0.975);
  ok(Math.abs(t - 2.446912) < 1e-6);
  ok(Math.abs(got.slopeCi[1] - (got.slope + t * got.seSlope)) < 1e-13);
  equal(got.df, 6);
});

Deno.test("jackknifeSe() of equal values is 0 and of 0, 1 is 1/2", () => {
  // Exact arithmetic: n = 2, θ̄ = 1/2, (n − 1)/n · Σ(θ − θ̄)² = 1/2 · 1/2.
  equal(jackknifeSe([3, 3, 3]), 0);
  ok(Math.abs(jackknifeSe([0, 1]) - 0.5) < 1e-16);
});
