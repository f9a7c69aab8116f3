import assert from "node:assert/strict";
import { shapiroWilk } from "./shapiro_wilk.ts";

Deno.test("shapiroWilk() reproduces Shapiro & Wilk's (1965) worked example", () => {
  // Shapiro & Wilk (1965), Biometrika 52:591–611, §4 example: weights of 11 men,
  // W = 0.79 as printed (from memory); the AS R94 coefficients give 0.7888 ≈ 0.79.
  const t = shapiroWilk([148, 154, 158, 160, 161, 162, 166, 170, 182, 195, 236]);
  assert.equal(t.w.toFixed(2), "0.79");
  // The paper finds W below its 1% point (0.792, from memory): p < 0.01.
  assert.ok(t.p_value < 0.01, String(t.p_value));
});

Deno.test("shapiroWilk() gives the exact n = 3 value and p-value", () => {
  // n = 3: a = (−1/√2, 0, 1/√2), W = (x₃ − x₁)²/(2·SS); x = (1, 2, 4): W = 4.5/(42/9) = 27/28,
  // p = 6/π·(asin √W − π/3) (Royston 1995, AS R94; hand computation).
  const t = shapiroWilk([4, 1, 2]);
  assert.ok(Math.abs(t.w - 27 / 28) < 1e-15);
  const p = 6 / Math.PI * (Math.asin(Math.sqrt(27 / 28)) - Math.PI / 3);
  assert.ok(Math.abs(t.p_value - p) < 1e-14);
});

Deno.test("shapiroWilk() is invariant to location, scale and order", () => {
  const x = [2.1, -0.3, 1.7, 0.4, 3.3, -1.2, 0.9, 0.0, 2.6, -0.8, 1.1, 5.9, 0.2];
  const a = shapiroWilk(x), b = shapiroWilk(x.map((v) => 1000 + 7 * v).reverse());
  assert.ok(Math.abs(a.w - b.w) < 1e-12 && Math.abs(a.p_value - b.p_value) < 1e-10);
});

Deno.test("shapiroWilk() refuses too few, too many, equal and non-finite values", () => {
  assert.throws(() => shapiroWilk([1, 2]), {
    name: "RangeError",
    message: 'Cannot run Shapiro–Wilk on "2" values: it needs 3 to 5000',
  });
  assert.throws(() => shapiroWilk(new Float64Array(5001)), {
    name: "RangeError",
    message: 'Cannot run Shapiro–Wilk on "5001" values: it needs 3 to 5000',
  });
  assert.throws(() => shapiroWilk([3, 3, 3, 3]), {
    name: "RangeError",
    message: "Cannot run Shapiro–Wilk: all values are equal",
  });
  assert.throws(() => shapiroWilk([1, NaN, 3]), {
    name: "RangeError",
    message: 'Cannot run Shapiro–Wilk: value 2 is "NaN", not a finite number',
  });
});
