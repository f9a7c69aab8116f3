import assert from "node:assert/strict";
import { householderQR } from "./householder_qr.ts";
import { factorOfQR, inverseGramForms } from "./triangular_factor.ts";
import { ddLeastSquares } from "./dd_least_squares.ts";
import { leastSquares } from "./least_squares.ts";

const dd = (hi: ArrayLike<number>) => ({ hi, lo: null });

/** The straight line's hat value at x₀: 1/n + (x₀ − x̄)²/Sxx (Draper & Smith, Applied Regression Analysis, §1.4; hand formula). */
function lineHat(x: number[], x0: number): number {
  const n = x.length, m = x.reduce((a, b) => a + b) / n;
  const sxx = x.reduce((a, v) => a + (v - m) ** 2, 0);
  return 1 / n + (x0 - m) ** 2 / sxx;
}

Deno.test("inverseGramForms() gives the straight line's 1/n + (x₀ − x̄)²/Sxx inside and outside the data", () => {
  const x = [1, 2, 4, 7, 11];
  const qr = householderQR(new Float64Array([...x.map(() => 1), ...x]), 5, 2);
  const f = factorOfQR(qr, Float64Array.of(1, 1));
  const at = [0, 3, 11, 20];
  const h = inverseGramForms(f, [dd(at.map(() => 1)), dd(at)], at.length);
  at.forEach((x0, i) =>
    assert.ok(Math.abs(h[i] - lineHat(x, x0)) < 1e-15 * lineHat(x, x0), `x₀ = ${x0}`)
  );
});

Deno.test("inverseGramForms() reads only the leading rank block: an aliased column adds nothing", () => {
  // [1, x, 2x] spans what [1, x] spans: the same hat values (Belsley, Kuh & Welsch 1980, §2.1).
  const x = [1, 2, 4, 7, 11];
  const qr = householderQR(
    new Float64Array([...x.map(() => 1), ...x, ...x.map((v) => 2 * v)]),
    5,
    3,
  );
  assert.equal(qr.rank, 2);
  const f = factorOfQR(qr, Float64Array.of(1, 1, 1));
  const h = inverseGramForms(f, [dd(x.map(() => 1)), dd(x), dd(x.map((v) => 2 * v))], 5);
  x.forEach((v, i) => assert.ok(Math.abs(h[i] - lineHat(x, v)) < 1e-14, `row ${i}`));
});

Deno.test("inverseGramForms() through a double-double factor keeps Σhᵢ = p on raw calendar years", () => {
  // The hat matrix has trace p (Belsley, Kuh & Welsch 1980, §2.1). Degree 5 in x = 1900 … 2020,
  // not centred (κ of the unit-length design 3.6e10, measured): the double factor loses digits of hᵢ, the
  // double-double one (ddLeastSquares) keeps them.
  const n = 121, p = 6;
  const x = Float64Array.from({ length: n }, (_, i) => 1900 + i);
  // x^k exact as hi + lo (x integer; x^k beyond 2^53 for k ≥ 5 takes a low part)
  const cols = Array.from({ length: p }, (_, k) => {
    const hi = new Float64Array(n), lo = new Float64Array(n);
    x.forEach((v, i) => {
      const big = BigInt(v) ** BigInt(k);
      hi[i] = Number(big);
      lo[i] = Number(big - BigInt(hi[i]));
    });
    return { hi, lo };
  });
  const y = x.map((v) => Math.sin(v / 9));
  const d = ddLeastSquares(
    cols,
    { hi: y, lo: null },
    Int32Array.from({ length: p }, (_, j) => p - 1 - j),
  );
  const h = inverseGramForms(d.factor, cols, n);
  const trace = h.reduce((a, b) => a + b);
  assert.ok(Math.abs(trace - p) < 1e-13, `double-double: Σh = ${trace}`);
  const ls = leastSquares(cols.map((c) => c.hi), y, cols.map((_, j) => `b${j}`));
  assert.ok(ls.fullRank);
  const hd = inverseGramForms(factorOfQR(ls.qr, ls.scale), cols.map((c) => dd(c.hi)), n);
  const worst = Math.max(...Array.from(h, (v, i) => Math.abs(hd[i] - v) / v));
  assert.ok(worst > 1e-12, `the double factor should lose digits here (worst ${worst})`);
});
