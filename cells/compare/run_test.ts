import assert from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { compare, fitOf, makeTable, wiggle } from "./_fixtures_test.ts";
import type { CellOutput } from "../../kernel/contract/mod.ts";

const x = Float64Array.from({ length: 10 }, (_, i) => i + 1);
const noise = wiggle(10, 0.2);
const y = x.map((v, i) => Math.exp(0.2 * v) * (1 + 0.05 * noise[i]));

/** Asserts that comparing throws a CellError with this message at this path. */
function refuses(fits: Record<string, CellOutput>, message: string, path: (string | number)[]) {
  assert.throws(() => compare(fits), (e: unknown) => {
    assert.ok(e instanceof CellError, `expected CellError, got ${e}`);
    assert.equal(e.message, message);
    assert.deepEqual(e.path, path);
    return true;
  });
}

Deno.test("compare refuses fits on different rows, naming the counts and the rows", () => {
  const gaps = y.map((v, i) => (i === 2 || i === 6 ? NaN : v));
  refuses(
    {
      all: fitOf("all", "y = a + b*x", makeTable({ x, y })),
      some: fitOf("some", "y = a + b*x", makeTable({ x, y: gaps })),
    },
    'Cannot compare "cmp": fits "all" and "some" are on different rows: "all" uses 10 rows, "some" uses 8; only "all" uses rows 3, 7',
    ["fits", 1],
  );
});

Deno.test("compare refuses different response columns and different response values", () => {
  const table = makeTable({ x, y, z: y.map((v) => 2 * v) });
  refuses(
    { a: fitOf("a", "y = a + b*x", table), b: fitOf("b", "z = a + b*x", table) },
    'Cannot compare "cmp": fits "a" and "b" model different responses: "a" models column "y", "b" models column "z"',
    ["fits", 1],
  );
  const other = makeTable({ x, y: y.map((v, i) => (i === 4 ? v + 1 : v)) });
  refuses(
    { a: fitOf("a", "y = a + b*x", table), b: fitOf("b", "log(y) = a + b*x", other) },
    'Cannot compare "cmp": fits "a" and "b" have different values of response column "y" (fitted on tables "data" and "data") in row 5',
    ["fits", 1],
  );
});

Deno.test("compare refuses known σ beside other weighting, different known σ and different k conventions", () => {
  const table = makeTable({ x, y, sd: x.map((v) => 0.1 * v) });
  const plain = fitOf("plain", "y = a + b*x", table);
  refuses(
    { plain, known: fitOf("known", "y = a + b*x", table, { known_sigma: "sd" }) },
    'Cannot compare "cmp": fits "plain" and "known" are weighted differently: "plain" is unweighted, "known" is weighted by known standard deviations: known standard deviations fix the error scale that the other fit estimates',
    ["fits", 1],
  );
  refuses(
    {
      s1: fitOf("s1", "y = a + b*x", table, { known_sigma: "sd" }),
      s2: fitOf("s2", "y = a + b*x + c*x^2", table, { known_sigma: "2*sd^0.5" }),
    },
    'Cannot compare "cmp": fits "s1" and "s2" have different known standard deviations in rows 1, 2, 3, 4, 5 and 5 more',
    ["fits", 1],
  );
  refuses(
    { plain, only: fitOf("only", "y = polynomial(x, 2)", table, { count_variance: false }) },
    'Cannot compare "cmp": fits "plain" and "only" count parameters differently for the criteria: "plain" uses k = p + 1: mean parameters and the error variance; "only" uses k = p: mean parameters only (count_variance: false): set count_variance alike',
    ["fits", 1],
  );
});

Deno.test("compare refuses an input that is not a fit and a response with no inverse", () => {
  const table = makeTable({ x, y });
  refuses(
    { a: fitOf("a", "y = a + b*x", table), data: table },
    'Cannot compare "cmp": cell "data" gives no fit',
    ["fits", 1],
  );
  refuses(
    { a: fitOf("a", "y = a + b*x", table), b: fitOf("b", "y + y^2 = a + b*x", table) },
    'Cannot compare "cmp": the response "y + y^2" cannot be undone to column "y": the criteria on the original scale need a one-to-one transform such as log(y), sqrt(y) or 1/y',
    ["fits", 1],
  );
});

Deno.test("compare puts log L of log(y), sqrt(y) and 1/y on the original scale by the log-Jacobian", () => {
  // log L_y = log L_z + Σ ln|g′(yᵢ)| (Box & Cox 1964, §2): g′ = 1/y, 1/(2√y), −1/y².
  const table = makeTable({ x, y });
  const fits = {
    raw: fitOf("raw", "y = a + b*x", table),
    log: fitOf("log", "log(y) = a + b*x", table),
    root: fitOf("root", "sqrt(y) = a + b*x", table),
    inverse: fitOf("inverse", "1/y = a + b*x", table),
  };
  const { result } = compare(fits, { by: "aic" });
  const sumLog = y.reduce((s, v) => s + Math.log(v), 0);
  const want = [0, -sumLog, -(10 * Math.log(2) + 0.5 * sumLog), -2 * sumLog];
  result.rows.forEach((r, i) => {
    assert.ok(Math.abs(r.log_jacobian - want[i]) < 1e-12 * (1 + Math.abs(want[i])), r.fit);
    const orig = r.log_likelihood! + want[i];
    assert.ok(Math.abs(r.log_likelihood_original_scale! - orig) < 1e-12 * Math.abs(orig), r.fit);
    assert.ok(Math.abs(r.aic! - (2 * r.k - 2 * orig)) < 1e-11 * Math.abs(r.aic!), r.fit);
    assert.ok(Math.abs(r.bic! - (r.k * Math.log(10) - 2 * orig)) < 1e-11 * Math.abs(r.bic!));
  });
  // y grows exponentially with a 5% multiplicative wiggle: log(y) is the right scale.
  assert.equal(result.preferred, "log");
  assert.match(result.criteria_scale, /log-Jacobian/);
});

Deno.test("compare gives Akaike weights exp(−Δ/2)/Σ that sum to 1, and none for loo", () => {
  // Burnham & Anderson 2002, §2.9.
  const table = makeTable({ x, y });
  const fits = {
    line: fitOf("line", "y = a + b*x", table),
    quad: fitOf("quad", "y = polynomial(x, 2)", table),
    expo: fitOf("expo", "log(y) = a + b*x", table),
  };
  const { result } = compare(fits);
  assert.equal(result.by, "aicc");
  const rel = result.rows.map((r) => Math.exp(-r.delta! / 2));
  const sum = rel.reduce((a, b) => a + b, 0);
  result.rows.forEach((r, i) => assert.ok(Math.abs(r.weight! - rel[i] / sum) < 1e-15));
  assert.ok(Math.abs(result.rows.reduce((s, r) => s + r.weight!, 0) - 1) < 1e-15);
  const best = result.rows.find((r) => r.fit === result.preferred)!;
  assert.equal(best.delta, 0);
  assert.equal(best.rank, 1);
  assert.equal(best.aicc, Math.min(...result.rows.map((r) => r.aicc!)));

  const loo = compare(fits, { by: "loo" }).result;
  assert.ok(loo.rows.every((r) => r.weight === null));
  const min = Math.min(...loo.rows.map((r) => r.loo_rmse!));
  loo.rows.forEach((r) => assert.ok(Math.abs(r.delta! - (r.loo_rmse! - min)) < 1e-15));
  assert.match(loo.verdict, /no published evidence scale/);
});
