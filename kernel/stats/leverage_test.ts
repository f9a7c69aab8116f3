import assert from "node:assert/strict";
import { hatValues, press } from "./leverage.ts";

const col = (...v: number[]) => new Float64Array(v);

/** hᵢ = wᵢ·xᵢᵀ(XᵀWX)⁻¹xᵢ for a straight line, with the 2×2 inverse written out (hand formula). */
function lineHat(x: number[], w: number[]): number[] {
  let s0 = 0, s1 = 0, s2 = 0;
  x.forEach((xi, i) => {
    s0 += w[i];
    s1 += w[i] * xi;
    s2 += w[i] * xi * xi;
  });
  const det = s0 * s2 - s1 * s1;
  return x.map((xi, i) => w[i] * (s2 - 2 * s1 * xi + s0 * xi * xi) / det);
}

Deno.test("hatValues() gives 1/n + (x − x̄)²/Sxx for a straight line", () => {
  // Hand formula (Belsley, Kuh & Welsch 1980, §2.1): x = 1..5, x̄ = 3, Sxx = 10.
  const h = hatValues([col(1, 1, 1, 1, 1), col(1, 2, 3, 4, 5)], null);
  const want = [0.6, 0.3, 0.2, 0.3, 0.6];
  want.forEach((v, i) => assert.ok(Math.abs(h[i] - v) < 1e-15, `row ${i}: ${h[i]}`));
});

Deno.test("hatValues() sums to p and does not depend on the units of a column", () => {
  // Σhᵢ = trace(H) = p (identity; common practice, no source).
  const x = [0.5, 1.7, 2.2, 3.9, 4.1, 6.3, 7.7];
  const one = col(...x.map(() => 1));
  const h = hatValues([one, col(...x), col(...x.map((v) => v * v))], null);
  assert.ok(Math.abs(h.reduce((a, b) => a + b, 0) - 3) < 1e-13);
  const h2 = hatValues([
    one.map((v) => v * 1e6),
    col(...x.map((v) => v * 1e-8)),
    col(...x.map((v) => v * v)),
  ], null);
  h.forEach((v, i) => assert.ok(Math.abs(v - h2[i]) < 1e-13, `row ${i}`));
});

Deno.test("hatValues() with weights equals wᵢ·xᵢᵀ(XᵀWX)⁻¹xᵢ", () => {
  const x = [1, 2, 4, 7, 11], w = [4, 1, 0.25, 2, 0.5];
  const h = hatValues([col(1, 1, 1, 1, 1), col(...x)], col(...w));
  lineHat(x, w).forEach((v, i) =>
    assert.ok(Math.abs(h[i] - v) < 1e-14, `row ${i}: ${h[i]} vs ${v}`)
  );
  assert.ok(Math.abs(h.reduce((a, b) => a + b, 0) - 2) < 1e-14);
});

Deno.test("hatValues() gives leverage 1 to a row that alone determines a parameter", () => {
  // A column non-zero in one row only: that row is fitted exactly (Anscombe IV's shape).
  const h = hatValues([col(1, 1, 1, 1), col(8, 8, 8, 19)], null);
  assert.ok(1 - h[3] < 1e-12, String(h[3]));
  for (let i = 0; i < 3; i++) assert.ok(Math.abs(h[i] - 1 / 3) < 1e-14);
});

Deno.test("hatValues() counts an aliased column once", () => {
  const x = col(1, 2, 3, 4);
  const h = hatValues([col(1, 1, 1, 1), x, x.map((v) => 2 * v)], null);
  assert.ok(Math.abs(h.reduce((a, b) => a + b, 0) - 2) < 1e-13);
});

Deno.test("hatValues() refuses bad shapes and weights", () => {
  assert.throws(() => hatValues([], null), {
    name: "RangeError",
    message: "Cannot compute hat values: the design has no columns",
  });
  assert.throws(() => hatValues([col(1, 2), col(1, 2, 3)], null), {
    name: "RangeError",
    message: "Cannot compute hat values: column 1 has 3 rows, expected 2",
  });
  assert.throws(() => hatValues([col(1, 2)], col(1)), {
    name: "RangeError",
    message: "Cannot compute hat values: 1 weights for 2 rows",
  });
  assert.throws(() => hatValues([col(1, 2)], col(1, -1)), {
    name: "RangeError",
    message: 'Cannot compute hat values: weight "-1" in row 2 is not a finite number ≥ 0',
  });
});

Deno.test("press() sums squared leave-one-out residuals eᵢ/(1 − hᵢ)", () => {
  // Line through (1, 1), (2, 2), (3, 1), (4, 3), (5, 3): hand computation by refitting
  // without each row: leave-one-out residuals equal eᵢ/(1 − hᵢ) (Allen 1974; identity).
  const x = [1, 2, 3, 4, 5], y = [1, 2, 1, 3, 3];
  const h = hatValues([col(1, 1, 1, 1, 1), col(...x)], null);
  // Fit: slope 0.5, intercept 0.5 (Sxy = 5, Sxx = 10); e = y − 0.5 − 0.5x.
  const e = col(...y.map((v, i) => v - 0.5 - 0.5 * x[i]));
  let want = 0;
  for (let k = 0; k < 5; k++) {
    const xs = x.filter((_, i) => i !== k), ys = y.filter((_, i) => i !== k);
    const mx = xs.reduce((a, b) => a + b) / 4, my = ys.reduce((a, b) => a + b) / 4;
    let sxy = 0, sxx = 0;
    xs.forEach((v, i) => {
      sxy += (v - mx) * (ys[i] - my);
      sxx += (v - mx) ** 2;
    });
    const b = sxy / sxx;
    want += (y[k] - (my + b * (x[k] - mx))) ** 2;
  }
  const r = press(e, h);
  assert.ok(Math.abs(r.press! / want - 1) < 1e-14, `${r.press} vs ${want}`);
  assert.ok(Math.abs(r.looRmse! - Math.sqrt(want / 5)) < 1e-14);
});

Deno.test("press() scales residuals by √wᵢ for a weighted fit", () => {
  const r = press(col(1, -1), col(0.5, 0.5), col(4, 1));
  // (2·1/0.5)² + (1·(−1)/0.5)² = 16 + 4 (hand computation).
  assert.ok(Math.abs(r.press! - 20) < 1e-14);
});

Deno.test("press() is null when a leverage is 1", () => {
  assert.deepEqual(press(col(0, 1, -1), col(1, 0.5, 0.5)), { press: null, looRmse: null });
  assert.throws(() => press(col(1, 2), col(0.5)), {
    name: "RangeError",
    message: "Cannot compute PRESS: 2 residuals, 1 hat values",
  });
});
