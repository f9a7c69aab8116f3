import { fitPage } from "./view.tsx";
import assert from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { digits, loadStrd } from "../../kernel/linalg/_strd.ts";
import { fitKind } from "./mod.ts";
import { makeTable, parseContext, runContext } from "./_fixtures_test.ts";
import type { Table } from "../../kernel/contract/mod.ts";
import type { Fit } from "./fit.ts";

/** parse + run + summary in one go. */
function fit(name: string, model: string, table: Table, extra: Record<string, unknown> = {}) {
  const spec = fitKind.parse(parseContext(name, { on: "data", model, ...extra }));
  const ctx = runContext(name, "data", table);
  const out = fitKind.run(spec, ctx) as Fit; // run is synchronous for fits
  return { spec, out, result: fitKind.summary(out, spec), warnings: ctx.warnings };
}

/** Asserts that running throws a CellError with this message, path and offset. */
function refuses(name: string, model: string, table: Table, message: string, offset?: number) {
  const spec = fitKind.parse(parseContext(name, { on: "data", model }));
  assert.throws(() => fitKind.run(spec, runContext(name, "data", table)), (e: unknown) => {
    assert.ok(e instanceof CellError, `expected CellError, got ${e}`);
    assert.equal(e.message, message);
    assert.deepEqual(e.path, ["model"]);
    if (offset !== undefined) assert.equal(e.offset, offset);
    return true;
  });
}

Deno.test("fitKind.run() fits a straight line to NIST StRD Norris to at least 9 digits", async () => {
  // Source: NIST StRD Norris, certified values (manifest.json / Norris.dat).
  const set = await loadStrd("Norris");
  if (!set) return;
  const [y, x] = set.data;
  const { result } = fit("line", "y = B0 + B1*x", makeTable({ x, y }));
  set.parameters.forEach((p, j) => {
    const got = result.parameters[j];
    assert.equal(got.name, p.name);
    assert.ok(digits(got.estimate, p.estimate) >= 9, `${p.name} ${got.estimate}`);
    assert.ok(digits(got.std_error!, p.std_dev) >= 9, `se ${p.name} ${got.std_error}`);
  });
  assert.ok(digits(result.rss, set.residual_sum_of_squares) >= 9);
  assert.ok(digits(result.sigma!, set.residual_std_dev) >= 9);
  assert.ok(digits(result.r2!, set.r_squared) >= 9, `r2 ${result.r2}`);
  assert.equal(result.df_residual, set.degrees_of_freedom);
  assert.equal(result.method, "linear");
  assert.equal(result.r2_kind, "centred");
  assert.equal(result.rows.length, 36);
});

Deno.test("fitKind.run() uses the uncentred R² with a warning for NIST StRD NoInt1", async () => {
  // Source: NIST StRD NoInt1 (y = B1*x, no intercept); NIST certifies the
  // uncentred R² = 1 − RSS/Σy² for it (README of the reference folder).
  const set = await loadStrd("NoInt1");
  if (!set) return;
  const [y, x] = set.data;
  const { result, warnings } = fit("noint", "y = B1*x", makeTable({ x, y }));
  assert.ok(digits(result.parameters[0].estimate, set.parameters[0].estimate) >= 9);
  assert.ok(digits(result.parameters[0].std_error!, set.parameters[0].std_dev) >= 9);
  assert.ok(digits(result.r2!, set.r_squared) >= 9, `r2 ${result.r2} vs ${set.r_squared}`);
  assert.equal(result.r2_kind, "uncentred");
  assert.deepEqual(warnings, [
    'R² of "noint" is uncentred, 1 − RSS/Σy², because the model has no intercept: compare it only with fits without one',
  ]);
});

Deno.test("fitKind.run() fits a transformed response log(y) on its own scale", () => {
  // y = exp(1 + 2x) exactly (up to rounding of exp), so log(y) = 1 + 2x: a = 1, b = 2
  // to ~1e-13 and RSS ≈ 0 (hand construction).
  const x = [0, 0.5, 1, 1.5, 2, 2.5];
  const y = x.map((v) => Math.exp(1 + 2 * v));
  const { result } = fit("growth", "log(y) = a + b*x", makeTable({ x, y }));
  assert.equal(result.response, "log(y)");
  assert.ok(Math.abs(result.parameters[0].estimate - 1) < 1e-13);
  assert.ok(Math.abs(result.parameters[1].estimate - 2) < 1e-13);
  assert.ok(Math.abs(result.fitted[3] - 4) < 1e-13, "fitted is on the log scale");
});

Deno.test("fitKind.run() subtracts a parameter-free part of the model from the response", () => {
  // y = 2x + a: a is the mean of y − 2x = (1, 2, 3, 6) → 3 (hand computation).
  const { result } = fit("shift", "y = 2*x + a", makeTable({ x: [0, 1, 2, 3], y: [1, 4, 7, 12] }));
  assert.ok(Math.abs(result.parameters[0].estimate - 3) < 1e-14);
  assert.ok(Math.abs(result.fitted[3] - 9) < 1e-14);
  assert.ok(Math.abs(result.residuals[3] - 3) < 1e-14);
});

Deno.test("fitKind.run() leaves out rows with missing values and names them in a warning", () => {
  const capacity = [10, 9.5, NaN, 8.7, 8.1, NaN, 7.4, 7.0];
  const cycle = [0, 1, 2, NaN, 4, 5, 6, 7];
  const { result, warnings } = fit(
    "root",
    "capacity = q0 - a*sqrt(cycle)",
    makeTable({ cycle, capacity }, [1, 2, 12, 13, 15, 40, 41, 42]),
  );
  assert.equal(result.n, 5);
  assert.deepEqual(result.rows, [1, 2, 15, 41, 42]);
  assert.deepEqual(warnings, [
    '3 rows left out for missing values in "capacity" and "cycle": rows 12, 13, 40',
  ]);
});

Deno.test("fitKind.run() lists at most five left-out rows", () => {
  const y = [1, NaN, NaN, NaN, NaN, NaN, NaN, NaN, 2, 3.5, 4];
  const { warnings } = fit("line", "y = a + b*x", makeTable({ x: y.map((_, i) => i), y }));
  assert.deepEqual(warnings, [
    '7 rows left out for missing values in "y": rows 2, 3, 4, 5, 6 and 2 more',
    'AICc of "line" is undefined: it needs n − k − 1 > 0, and n = 4, k = 3',
  ]);
});

Deno.test("fitKind.run() places an unknown column at its offset with a suggestion", () => {
  const t = makeTable({ cycle: [1, 2, 3, 4], capacity: [4, 3, 2, 1] });
  refuses(
    "root",
    "capacity = q0 - a*sqrt(cylce)",
    t,
    'Cannot fit "root": unknown column "cylce", taken as a parameter: did you mean "cycle"?',
    "capacity = q0 - a*sqrt(".length,
  );
  refuses(
    "root",
    "capcity = q0 - a*sqrt(cycle)",
    t,
    'Unknown column "capcity" in the response: did you mean "capacity"?',
    0,
  );
});

// Regression: the overflow error of a nonlinear model was replaced by a guess
// that the one-letter parameter "a" was a misspelt column "x".
Deno.test("fitKind.run() keeps a solver's own error for one-letter parameters", () => {
  const t = makeTable({ x: [1, 2, 3, 4, 5], y: [1, 2, 4, 8, 16] });
  assert.throws(
    () => fit("boom", "y = a*exp(1000*b*x)", t, { start: { a: 1, b: 1 } }),
    (e: unknown) => e instanceof CellError && !/unknown column/.test(e.message),
  );
});

Deno.test("fitKind.run() refuses a text column at its offset", () => {
  const t = makeTable({ x: [1, 2, 3], batch: ["a", "b", "c"], y: [1, 2, 4] });
  refuses(
    "line",
    "y = a + b*x + c*batch",
    t,
    'Cannot fit "line": column "batch" holds text, not numbers: a model uses numeric columns',
    "y = a + b*x + c*".length,
  );
});

Deno.test("fitKind.run() refuses collinear columns naming the aliased one", () => {
  // x3 = x1 + 2·x2 exactly (hand construction).
  const x1 = [1, 2, 3, 4, 5, 6], x2 = [2, 0, 1, 3, 1, 2];
  const x3 = x1.map((v, i) => v + 2 * x2[i]);
  refuses(
    "line",
    "y = b0 + b1*x1 + b2*x2 + b3*x3",
    makeTable({ x1, x2, x3, y: [1, 3, 2, 5, 4, 6] }),
    'Cannot fit "line": column "x3" is a linear combination of "x1" and "x2", so parameter "b3" cannot be estimated',
    "y = b0 + b1*x1 + b2*x2 + ".length,
  );
});

Deno.test("fitKind.run() refuses two constant terms naming both parameters", () => {
  refuses(
    "twice",
    "y = a + b + c*x",
    makeTable({ x: [1, 2, 3, 4], y: [2, 4, 5, 8] }),
    'Cannot fit "twice": the term of parameter "b" (1) is a multiple of the term of "a" (1)',
    "y = a + ".length,
  );
});

Deno.test("fitKind.run() refuses as many parameters as rows", () => {
  refuses(
    "line",
    "y = a + b*x",
    makeTable({ x: [1, 2, NaN], y: [3, 5, 7] }),
    'Cannot fit "line": 2 rows for 2 parameters "a" and "b": a fit needs more rows than parameters',
  );
});

Deno.test("fitKind.run() refuses a response that is not finite after its transform, naming rows", () => {
  refuses(
    "growth",
    "log(y) = a + b*x",
    makeTable({ x: [1, 2, 3, 4, 5], y: [1, 0, 2, -1, 3] }),
    'Cannot fit "growth": response "log(y)" is not finite in 2 rows: rows 2, 4',
    0,
  );
});

Deno.test("fitKind.run() gives a null R² with a warning for a constant response", () => {
  const { result, warnings } = fit(
    "flat",
    "y = a + b*x",
    makeTable({ x: [1, 2, 3, 4], y: [0.1, 0.1, 0.1, 0.1] }),
  );
  assert.equal(result.r2, null);
  assert.equal(result.adj_r2, null);
  assert.equal(result.tss, 0);
  assert.deepEqual(warnings, [
    'R² of "flat" is undefined: the response "y" is constant on every row used',
    'AICc of "flat" is undefined: it needs n − k − 1 > 0, and n = 4, k = 3',
  ]);
  assert.ok(Math.abs(result.parameters[0].estimate - 0.1) < 1e-15);
});

Deno.test("fitKind.run() fills std errors, t, covariance and adjusted R² consistently", () => {
  // Four points, y = 1 + 2x + e with e = (0.1, −0.1, −0.1, 0.1): by hand (Draper &
  // Smith's formulas): Sxx = 5, b = 2, RSS = 0.04, σ² = 0.02, se(b) = √(0.02/5).
  const { result } = fit(
    "line",
    "y = a + b*x",
    makeTable({ x: [0, 1, 2, 3], y: [1.1, 2.9, 4.9, 7.1] }),
  );
  const b = result.parameters[1];
  assert.ok(Math.abs(b.estimate - 2) < 1e-14);
  assert.ok(Math.abs(result.rss - 0.04) < 1e-14);
  assert.ok(Math.abs(b.std_error! - Math.sqrt(0.02 / 5)) < 1e-14);
  assert.ok(Math.abs(b.t! - 2 / Math.sqrt(0.02 / 5)) < 1e-10);
  assert.ok(Math.abs(result.covariance[1][1]! - 0.02 / 5) < 1e-15);
  assert.ok(Math.abs(result.correlation[0][0]! - 1) < 1e-15);
  const r2 = 1 - 0.04 / result.tss;
  assert.ok(Math.abs(result.adj_r2! - (1 - (1 - r2) * 3 / 2)) < 1e-14);
  assert.ok(Math.abs(result.ess + result.rss - result.tss) < 1e-12);
});

Deno.test("fitKind.line() and view() show the model, n, R² and σ", async () => {
  const { result } = fit(
    "line",
    "y = a + b*x",
    makeTable({ x: [0, 1, 2, 3], y: [1.1, 2.9, 4.9, 7.1] }),
  );
  assert.equal(fitKind.line(result), "y = a + b*x · n 4 · R² 0.9980 · σ 0.141");
  const { renderToString } = await import("preact-render-to-string");
  const html = renderToString(fitPage.view({ name: "line", result }));
  assert.ok(html.includes("<code>y = a + b*x</code>"), html);
  assert.ok(html.includes('<th scope="row"><code>b</code></th><td>2.000</td>'), html);
  assert.ok(html.includes("<dt>Share of variation explained, R²</dt><dd>0.9980</dd>"), html);
});

Deno.test("fitKind.parse() validates options and inputs() names the table", () => {
  const spec = fitKind.parse(
    parseContext("line", { on: "cycles", model: "capacity = q0 + a*cycle" }),
  );
  assert.deepEqual(spec, { on: "cycles", model: "capacity = q0 + a*cycle", start: {} });
  assert.deepEqual(fitKind.inputs(spec), [{ name: "cycles", accepts: ["Table"], path: ["on"] }]);
  const bad = (options: Record<string, unknown>, message: string, path: (string | number)[]) =>
    assert.throws(() => fitKind.parse(parseContext("line", options)), (e: unknown) => {
      assert.ok(e instanceof CellError);
      assert.equal(e.message, message);
      assert.deepEqual(e.path, path);
      return true;
    });
  bad({ on: "t", modle: "y = a" }, 'Unknown option "modle" in fit "line": did you mean "model"?', [
    "modle",
  ]);
  bad(
    { on: "t" },
    'Missing "model" in fit "line": write the model as response = expression, as in model: y = a + b*x',
    [],
  );
  bad(
    { on: 3, model: "y = a" },
    'Option "on" of fit "line" is "3": expected the name of a table cell',
    ["on"],
  );
  bad(
    { on: "t", model: "y = a", start: { a: "x" } },
    'Start value of "a" in fit "line" is "x": expected a finite number',
    [
      "start",
      "a",
    ],
  );
  bad(
    { on: "t", model: "y = a", weights: "1/x", known_sigma: "sd" },
    'Cannot fit "line" with both "weights" and "known_sigma": give relative weights ∝ 1/variance or each row\'s absolute standard deviation, not both',
    ["known_sigma"],
  );
  bad(
    { on: "t", model: "y = a", weights: [1, 2] },
    'Option "weights" of fit "line" is "[1, 2]": expected an expression over columns, such as 1/conc^2',
    ["weights"],
  );
  bad(
    { on: "t", model: "y = a", count_variance: "no" },
    'Option "count_variance" of fit "line" is "no": expected true or false',
    ["count_variance"],
  );
});

Deno.test("fitKind.run() warns that start values are unused by a linear model", () => {
  const { warnings } = fit("line", "y = a + b*x", makeTable({ x: [0, 1, 2], y: [1, 2, 4] }), {
    start: { a: 1 },
  });
  assert.deepEqual(warnings, [
    'Start values of "line" are not used: the model is linear in its parameters',
    'AICc of "line" is undefined: it needs n − k − 1 > 0, and n = 3, k = 3',
  ]);
});

Deno.test("fitKind.run() warns of nearly collinear terms with the scaled condition number", () => {
  // A raw cubic on x = 101..120: the powers of x are nearly collinear (common practice, no source).
  const x = Array.from({ length: 20 }, (_, i) => 101 + i);
  const y = x.map((v, i) => 2 + 0.5 * v + 0.01 * v * v + (i % 3) * 0.1);
  const { warnings } = fit("cubic", "y = polynomial(x, 3)", makeTable({ x, y }));
  const w = warnings.find((m) => m.startsWith('Terms of "cubic" are nearly collinear'));
  assert.ok(w, warnings.join("\n"));
  assert.match(w!, /condition number [0-9.e+]+ of the design with unit-length columns \(> 100/);
  const plain = fit("line", "y = a + b*x", makeTable({ x: [0, 1, 2, 3, 4], y: [1, 3, 2, 5, 4] }));
  assert.ok(!plain.warnings.some((m) => m.includes("collinear")));
});
