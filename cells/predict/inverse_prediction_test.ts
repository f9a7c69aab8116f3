import assert from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { studentT } from "../../kernel/stats/mod.ts";
import { fitOf, predict } from "./_fixtures_test.ts";

// Anscombe (1973), The American Statistician 27:17–21, data set I (as printed in the paper).
const X = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
const Y = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];

function close(got: number | null | undefined, want: number, tol: number, what: string) {
  assert.ok(typeof got === "number", `${what}: ${got}`);
  assert.ok(Math.abs(got - want) <= tol * Math.abs(want), `${what}: ${got} vs ${want}`);
}

/**
 * Fieller interval for x at a new single observation y₀ on a straight line, in the closed form
 * of Draper & Smith, Applied Regression Analysis, 3rd ed., §3.2 (from memory):
 * X̂₀ = x̄ + (y₀ − ȳ)/b, g = t²s²/(b²Sxx),
 * X_L, X_U = X̂₀ + [(X̂₀ − x̄)g ∓ (ts/b)·√((X̂₀ − x̄)²/Sxx + (1 − g)(1 + 1/n))]/(1 − g).
 */
function fiellerClosedForm(x: number[], y: number[], y0: number, t: number) {
  const n = x.length;
  const xm = x.reduce((a, b) => a + b) / n, ym = y.reduce((a, b) => a + b) / n;
  let sxx = 0, sxy = 0;
  for (let i = 0; i < n; i++) {
    [sxx, sxy] = [sxx + (x[i] - xm) ** 2, sxy + (x[i] - xm) * (y[i] - ym)];
  }
  const b = sxy / sxx, a = ym - b * xm;
  const s = Math.sqrt(y.reduce((r, v, i) => r + (v - a - b * x[i]) ** 2, 0) / (n - 2));
  const x0 = xm + (y0 - ym) / b, g = (t * s) ** 2 / (b * b * sxx);
  const root = (t * s / b) * Math.sqrt((x0 - xm) ** 2 / sxx + (1 - g) * (1 + 1 / n));
  const ends = [-1, 1].map((sgn) => x0 + ((x0 - xm) * g + sgn * root) / (1 - g));
  return { x0, lo: Math.min(...ends), hi: Math.max(...ends), g };
}

Deno.test("predictKind.run() solve gives Draper & Smith's Fieller interval on a straight line", () => {
  const fit = fitOf({ x: X, y: Y }, "y = a + b*x");
  const t = studentT(9).quantile(0.975);
  const { result, warnings } = predict(fit, { solve: { y: [5.5, 7.5, 9.5] } });
  assert.deepEqual(warnings, []);
  [5.5, 7.5, 9.5].forEach((y0, i) => {
    const want = fiellerClosedForm(X, Y, y0, t), s = result.solve[i];
    assert.deepEqual(s.y, { y: y0 });
    assert.equal(s.method, "fieller");
    assert.equal(s.interval_for, "a new single observation of the response");
    close(s.x.x, want.x0, 1e-13, `x̂₀ at ${y0}`);
    close(s.ci![0], want.lo, 1e-12, `lower at ${y0}`);
    close(s.ci![1], want.hi, 1e-12, `upper at ${y0}`);
  });
});

Deno.test("predictKind.run() Fieller ends are where the prediction band crosses y₀", () => {
  // The Fieller set is {x : |y₀ − ŷ(x)| ≤ t·se_pred(x)} (Draper & Smith §3.2; from memory).
  const fit = fitOf({ x: X, y: Y }, "y = a + b*x");
  const s = predict(fit, { solve: { y: 7.5 } }).result.solve[0];
  const band = predict(fit, { at: { x: s.ci! } }).result.at;
  close(band[0].pi![1], 7.5, 1e-12, "upper band at the lower end");
  close(band[1].pi![0], 7.5, 1e-12, "lower band at the upper end");
});

Deno.test("predictKind.run() solve gives null and a warning when the slope is not significant (g ≥ 1)", () => {
  const x = [1, 2, 3, 4, 5, 6], y = [2.0, 3.1, 1.2, 2.9, 1.8, 2.6];
  const fit = fitOf({ x, y }, "y = a + b*x");
  const tq = studentT(4).quantile(0.975);
  assert.ok(Math.abs(fit.statistics.t[1]!) < tq, "precondition: slope not significant");
  const { result, warnings } = predict(fit, { solve: { y: 2.27 } });
  assert.equal(result.solve[0].ci, null);
  assert.equal(warnings.length, 1);
  assert.match(
    warnings[0],
    /^The interval for "y" = 2\.27 is not a finite interval \(g = [0-9.]+ ≥ 1\): the slope of "model" is not significantly different from 0 at level 0\.95/,
  );
});

/** A rising quadratic on [0, 10] (invented data). */
function quadratic() {
  const x = Array.from({ length: 11 }, (_, i) => i);
  const y = x.map((v, i) => 1 + 0.5 * v + 0.2 * v * v + 0.3 * Math.sin(3 * i));
  return fitOf({ x, y }, "y = a + b*x + c*x^2");
}

Deno.test("predictKind.run() solve inverts the prediction band of a curved fit", () => {
  const fit = quadratic();
  const { result } = predict(fit, { solve: { y: 12 } });
  const s = result.solve[0];
  assert.equal(s.method, "prediction-band");
  const [a, b, c] = fit.estimates, x0 = s.x.x;
  close(a + b * x0 + c * x0 * x0, 12, 1e-13, "f(x̂₀) = y₀");
  const band = predict(fit, { at: { x: s.ci! } }).result.at;
  close(band[0].pi![1], 12, 1e-10, "upper band at the lower end");
  close(band[1].pi![0], 12, 1e-10, "lower band at the upper end");
  assert.ok(s.ci![0] < x0 && x0 < s.ci![1]);
});

Deno.test("predictKind.run() solve warns when the solution extrapolates", () => {
  const fit = fitOf({ x: X, y: Y }, "y = a + b*x");
  const { result, warnings } = predict(fit, { solve: { y: 11.5 } });
  assert.equal(result.solve[0].extrapolated, true);
  assert.match(
    warnings[0],
    /^Extrapolation: "y" = 11\.5 is solved by "x" = 16.9967, outside the range fitted by "model", \[4, 14\]$/,
  );
});

function refuses(run: () => unknown, message: string, path: (string | number)[]) {
  assert.throws(run, (e: unknown) => {
    assert.ok(e instanceof CellError, `expected CellError, got ${e}`);
    assert.equal(e.message, message);
    assert.deepEqual(e.path, path);
    return true;
  });
}

Deno.test("predictKind.run() solve refuses no root, several roots, two predictors and another response", () => {
  const x = Array.from({ length: 11 }, (_, i) => i);
  const bowl = fitOf(
    { x, y: x.map((v, i) => (v - 5) ** 2 + 0.1 * (i % 3)) },
    "y = a + b*x + c*x^2",
  );
  refuses(
    () => predict(bowl, { solve: { y: 4 } }),
    'Cannot solve "y" = 4 in predict "p": 2 values of "x" in [-1, 11] give it (3.02519, 6.97299): narrow the range with the option search',
    ["solve", "y"],
  );
  refuses(
    () => predict(quadratic(), { solve: { y: [12, 500] } }),
    'Cannot solve "y" = 500 in predict "p": no "x" in [-1, 11] gives it under fit "model": widen the range with the option search, as in search: [-1, 11]',
    ["solve", "y", 1],
  );
  const two = fitOf(
    { u: [1, 2, 3, 4, 5], v: [2, 1, 4, 3, 5], y: [1, 2, 2, 4, 5] },
    "y = a + b*u + c*v",
  );
  refuses(
    () => predict(two, { solve: { y: 3 } }),
    'Cannot solve in predict "p": inverse prediction needs a fit with one predictor column, and "model" has 2 ("u", "v")',
    ["solve"],
  );
  const line = fitOf({ x: X, y: Y }, "y = a + b*x");
  refuses(
    () => predict(line, { solve: { yy: 3 } }),
    'Cannot solve for "yy" in predict "p": the response of fit "model" is "y": did you mean "y"?',
    ["solve", "yy"],
  );
});

Deno.test("predictKind.run() solve with search finds the root asked for", () => {
  const x = Array.from({ length: 11 }, (_, i) => i);
  const bowl = fitOf(
    { x, y: x.map((v, i) => (v - 5) ** 2 + 0.1 * (i % 3)) },
    "y = a + b*x + c*x^2",
  );
  const s = predict(bowl, { solve: { y: 4 }, search: [5, 11] }).result.solve[0];
  assert.ok(s.x.x > 6.9 && s.x.x < 7.1, String(s.x.x));
});
