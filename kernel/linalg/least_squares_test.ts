import assert from "node:assert/strict";
import { leastSquares, type LeastSquaresResult } from "./least_squares.ts";
import { describeAliased } from "./describe_aliased.ts";
import { digits, loadStrd } from "./_strd.ts";
import { seededRandom } from "../random.ts";

// ---------------------------------------------------------------------------
// Exact rational arithmetic for reference answers (test only).

class Q {
  constructor(readonly n: bigint, readonly d: bigint = 1n) {
    if (d < 0n) [this.n, this.d] = [-n, -d];
    const g = gcd(this.n < 0n ? -this.n : this.n, this.d);
    if (g > 1n) [this.n, this.d] = [this.n / g, this.d / g];
  }
  add(o: Q) {
    return new Q(this.n * o.d + o.n * this.d, this.d * o.d);
  }
  sub(o: Q) {
    return new Q(this.n * o.d - o.n * this.d, this.d * o.d);
  }
  mul(o: Q) {
    return new Q(this.n * o.n, this.d * o.d);
  }
  div(o: Q) {
    return new Q(this.n * o.d, this.d * o.n);
  }
  get value() {
    return Number(this.n) / Number(this.d);
  }
}
function gcd(a: bigint, b: bigint): bigint {
  while (b) [a, b] = [b, a % b];
  return a;
}

/** Solves M·X = B exactly by Gauss–Jordan elimination over the rationals. */
function solveExact(mat: Q[][], rhs: Q[][]): Q[][] {
  const p = mat.length;
  const a = mat.map((row, i) => [...row, ...rhs[i]]);
  for (let c = 0; c < p; c++) {
    const r = a.findIndex((row, i) => i >= c && row[c].n !== 0n);
    [a[c], a[r]] = [a[r], a[c]];
    const piv = a[c][c];
    a[c] = a[c].map((v) => v.div(piv));
    for (let i = 0; i < p; i++) {
      if (i === c) continue;
      const f = a[i][c];
      a[i] = a[i].map((v, j) => v.sub(f.mul(a[c][j])));
    }
  }
  return a.map((row) => row.slice(p));
}

function expectFit(r: LeastSquaresResult) {
  if (!r.fullRank) throw new Error(`expected a full-rank fit, got aliased ${r.aliased}`);
  return r;
}

Deno.test("leastSquares() matches the exact rational solution of a small integer problem", () => {
  // Quadratic in x on 6 integer points; the exact β, RSS and (XᵀX)⁻¹ come from the
  // normal equations solved in exact rational arithmetic below (exact, so the
  // normal equations are safe here). Double precision should agree to ~1e-13.
  const x = [0, 1, 2, 3, 4, 5], y = [3, 1, 4, 1, 5, 9];
  const cols = [x.map(() => 1), x, x.map((v) => v * v)];
  const xtx = cols.map((a) =>
    cols.map((b) => new Q(BigInt(a.reduce((s, v, i) => s + v * b[i], 0))))
  );
  const xty = cols.map((a) => [new Q(BigInt(a.reduce((s, v, i) => s + v * y[i], 0)))]);
  const identity = cols.map((_, i) => cols.map((_, j) => new Q(i === j ? 1n : 0n)));
  const beta = solveExact(xtx, xty).map((r) => r[0]);
  const inv = solveExact(xtx, identity);
  let rss = new Q(0n);
  y.forEach((yi, i) => {
    const f = cols.reduce((s, c, j) => s.add(beta[j].mul(new Q(BigInt(c[i])))), new Q(0n));
    const e = new Q(BigInt(yi)).sub(f);
    rss = rss.add(e.mul(e));
  });

  const r = expectFit(
    leastSquares(cols.map((c) => Float64Array.from(c)), Float64Array.from(y), ["a", "b", "c"]),
  );
  const close = (got: number, want: number, what: string) =>
    assert.ok(
      Math.abs(got - want) <= 1e-13 * Math.max(1, Math.abs(want)),
      `${what}: ${got} vs ${want}`,
    );
  beta.forEach((b, j) => close(r.coefficients[j], b.value, `beta ${j}`));
  close(r.rss, rss.value, "rss");
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      close(r.unscaledCovariance[i + 3 * j], inv[i][j].value, `cov ${i},${j}`);
    }
  }
  assert.equal(r.rank, 3);
  assert.deepEqual(r.aliased, []);
});

Deno.test("leastSquares() reports an exactly duplicated column as a multiple of the first", () => {
  const one = new Float64Array(5).fill(1), x = new Float64Array([1, 2, 3, 5, 8]);
  const r = leastSquares([one, x, x.slice()], new Float64Array([1, 2, 3, 4, 5]), [
    "b0",
    "x",
    "x again",
  ]);
  assert.equal(r.fullRank, false);
  assert.equal(r.rank, 2);
  assert.deepEqual(r.aliased, ["x again"]);
  assert.deepEqual(r.aliasing[0].of, ["x"]);
  assert.ok(Math.abs(r.aliasing[0].coefficients[0] - 1) < 1e-14);
  assert.equal(describeAliased(r.aliasing[0]), 'column "x again" is a multiple of "x"');
  assert.equal(r.conditionEstimate > 1e15, true);
});

Deno.test("leastSquares() names x3 = x1 + 2·x2 as aliased with its multipliers", () => {
  // Hand construction: x3 is exactly x1 + 2·x2 in integers. x3 has the largest
  // norm, so pivoted QR would take it first; the report still names the later column.
  const rnd = seededRandom(42);
  const m = 20;
  const x1 = Float64Array.from({ length: m }, () => Math.round(10 * rnd()));
  const x2 = Float64Array.from({ length: m }, () => Math.round(10 * rnd()));
  const x3 = x1.map((v, i) => v + 2 * x2[i]);
  const one = new Float64Array(m).fill(1);
  const y = Float64Array.from({ length: m }, () => rnd());
  const r = leastSquares([one, x1, x2, x3], y, ["intercept", "x1", "x2", "x3"]);
  assert.equal(r.fullRank, false);
  assert.deepEqual(r.aliased, ["x3"]);
  assert.deepEqual(r.aliasing[0].of, ["x1", "x2"]);
  r.aliasing[0].coefficients.forEach((c, k) =>
    assert.ok(Math.abs(c - [1, 2][k]) < 1e-12, `multiplier ${c}`)
  );
  assert.equal(
    describeAliased(r.aliasing[0]),
    'column "x3" is a linear combination of "x1" and "x2"',
  );
});

Deno.test("leastSquares() reports a zero column as zero in every row", () => {
  const r = leastSquares(
    [new Float64Array([1, 1, 1]), new Float64Array(3)],
    new Float64Array([1, 2, 3]),
    [
      "a",
      "z",
    ],
  );
  assert.equal(r.fullRank, false);
  assert.equal(describeAliased(r.aliasing[0]), 'column "z" is zero in every row');
});

Deno.test("leastSquares() fits a square system exactly (m = p) and a single column (p = 1)", () => {
  const sq = expectFit(
    leastSquares([new Float64Array([1, 1]), new Float64Array([1, 3])], new Float64Array([2, 8]), [
      "a",
      "b",
    ]),
  );
  // a + b = 2, a + 3b = 8 → b = 3, a = −1 (hand computation)
  assert.ok(Math.abs(sq.coefficients[0] + 1) < 1e-14 && Math.abs(sq.coefficients[1] - 3) < 1e-14);
  assert.ok(sq.rss < 1e-28);
  const one = expectFit(
    leastSquares([new Float64Array([1, 2, 3])], new Float64Array([2, 4, 7]), ["s"]),
  );
  // β = Σxy/Σx² = 31/14 (hand computation)
  assert.ok(Math.abs(one.coefficients[0] - 31 / 14) < 1e-15);
  assert.ok(Math.abs(one.unscaledCovariance[0] - 1 / 14) < 1e-16);
});

Deno.test("leastSquares() refuses more columns than rows as rank-deficient", () => {
  const r = leastSquares(
    [new Float64Array([1, 1]), new Float64Array([1, 2]), new Float64Array([1, 4])],
    new Float64Array([0, 1]),
    ["a", "b", "c"],
  );
  assert.equal(r.fullRank, false);
  assert.deepEqual(r.aliased, ["c"]);
  assert.equal(r.conditionEstimate, Infinity);
});

Deno.test("leastSquares() throws RangeError for no columns, ragged columns and a NaN response", () => {
  assert.throws(() => leastSquares([], new Float64Array(3), []), {
    name: "RangeError",
    message: "Cannot solve least squares with no columns: need at least one",
  });
  assert.throws(() => leastSquares([new Float64Array(2)], new Float64Array(3), ["x"]), {
    name: "RangeError",
    message: 'Cannot solve least squares: column "x" has 2 rows, the response 3',
  });
  assert.throws(() => leastSquares([new Float64Array(1)], new Float64Array([NaN]), ["x"]), {
    name: "RangeError",
    message: 'Cannot solve least squares: response row 0 is "NaN", not a finite number',
  });
});

Deno.test("leastSquares() gives the same fitted values whatever the column units (property)", () => {
  // Property (common practice, no source): rescaling columns rescales β inversely
  // and leaves fitted values unchanged; checked on 20 seeded problems with
  // scales 10^±6, to 1e-10 relative.
  const rnd = seededRandom(2024);
  for (let trial = 0; trial < 20; trial++) {
    const m = 15 + Math.floor(30 * rnd()), p = 1 + Math.floor(5 * rnd());
    const cols = Array.from(
      { length: p },
      () => Float64Array.from({ length: m }, () => rnd.normal()),
    );
    const y = Float64Array.from({ length: m }, () => rnd.normal());
    const scales = cols.map(() => 10 ** (12 * rnd() - 6));
    const names = cols.map((_, j) => `x${j}`);
    const a = expectFit(leastSquares(cols, y, names));
    const b = expectFit(leastSquares(cols.map((c, j) => c.map((v) => v * scales[j])), y, names));
    const ynorm = Math.hypot(...y);
    a.fitted.forEach((f, i) =>
      assert.ok(Math.abs(f - b.fitted[i]) <= 1e-10 * ynorm, `trial ${trial} row ${i}`)
    );
    a.coefficients.forEach((c, j) =>
      assert.ok(
        Math.abs(c - b.coefficients[j] * scales[j]) <= 1e-10 * Math.abs(c) + 1e-14,
        `trial ${trial} β${j}`,
      )
    );
  }
});

Deno.test("leastSquares() reproduces NIST StRD Norris to at least 9 significant digits", async () => {
  // Source: NIST StRD, Norris (lower difficulty), certified values in Norris.dat /
  // manifest.json. Double precision with QR should give ≥ 9 digits (LRE, McCullough
  // 1998, "Assessing the reliability of statistical software", Am. Statistician 52; from memory).
  const set = await loadStrd("Norris");
  if (!set) return;
  const [y, x] = set.data;
  const r = expectFit(leastSquares([new Float64Array(y.length).fill(1), x], y, ["B0", "B1"]));
  const df = y.length - 2;
  const sigma = Math.sqrt(r.rss / df);
  set.parameters.forEach((p, j) => {
    assert.ok(
      digits(r.coefficients[j], p.estimate) >= 9,
      `${p.name}: ${r.coefficients[j]} vs ${p.estimate}`,
    );
    const se = sigma * Math.sqrt(r.unscaledCovariance[j + 2 * j]);
    assert.ok(digits(se, p.std_dev) >= 9, `se(${p.name}): ${se} vs ${p.std_dev}`);
  });
  assert.ok(digits(r.rss, set.residual_sum_of_squares) >= 9, `rss ${r.rss}`);
  assert.ok(digits(sigma, set.residual_std_dev) >= 9, `sigma ${sigma}`);
  assert.equal(df, set.degrees_of_freedom);
});
