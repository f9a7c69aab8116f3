import assert from "node:assert/strict";
import { ddLeastSquares, ddSumOfSquares, type DDVector } from "./dd_least_squares.ts";
import { leastSquares } from "./least_squares.ts";
import { seededRandom } from "../random.ts";

/** A seeded problem with an intercept: y = X·β + noise, lo parts ~2^-54 relative. */
function problem(m: number, p: number, seed: number) {
  const rnd = seededRandom(seed);
  const lo = (v: Float64Array) => v.map((x) => x * 2 ** -54 * rnd.normal());
  const his = Array.from(
    { length: p },
    (_, j) => Float64Array.from({ length: m }, () => (j === 0 ? 1 : rnd.normal() * 10 ** j)),
  );
  const cols: DDVector[] = his.map((h, j) => ({ hi: h, lo: j === 0 ? null : lo(h) }));
  const yh = new Float64Array(m);
  his.forEach((c, j) => c.forEach((v, i) => (yh[i] += (j + 1) * v * 10 ** -j)));
  for (let i = 0; i < m; i++) yh[i] += rnd.normal();
  return { cols, y: { hi: yh, lo: lo(yh) }, order: Int32Array.from({ length: p }, (_, j) => j) };
}

const dd = (h: number, l: number) => h + l;

Deno.test("ddLeastSquares() recovers NIST StRD Wampler1's exact coefficients 1, 1, 1, 1, 1, 1", () => {
  // NIST StRD Wampler1: y = 1 + x + x² + x³ + x⁴ + x⁵ at x = 0 … 20, certified β = 1, RSS = 0.
  const x = Array.from({ length: 21 }, (_, i) => i);
  const cols = [0, 1, 2, 3, 4, 5].map((k) => ({ hi: x.map((v) => v ** k), lo: null }));
  const y = { hi: x.map((v) => 1 + v + v ** 2 + v ** 3 + v ** 4 + v ** 5), lo: null };
  const f = ddLeastSquares(cols, y, [5, 4, 3, 2, 1, 0]);
  for (let j = 0; j < 6; j++) {
    assert.ok(Math.abs(dd(f.coefficients[j], f.coefficientsLo[j]) - 1) < 1e-25, `β${j}`);
  }
  assert.ok(f.rss < 1e-40, `rss ${f.rss}`);
});

Deno.test("ddLeastSquares() residuals are orthogonal to the design to 1e-27 (normal equations)", () => {
  // Xᵀr = 0 at the least-squares solution (Golub & Van Loan §5.3.1)
  const { cols, y, order } = problem(200, 4, 11);
  const f = ddLeastSquares(cols, y, order);
  cols.forEach((c, j) => {
    let s = 0, scale = 0;
    for (let i = 0; i < 200; i++) {
      const r = dd(f.residuals[i], f.residualsLo[i]);
      s += c.hi[i] * r;
      scale += Math.abs(c.hi[i] * y.hi[i]);
    }
    // s is summed in doubles here: bound by its own rounding, 1e-16·Σ|x·r|
    assert.ok(Math.abs(s) < 1e-14 * scale, `column ${j}`);
  });
});

Deno.test("ddLeastSquares() agrees with the double path to double precision", () => {
  const { cols, y, order } = problem(500, 5, 3);
  const d = leastSquares(
    cols.map((c) => Float64Array.from(c.hi)),
    Float64Array.from(y.hi),
    ["a", "b", "c", "d", "e"],
  );
  assert.ok(d.fullRank);
  const f = ddLeastSquares(cols, y, order);
  for (let j = 0; j < 5; j++) {
    assert.ok(
      Math.abs(f.coefficients[j] - d.coefficients[j]) <= 1e-10 * Math.abs(d.coefficients[j]),
    );
  }
});

Deno.test("ddLeastSquares() with an intercept: TSS = ESS + RSS and R² = corr(y, ŷ)² (property)", () => {
  // Identities of least squares with an intercept (Draper & Smith ch. 1; common practice)
  for (let seed = 1; seed <= 5; seed++) {
    const { cols, y, order } = problem(100 + 37 * seed, 3 + seed % 3, seed);
    const f = ddLeastSquares(cols, y, order);
    const tss = ddSumOfSquares(y, true);
    const ess = ddSumOfSquares({ hi: f.fitted, lo: f.fittedLo }, true);
    assert.ok(Math.abs(tss - (ess + f.rss)) <= 1e-14 * tss, `seed ${seed}: TSS = ESS + RSS`);
    const n = y.hi.length;
    let my = 0, mf = 0;
    for (let i = 0; i < n; i++) my += y.hi[i] / n, mf += f.fitted[i] / n;
    let sxy = 0, sxx = 0, syy = 0;
    for (let i = 0; i < n; i++) {
      const a = y.hi[i] - my, b = f.fitted[i] - mf;
      sxy += a * b, sxx += a * a, syy += b * b;
    }
    const r2 = 1 - f.rss / tss;
    assert.ok(Math.abs(r2 - (sxy * sxy) / (sxx * syy)) < 1e-12, `seed ${seed}: R² = corr²`);
  }
});

Deno.test("ddLeastSquares() fitted values do not depend on column units (property)", () => {
  // Scaling a column by c scales its coefficient by 1/c and leaves X·β unchanged (common practice)
  const { cols, y, order } = problem(120, 4, 9);
  const factors = [1, 3.7, 1e-5, 123456.789];
  const scaled = cols.map((c, j) => ({
    hi: Float64Array.from(c.hi, (v) => v * factors[j]),
    lo: null,
  }));
  // v·c is rounded to a double, so the scaled problem differs from the original at 1e-16
  const f = ddLeastSquares(scaled, y, order);
  const g = ddLeastSquares(cols.map((c) => ({ hi: c.hi, lo: null })), y, order);
  for (let i = 0; i < 120; i++) {
    const a = dd(f.fitted[i], f.fittedLo[i]), b = dd(g.fitted[i], g.fittedLo[i]);
    assert.ok(Math.abs(a - b) <= 1e-13 * Math.max(1, Math.abs(b)), `row ${i}`);
  }
});

Deno.test("ddLeastSquares() weighted by row scales minimises Σ(w·r)²", () => {
  const { cols, y, order } = problem(50, 2, 5);
  const w = Float64Array.from({ length: 50 }, (_, i) => 1 + (i % 3));
  const f = ddLeastSquares(cols, y, order, w);
  let rss = 0;
  for (let i = 0; i < 50; i++) rss += (w[i] * f.residuals[i]) ** 2;
  assert.ok(Math.abs(rss - f.rss) <= 1e-12 * f.rss);
  const d = leastSquares(
    cols.map((c) => Float64Array.from(c.hi, (v, i) => v * w[i])),
    Float64Array.from(y.hi, (v, i) => v * w[i]),
    ["a", "b"],
  );
  assert.ok(d.fullRank && Math.abs(d.coefficients[1] - f.coefficients[1]) < 1e-12);
});

Deno.test("ddLeastSquares() throws RangeError for a bad order and too few rows", () => {
  const c = { hi: [1, 2, 3], lo: null };
  assert.throws(
    () => ddLeastSquares([c, c], { hi: [1, 2, 3], lo: null }, [0, 0]),
    (e) =>
      e instanceof RangeError &&
      e.message === 'Cannot solve least squares: order "0,0" is not a permutation of 0…1',
  );
  assert.throws(
    () => ddLeastSquares([c, c, c, c], { hi: [1, 2, 3], lo: null }, [0, 1, 2, 3]),
    (e) =>
      e instanceof RangeError &&
      e.message === "Cannot solve least squares with 3 rows and 4 columns: need m ≥ p ≥ 1",
  );
});
