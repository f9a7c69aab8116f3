import assert from "node:assert/strict";
import { mulDD } from "../dd.ts";
import { parseDecimal } from "../csv/mod.ts";
import { digits, loadStrd } from "./_strd.ts";
import { leastSquares } from "./least_squares.ts";
import { refineLeastSquares } from "./refine_least_squares.ts";
import type { DDVector } from "./dd_least_squares.ts";

/** Each column repeated k times (a NIST set replicated: its certified estimates do not change). */
function replicate(v: Float64Array, k: number): Float64Array {
  const out = new Float64Array(v.length * k);
  for (let r = 0; r < k; r++) out.set(v, r * v.length);
  return out;
}

/** x⁰ … x^degree as hi + lo, each power a double-double product of the last and x (Dekker 1971). */
function powers(xh: Float64Array, xl: Float64Array, degree: number): DDVector[] {
  const out: { hi: Float64Array; lo: Float64Array }[] = [];
  const one = { hi: new Float64Array(xh.length).fill(1), lo: new Float64Array(xh.length) };
  out.push(one);
  const r = new Float64Array(2);
  for (let k = 1; k <= degree; k++) {
    const prev = out[k - 1], hi = new Float64Array(xh.length), lo = new Float64Array(xh.length);
    for (let i = 0; i < xh.length; i++) {
      mulDD(prev.hi[i], prev.lo[i], xh[i], xl[i], r);
      hi[i] = r[0], lo[i] = r[1];
    }
    out.push({ hi, lo });
  }
  return out;
}

for (const [name, degree, k] of [["Filip", 10, 244], ["Wampler4", 5, 952]] as const) {
  Deno.test(`refineLeastSquares() keeps 12 digits on NIST StRD ${name} replicated ${k} times`, async () => {
    const set = await loadStrd(name);
    if (!set) return;
    const [yh, xh] = set.data.map((v) => replicate(v, k));
    const [yl, xl] = set.lo.map((v) => replicate(v, k));
    const cols = powers(xh, xl, degree);
    const ls = leastSquares(
      cols.map((c) => Float64Array.from(c.hi)),
      yh,
      cols.map((_, j) => `b${j}`),
    );
    assert.ok(ls.fullRank);
    const r = refineLeastSquares(ls, cols, { hi: yh, lo: yl }, null);
    assert.ok(r !== null, "refinement applies");
    // Certified values: NIST StRD (manifest.json); replication leaves them unchanged.
    let before = 15, after = 15;
    set.parameters.forEach((c, j) => {
      before = Math.min(before, digits(ls.coefficients[j], c.estimate));
      after = Math.min(after, digits(r.coefficients[j] + r.coefficientsLo[j], c.estimate));
    });
    assert.ok(
      after >= 12,
      `${name}: ${after.toFixed(1)} digits refined (double ${before.toFixed(1)})`,
    );
    assert.ok(after > before, `${name}: refined ${after.toFixed(1)} ≤ double ${before.toFixed(1)}`);
    // RSS scales with k (NIST certifies RSS of the set as printed).
    const rss = r.rss + r.rssLo;
    assert.ok(digits(rss, k * set.residual_sum_of_squares) >= 12, `${name} RSS ${rss}`);
  });
}

Deno.test("refineLeastSquares() with row scales reaches an exact weighted fit", () => {
  // y = 0.1 + 0.2x exactly as printed, any positive weights: the fit is the line itself and
  // RSS = 0 (exact fit; common practice, no source). lo parts: the printed decimals less doubles.
  const x = Float64Array.from({ length: 50 }, (_, i) => i);
  const printed = Array.from(
    x,
    (_, i) => parseDecimal(`${Math.floor((1 + 2 * i) / 10)}.${(1 + 2 * i) % 10}`),
  );
  const yh = Float64Array.from(printed, (v) => v[0]), yl = Float64Array.from(printed, (v) => v[1]);
  const w = x.map((v) => 1 / Math.sqrt(1 + v));
  const one = new Float64Array(50).fill(1);
  const ls = leastSquares(
    [one.map((v, i) => v * w[i]), x.map((v, i) => v * w[i])],
    yh.map((v, i) => v * w[i]),
    ["a", "b"],
  );
  assert.ok(ls.fullRank);
  const r = refineLeastSquares(
    ls,
    [{ hi: one, lo: null }, { hi: x, lo: null }],
    { hi: yh, lo: yl },
    w,
  )!;
  assert.ok(
    Math.abs(r.coefficients[0] + r.coefficientsLo[0] - 0.1) < 1e-17,
    `a ${r.coefficients[0]}`,
  );
  assert.ok(
    Math.abs(r.coefficients[1] + r.coefficientsLo[1] - 0.2) < 1e-17,
    `b ${r.coefficients[1]}`,
  );
  assert.ok(r.rss < 1e-28, `rss ${r.rss}`);
});

Deno.test("refineLeastSquares() declines a design too ill-conditioned to converge", () => {
  // Columns x and x + 1e−14·sin(i): κ about 4e14, so 4·κ·u·c(m) is not below 1/2 (module notes).
  const x = Float64Array.from({ length: 200 }, (_, i) => 1 + i / 200);
  const z = x.map((v, i) => v + 1e-14 * Math.sin(i));
  const y = x.map((v) => 2 * v);
  const ls = leastSquares([x, z], y, ["a", "b"]);
  if (!ls.fullRank) return; // declined earlier, as rank-deficient
  assert.equal(
    refineLeastSquares(ls, [{ hi: x, lo: null }, { hi: z, lo: null }], { hi: y, lo: null }, null),
    null,
  );
});
