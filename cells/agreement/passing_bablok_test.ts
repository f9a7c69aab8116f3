/**
 * Passing–Bablok regression against medians of pairwise slopes worked out by
 * hand in exact fractions, its rank limits, its symmetry, and the cusum test
 * against an independent recomputation.
 */
import { deepEqual, equal, ok, throws } from "node:assert/strict";
import {
  cusumTest,
  kolmogorovQuantile,
  kolmogorovUpper,
  pairSlopes,
  passingBablok,
  PassingBablokError,
} from "./passing_bablok.ts";

Deno.test("passingBablok() takes the median of the pairwise slopes (hand-computed, exact)", () => {
  // x = 1…6, y = 1.2, 1.9, 3.3, 3.8, 5.4, 5.9 (invented). The 15 slopes, sorted, in exact
  // fractions (worked out by hand, checked with Python's fractions):
  //   1/2, 1/2, 7/10, 13/15, 13/15, 47/50, 19/20, 1, 21/20, 21/20, 21/20, 21/20, 7/6, 7/5, 8/5
  // N = 15, K = 0: b = S₍₈₎ = 1; a = med(y − x) = med(0.2, −0.1, 0.3, −0.2, 0.4, −0.1) = 0.05.
  const x = [1, 2, 3, 4, 5, 6], y = [1.2, 1.9, 3.3, 3.8, 5.4, 5.9];
  const s = pairSlopes(x, y);
  const want = [1 / 2, 1 / 2, 7 / 10, 13 / 15, 13 / 15, 47 / 50, 19 / 20, 1, 21 / 20, 21 / 20];
  want.push(21 / 20, 21 / 20, 7 / 6, 7 / 5, 8 / 5);
  equal(s.slopes.length, 15);
  s.slopes.forEach((v, i) => ok(Math.abs(v - want[i]) < 1e-15, `S${i + 1} ${v} ${want[i]}`));
  const pb = passingBablok(x, y, 0.95);
  ok(Math.abs(pb.slope - 1) < 1e-15);
  ok(Math.abs(pb.intercept - 0.05) < 1e-15);
});

Deno.test("passingBablok() shifts the median by K, leaves out −1 and ties, counts a vertical pair as ±∞", () => {
  // Exact (binary fractions): x = 1, 2, 2, 3, 4, 5, 6; y = 1, 2.5, 1.75, 3, 2, 5.25, 6 (invented).
  // Rows 2, 3 share x = 2 with y falling: −∞; rows 4, 5 give exactly −1 and are left out.
  // Sorted (20): −∞, −1/4, 1/8, 1/3, 1/2, 3/4, 3/4, 7/8, 11/12, 1, 1, 1, 17/16, 17/16, 9/8,
  // 7/6, 5/4, 3/2, 2, 13/4. K = 1 (only −∞ lies below −1); N even: b = ½(S₍₁₁₎ + S₍₁₂₎) = 1.
  // a = med(y − x) = med(0, 0.5, −0.25, 0, −2, 0.25, 0) = 0.
  // Limits (P&B 1983): C = 1.959964·√(7·6·19/18) = 13.0501, M₁ = round((20 − C)/2) = 3,
  // M₂ = 18; b_L = S₍₃₊₁₎ = 1/3, b_U = S₍₁₈₊₁₎ = 2; a_L = med(y − 2x) = −3,
  // a_U = med(y − x/3) = 11/6.
  const x = [1, 2, 2, 3, 4, 5, 6], y = [1, 2.5, 1.75, 3, 2, 5.25, 6];
  const s = pairSlopes(x, y);
  equal(s.slopes.length, 20);
  equal(s.below, 1);
  equal(s.slopes[0], -Infinity);
  const pb = passingBablok(x, y, 0.95);
  equal(pb.slope, 1);
  equal(pb.intercept, 0);
  deepEqual(pb.ranks, [3, 18]);
  ok(Math.abs(pb.slopeCi[0]! - 1 / 3) < 1e-15);
  equal(pb.slopeCi[1], 2);
  equal(pb.interceptCi[0], -3);
  ok(Math.abs(pb.interceptCi[1]! - 11 / 6) < 1e-15);
});

Deno.test("passingBablok() leaves a limit open when the ranks fall outside the slopes", () => {
  // n = 5, N = 10: C = 1.96·√(5·4·15/18) = 8.00, M₁ = round(1.0) = 1 (closed); with n = 4 (N = 6,
  // C = 5.77) M₁ = round(0.11) = 0: the lower limit is open (P&B 1983's ranks, exact arithmetic).
  const pb = passingBablok([1, 2, 3, 4], [1.1, 1.9, 3.2, 3.9], 0.95);
  equal(pb.slopeCi[0], null);
  equal(pb.slopeCi[1], null);
  equal(pb.interceptCi[0], null);
});

Deno.test("passingBablok() is symmetric: y on x has the reciprocal slope of x on y", () => {
  // Passing & Bablok 1983 built the estimator so (slopes below −1 shifted); exact when no two
  // slopes tie at the median. Invented data.
  const x = [3.1, 4.7, 5.2, 6.8, 7.7, 9.1, 10.4, 11.9, 12.2, 14.0, 15.3];
  const y = [3.3, 4.4, 5.6, 7.1, 7.5, 9.8, 10.1, 12.6, 12.4, 14.9, 15.8];
  const a = passingBablok(x, y, 0.95), b = passingBablok(y, x, 0.95);
  ok(Math.abs(a.slope * b.slope - 1) < 1e-14, `${a.slope} ${b.slope}`);
});

Deno.test("passingBablok() refuses methods that fall together", () => {
  throws(() => passingBablok([1, 2, 3, 4, 5], [5, 4, 3, 2, 1.5], 0.95), PassingBablokError);
});

Deno.test("cusumTest() against a recomputation by its definition", () => {
  // Independent recomputation of P&B 1983's cusum: order by the projection onto the line,
  // scores √(L/l) above and −√(l/L) below, the largest |partial sum|; critical h·√(l + L).
  const x = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12];
  const y = x.map((v, i) => v + 0.3 * Math.sin(1.7 * i) + (v > 8 ? 0.5 : 0)); // invented
  const a = 0.1, b = 1.02;
  const got = cusumTest(x, y, a, b, 0.95)!;
  const idx = x.map((_, i) => i).sort((i, j) => (y[i] + x[i] / b - a) - (y[j] + x[j] / b - a));
  const above = idx.filter((i) => y[i] > a + b * x[i]).length;
  const below = idx.filter((i) => y[i] < a + b * x[i]).length;
  let sum = 0, max = 0;
  for (const i of idx) {
    const r = y[i] - a - b * x[i];
    sum += r > 0 ? Math.sqrt(below / above) : r < 0 ? -Math.sqrt(above / below) : 0;
    max = Math.max(max, Math.abs(sum));
  }
  equal(got.above, above);
  equal(got.belowLine, below);
  ok(Math.abs(got.statistic - max) < 1e-14);
  ok(Math.abs(got.critical - 1.3581 * Math.sqrt(above + below)) < 1e-3);
  // The partial sums end at 0: l·√(L/l) − L·√(l/L) = 0 (exact identity).
  ok(Math.abs(got.path[got.path.length - 1]) < 1e-12);
});

Deno.test("kolmogorovUpper() and kolmogorovQuantile() match the printed Kolmogorov points", () => {
  // Asymptotic points 1.2238 (10 %), 1.3581 (5 %), 1.6276 (1 %): common tables, from memory;
  // printed to 4 decimals, so p agrees to the slope of the tail times 5e-5.
  for (const [h, p] of [[1.2238, 0.1], [1.3581, 0.05], [1.6276, 0.01]]) {
    ok(Math.abs(kolmogorovUpper(h) - p) < 5e-5, `${h}: ${kolmogorovUpper(h)}`);
    ok(Math.abs(kolmogorovQuantile(p) - h) < 1e-4, `${p}: ${kolmogorovQuantile(p)}`);
  }
});
