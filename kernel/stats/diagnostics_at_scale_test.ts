/**
 * The linear-time routes of the check's diagnostics (issue 16) against the
 * routes they replaced, kept here as oracles: grouping by string keys, a
 * comparison sort, the Durbin–Watson traces as dot products of n-long
 * columns, the auxiliary regressions by a QR of the whole augmented design.
 * Exact-arithmetic comparisons live in cells/check/at_scale_test.ts (kernel
 * tests may not import cells/).
 *
 * @module
 */
import assert from "node:assert/strict";
import { seededRandom } from "../random.ts";
import { factorOfQR, householderQR } from "../linalg/mod.ts";
import { groupRows, lackOfFit } from "./lack_of_fit.ts";
import { orderBy } from "./sign_runs.ts";
import { durbinWatsonTest, tracesOfBasis, tracesOfFactor } from "./durbin_watson.ts";
import { orthonormalBasis } from "./_orthonormal_basis.ts";
import { auxiliaryRegression, splitOnBase } from "./_auxiliary.ts";
import { breuschPagan } from "./breusch_pagan.ts";
import { ramseyReset } from "./ramsey_reset.ts";
import { conditionNumber, conditionNumberOfFactor } from "./condition_number.ts";
import { varianceInflation, varianceInflationOfFactor } from "./variance_inflation.ts";

const rnd = seededRandom(16);

/** Values from a small set, so rows repeat; −0, 0 and NaN among them. */
function repeating(n: number, values: number[]): Float64Array {
  return Float64Array.from({ length: n }, () => values[Math.floor(rnd() * values.length)]);
}

/** The partition the check used before: rows keyed by String of their values. */
function stringGroups(columns: Float64Array[], n: number): Int32Array {
  const seen = new Map<string, number>(), out = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    const key = columns.map((c) => String(c[i])).join("\u0000");
    if (!seen.has(key)) seen.set(key, seen.size);
    out[i] = seen.get(key)!;
  }
  return out;
}

Deno.test("groupRows() groups exactly as String keys did: −0 with 0, NaN with NaN, first row first", () => {
  const n = 5000;
  const a = repeating(n, [1, 2.5, -0, 0, NaN, 1e-300, -7]);
  const b = repeating(n, [0.1, 0.2, 0.30000000000000004, 0.3]);
  const g = groupRows([a, b], n);
  const want = stringGroups([a, b], n);
  assert.deepEqual(g.group, want);
  assert.equal(g.count, Math.max(...want) + 1);
  // Distinct doubles that print alike to 16 digits stay apart (0.3 and 0.30000000000000004).
  const c = Float64Array.of(0.3, 0.1 + 0.2, 0.3);
  assert.deepEqual([...groupRows([c], 3).group], [0, 1, 0]);
});

Deno.test("groupRows() on distinct rows gives n groups (a million-row design has no replicates)", () => {
  const n = 20_000, x = Float64Array.from({ length: n }, () => rnd.normal());
  assert.equal(groupRows([x, x.map((v) => -v)], n).count, n);
});

Deno.test("lackOfFit() equals the string-keyed computation it replaced, bit for bit", () => {
  const n = 3000;
  const x1 = repeating(n, [1, 2, 3, 4, 5]), x2 = repeating(n, [-1, 0, 1]);
  const y = x1.map((v, i) => 1 + v + 0.3 * v * v - x2[i] + rnd.normal());
  const w = Float64Array.from({ length: n }, () => 0.5 + rnd());
  // Residuals of some line: the test reads them only for RSS.
  const e = y.map((v, i) => v - (2 + 1.5 * x1[i] - x2[i]));
  for (const weights of [null, w]) {
    const got = lackOfFit([x1, x2], y, e, 3, weights)!;
    // The old algorithm (Draper & Smith §2.1): groups in order of first row, rows in row order.
    const key = stringGroups([x1, x2], n), m = Math.max(...key) + 1;
    const wt = (i: number) => weights ? weights[i] : 1;
    let ssPe = 0;
    for (let g = 0; g < m; g++) {
      const rows = [...key.keys()].filter((i) => key[i] === g);
      let sw = 0, swy = 0;
      for (const i of rows) {
        sw += wt(i);
        swy += wt(i) * y[i];
      }
      for (const i of rows) ssPe += wt(i) * (y[i] - swy / sw) ** 2;
    }
    assert.equal(got.ss_pure_error, ssPe);
    assert.equal(got.levels, m);
    assert.equal(got.df2, n - m);
  }
});

Deno.test("orderBy() orders as the comparison x[a] − x[b] || a − b did, in linear time", () => {
  const n = 10_000;
  const x = repeating(n, [3, -1, 0, -0, -2.5, Infinity, -Infinity, 1e-310, -1e-310, 7.25]);
  for (let i = 0; i < n; i += 7) x[i] = rnd.normal() * 1e5;
  const want = Array.from({ length: n }, (_, i) => i).sort((a, b) => x[a] - x[b] || a - b);
  assert.deepEqual([...orderBy(x)], want);
  assert.deepEqual([...orderBy(Float64Array.of(2, 2, 2))], [0, 1, 2]);
  assert.equal(orderBy(new Float64Array(0)).length, 0);
});

/** A seeded design: intercept and k normal columns with scales 10^(j/3), n rows. */
function design(n: number, k: number): Float64Array[] {
  return [
    new Float64Array(n).fill(1),
    ...Array.from(
      { length: k },
      (_, j) => Float64Array.from({ length: n }, () => 10 ** ((j + 1) / 3) * rnd.normal()),
    ),
  ];
}

function factorOf(cols: Float64Array[], weights: Float64Array | null = null) {
  const n = cols[0].length, p = cols.length;
  const a = new Float64Array(n * p);
  cols.forEach((c, j) => {
    for (let i = 0; i < n; i++) a[i + j * n] = c[i] * (weights ? Math.sqrt(weights[i]) : 1);
  });
  return factorOfQR(householderQR(a, n, p), new Float64Array(p).fill(1));
}

Deno.test("Durbin–Watson traces through the factor equal those of the basis and the dense definition", () => {
  const n = 60, cols = design(n, 3), w = Float64Array.from({ length: n }, () => 0.5 + rnd());
  for (const weights of [null, w]) {
    const basis = orthonormalBasis(cols, weights);
    const viaRows = tracesOfFactor(factorOf(cols, weights), cols, weights);
    const viaBasis = tracesOfBasis(basis, n);
    // The definition (module notes of durbin_watson.ts): A = DᵀD as an n×n matrix, dot products.
    const A = (q: Float64Array) =>
      q.map((_, i) => (i > 0 ? q[i] - q[i - 1] : 0) + (i < n - 1 ? q[i] - q[i + 1] : 0));
    const dot = (a: Float64Array, b: Float64Array) => a.reduce((s, v, i) => s + v * b[i], 0);
    const aq = basis.map(A);
    const trHA = basis.reduce((s, q, k) => s + dot(q, aq[k]), 0);
    const trHA2 = aq.reduce((s, v) => s + dot(v, v), 0);
    const trHAHA = basis.reduce((s, q) => s + aq.reduce((t, v) => t + dot(q, v) ** 2, 0), 0);
    for (const t of [viaRows, viaBasis]) {
      assert.ok(Math.abs(t.trHA - trHA) <= 1e-13 * trHA, `tr(HA) ${t.trHA} vs ${trHA}`);
      assert.ok(Math.abs(t.trHA2 - trHA2) <= 1e-13 * trHA2, `tr(HA²) ${t.trHA2} vs ${trHA2}`);
      assert.ok(Math.abs(t.trHAHA - trHAHA) <= 1e-13 * trHAHA, `tr(HAHA) ${t.trHAHA}`);
    }
  }
});

Deno.test("durbinWatsonTest() beyond the exact law's df gives the same moments from rows as from the basis", () => {
  const n = 2100, cols = design(n, 3);
  const e = Float64Array.from({ length: n }, () => rnd.normal());
  const f = factorOf(cols);
  const a = durbinWatsonTest(e, cols, null)!;
  const b = durbinWatsonTest(e, cols, null, () => {
    throw new Error("the basis is not formed beyond the exact law's df");
  }, { rank: f.p, traces: () => tracesOfFactor(f, cols, null) })!;
  assert.equal(a.distribution, "beta");
  for (const k of ["expected", "variance", "z", "p_value"] as const) {
    assert.ok(Math.abs(a[k] - b[k]) <= 1e-12 * Math.abs(a[k]), `${k}: ${a[k]} vs ${b[k]}`);
  }
});

Deno.test("splitOnBase() gives the RSS of the full regression and declines near the design's span", () => {
  const n = 500, cols = design(n, 3);
  const qr = householderQR(packed(cols), n, cols.length);
  const z = Float64Array.from({ length: n }, () => rnd.normal());
  const y = cols[2].map((v, i) => 0.5 * v + z[i] + rnd.normal());
  const full = auxiliaryRegression([...cols, z], y)!;
  const split = splitOnBase(qr, packed([z, y]), 1)!;
  assert.ok(Math.abs(split.rss - full.rss) <= 1e-12 * full.rss);
  let yy = 0;
  for (const v of y) yy += v * v;
  assert.ok(Math.abs(split.rss + split.explained - yy) <= 1e-12 * yy, "RSS + ESS = ‖y‖²");
  // A column in the design's span (a combination of two of its columns): the full QR decides.
  const inSpan = cols[1].map((v, i) => v - 2 * cols[3][i]);
  assert.equal(splitOnBase(qr, packed([inSpan, y]), 1), null);
  assert.equal(auxiliaryRegression([...cols, inSpan], y), null);
  // Other rows than the factor's.
  assert.equal(splitOnBase(qr, new Float64Array(2 * (n + 1)), 1), null);
});

function packed(cols: Float64Array[]): Float64Array {
  const n = cols[0].length, out = new Float64Array(n * cols.length);
  cols.forEach((c, j) => out.set(c, j * n));
  return out;
}

Deno.test("breuschPagan() and ramseyReset() through the fit's QR agree with the full regressions", () => {
  const n = 400, cols = design(n, 3);
  const e = cols[1].map((v) => (1 + 0.1 * Math.abs(v)) * rnd.normal());
  const fitted = cols[0].map((_, i) => 2 + cols[1][i] - 0.5 * cols[3][i]);
  const qr = householderQR(packed(cols), n, cols.length);
  for (const variant of ["koenker", "original"] as const) {
    const a = breuschPagan(e, cols, null, variant)!, b = breuschPagan(e, cols, null, variant, qr)!;
    assert.ok(Math.abs(a.statistic - b.statistic) <= 1e-11 * a.statistic, variant);
    assert.ok(Math.abs(a.f! - b.f!) <= 1e-11 * a.f!);
  }
  // Without a constant column Breusch–Pagan adds one; the QR of the design alone still serves.
  const noConst = cols.slice(1), qr2 = householderQR(packed(noConst), n, noConst.length);
  const c = breuschPagan(e, noConst, null)!, d = breuschPagan(e, noConst, null, "koenker", qr2)!;
  assert.ok(Math.abs(c.statistic - d.statistic) <= 1e-11 * c.statistic);
  assert.equal(d.df, 3);
  const r1 = ramseyReset(e, fitted, cols, null)!, r2 = ramseyReset(e, fitted, cols, null, qr)!;
  assert.ok(Math.abs(r1.f - r2.f) <= 1e-10 * r1.f, `${r1.f} vs ${r2.f}`);
  assert.equal(r2.df2, n - cols.length - 2);
  // ŷ taking two values: ŷ², ŷ³ lie in the span; the fast route declines and the full one says null.
  const two = cols[0].map((_, i) => (i % 2 ? 1 : 0));
  const qrTwo = householderQR(packed([cols[0], two]), n, 2);
  assert.equal(ramseyReset(e, two.map((v) => 3 + v), [cols[0], two], null, qrTwo), null);
});

Deno.test("conditionNumberOfFactor() and varianceInflationOfFactor() equal the design's own routes", () => {
  const n = 300, cols = design(n, 4), names = ["b0", "a", "b", "c", "d"];
  cols[4] = cols[4].map((v, i) => v + 30 * cols[3][i]); // some collinearity
  const w = Float64Array.from({ length: n }, () => 0.5 + rnd());
  for (const weights of [null, w]) {
    const f = factorOf(cols, weights);
    const k = conditionNumber(cols, weights)!;
    assert.ok(Math.abs(conditionNumberOfFactor(f)! - k) <= 1e-12 * k);
    const old = varianceInflation(cols, names, weights);
    const now = varianceInflationOfFactor(f, cols, names, weights)!;
    assert.deepEqual(Object.keys(now), Object.keys(old));
    for (const name of Object.keys(old)) {
      assert.ok(Math.abs(now[name]! - old[name]!) <= 1e-12 * old[name]!, name);
    }
  }
  // A factor that covers fewer columns (rank-deficient): null, the caller uses varianceInflation.
  const aliased = [cols[0], cols[1], cols[1].map((v) => 2 * v)];
  assert.equal(varianceInflationOfFactor(factorOf(aliased), aliased, ["b0", "a", "b"], null), null);
});
