import assert from "node:assert/strict";
import { standardNormal, studentT } from "../../kernel/stats/mod.ts";
import { fitOf, predict } from "./_fixtures_test.ts";
import { exactPolynomial, RESPONSES, YEARS } from "../fit/_raw_years_test.ts";

// Anscombe (1973), The American Statistician 27:17–21, data set I (as printed in the paper).
const X = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
const Y = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];

/**
 * Straight-line hand formulas (Draper & Smith, Applied Regression Analysis, 3rd ed., §1.4;
 * from memory; common practice): b = Sxy/Sxx, a = ȳ − b·x̄, s² = RSS/(n − 2),
 * se_fit = s·√(1/n + (x₀ − x̄)²/Sxx), se_pred = s·√(1 + 1/n + (x₀ − x̄)²/Sxx).
 */
function handLine(x: number[], y: number[]) {
  const n = x.length;
  const xm = x.reduce((a, b) => a + b) / n, ym = y.reduce((a, b) => a + b) / n;
  let sxx = 0, sxy = 0;
  for (let i = 0; i < n; i++) {
    [sxx, sxy] = [sxx + (x[i] - xm) ** 2, sxy + (x[i] - xm) * (y[i] - ym)];
  }
  const b = sxy / sxx, a = ym - b * xm;
  const rss = y.reduce((s, v, i) => s + (v - a - b * x[i]) ** 2, 0);
  const s = Math.sqrt(rss / (n - 2));
  return {
    n,
    xm,
    ym,
    sxx,
    a,
    b,
    s,
    rss,
    seFit: (x0: number) => s * Math.sqrt(1 / n + (x0 - xm) ** 2 / sxx),
    sePred: (x0: number) => s * Math.sqrt(1 + 1 / n + (x0 - xm) ** 2 / sxx),
  };
}

function close(got: number | null, want: number, tol: number, what: string) {
  assert.ok(got !== null, `${what}: null`);
  assert.ok(Math.abs(got - want) <= tol * Math.abs(want), `${what}: ${got} vs ${want}`);
}

Deno.test("predictKind.run() matches the straight-line CI and PI formulas on Anscombe's set I", () => {
  const h = handLine(X, Y);
  // Anscombe (1973): intercept 3.0, slope 0.5, SE of slope 0.118, residual SS 13.75 (paper's digits).
  assert.equal(h.a.toFixed(2), "3.00");
  assert.equal(h.b.toFixed(3), "0.500");
  assert.equal((h.s / Math.sqrt(h.sxx)).toFixed(3), "0.118");
  assert.equal(h.rss.toFixed(2), "13.76"); // the paper prints 13.75; 13.7627 from the printed data
  // t(0.975; 9) = 2.262 (any t table, e.g. Draper & Smith Table 2 — from memory).
  const t = studentT(9).quantile(0.975);
  assert.equal(t.toFixed(3), "2.262");
  const fit = fitOf({ x: X, y: Y }, "y = a + b*x");
  const at = [4, 9, 14];
  const { result, warnings } = predict(fit, { at: { x: at } });
  assert.deepEqual(warnings, []);
  assert.equal(result.level, 0.95);
  assert.equal(result.distribution, "t(9)");
  assert.equal(result.scale, "response as written");
  at.forEach((x0, i) => {
    const p = result.at[i], yhat = h.a + h.b * x0;
    assert.deepEqual(p.x, { x: x0 });
    close(p.estimate, yhat, 1e-13, "estimate");
    close(p.se_fit, h.seFit(x0), 1e-12, "se_fit");
    close(p.ci![0], yhat - t * h.seFit(x0), 1e-12, "ci lower");
    close(p.ci![1], yhat + t * h.seFit(x0), 1e-12, "ci upper");
    close(p.pi![0], yhat - t * h.sePred(x0), 1e-12, "pi lower");
    close(p.pi![1], yhat + t * h.sePred(x0), 1e-12, "pi upper");
    assert.equal(p.extrapolated, false);
  });
  // At x̄ the mean response's standard error is s/√n (common practice, no source).
  const mid = predict(fit, { at: { x: h.xm } }).result.at[0];
  close(mid.se_fit, h.s / Math.sqrt(h.n), 1e-12, "se at x̄");
});

Deno.test("predictKind.run() pairs at lists element by element and applies scalars to every point", () => {
  const x1 = [1, 2, 3, 4, 5, 6, 7, 8], x2 = [2, 1, 4, 3, 6, 5, 8, 9];
  const y = x1.map((v, i) => 1 + 2 * v - x2[i] + 0.1 * Math.sin(7 * i));
  const fit = fitOf({ x1, x2, y }, "y = a + b*x1 + c*x2");
  const { result } = predict(fit, { at: { x1: [2, 3, 4], x2: 5 } });
  assert.equal(result.at.length, 3, "three points, not a grid");
  assert.deepEqual(result.at.map((p) => p.x), [
    { x1: 2, x2: 5 },
    { x1: 3, x2: 5 },
    { x1: 4, x2: 5 },
  ]);
  const [a, b, c] = fit.estimates;
  result.at.forEach((p) => close(p.estimate, a + b * p.x.x1 + c * 5, 1e-13, "estimate"));
  // Equal to a prediction at each point alone (common practice, no source).
  const one = predict(fit, { at: { x1: [3], x2: [5] } }).result.at[0];
  assert.equal(one.se_fit, result.at[1].se_fit);
});

Deno.test("predictKind.run() warns about extrapolation naming the column, value and range", () => {
  const fit = fitOf({ x: X, y: Y }, "y = a + b*x");
  const { result, warnings } = predict(fit, { at: { x: [2, 10, 20] } });
  assert.deepEqual(warnings, [
    'Extrapolation: "x" = 2, 20 (points 1, 3) lies outside the range fitted by "model", [4, 14]',
  ]);
  assert.deepEqual(result.at.map((p) => p.extrapolated), [true, false, true]);
});

Deno.test("predictKind.run() gives null and a warning where the model is not finite", () => {
  const x = [1, 2, 3, 4, 5, 6];
  const y = x.map((v, i) => 2 + 3 * Math.log(v) + 0.01 * (i % 2));
  const fit = fitOf({ x, y }, "y = a + b*log(x)");
  const { result, warnings } = predict(fit, { at: { x: [-1, 2] } });
  assert.equal(result.at[0].estimate, null);
  assert.equal(result.at[0].ci, null);
  assert.ok(result.at[1].estimate !== null);
  assert.ok(
    warnings.includes(
      'The model of "model" is not finite at point 1 (x = -1): estimate NaN, so no prediction is given there',
    ),
    warnings.join("\n"),
  );
});

Deno.test("predictKind.run() uses s²/w₀ for a new observation of a relatively weighted fit", () => {
  const x = [1, 2, 3, 4, 5, 6, 7], w = [1, 0.5, 0.25, 0.2, 0.1, 0.1, 0.05];
  const y = x.map((v, i) => 1 + 2 * v + 0.3 * Math.cos(3 * i));
  const fit = fitOf({ x, y, w }, "y = a + b*x", { weights: "w" });
  const s = fit.statistics.sigma!, t = studentT(5).quantile(0.975);
  for (const w0 of [1, 4]) {
    // A weights column cannot be evaluated at a new point: w₀ is given (new_observation.ts).
    const { result } = predict(fit, { at: { x: 3 }, weight: w0 });
    const p = result.at[0];
    // PI half-width q·√(se_fit² + s²/w₀) (Draper & Smith ch. 9; from memory).
    const half = t * Math.sqrt(p.se_fit! ** 2 + s * s / w0);
    close(p.pi![1] - p.estimate!, half, 1e-12, `w0 = ${w0}`);
    assert.match(result.new_observation, new RegExp(`w₀ = ${w0}`));
  }
});

Deno.test("predictKind.run() with known σ uses the normal quantile and needs sigma for a PI", () => {
  const x = [1, 2, 3, 4, 5, 6], sd = [0.1, 0.1, 0.2, 0.2, 0.3, 0.3];
  const y = x.map((v, i) => 0.5 + 1.5 * v + sd[i] * (i % 2 ? 1 : -1));
  const fit = fitOf({ x, y, sd }, "y = a + b*x", { known_sigma: "sd" });
  const none = predict(fit, { at: { x: 2 } });
  assert.equal(none.result.at[0].pi, null);
  assert.equal(none.result.distribution, "normal");
  assert.match(none.warnings[0], /^Prediction intervals are not given: fit "model" has known/);
  const z = standardNormal.quantile(0.975);
  // z(0.975) = 1.960 (normal table; common practice, no source).
  assert.equal(z.toFixed(3), "1.960");
  const p = predict(fit, { at: { x: 2 }, sigma: 0.2, replicates: 4 }).result.at[0];
  close(p.ci![1] - p.estimate!, z * p.se_fit!, 1e-12, "ci");
  close(p.pi![1] - p.estimate!, z * Math.sqrt(p.se_fit! ** 2 + 0.04 / 4), 1e-12, "pi");
});

Deno.test("predictKind.run() uses the delta method for a nonlinear fit", () => {
  const x = [0, 1, 2, 3, 4, 5, 6, 7];
  const y = x.map((v, i) => 10 * Math.exp(-0.3 * v) + 0.05 * Math.sin(5 * i));
  const fit = fitOf({ x, y }, "y = a*exp(-k*x)", { start: { a: 9, k: 0.2 } });
  const { result } = predict(fit, { at: { x: 2.5 } });
  const [a, k] = fit.estimates, C = fit.statistics.covariance;
  // g = (e^(−kx), −a·x·e^(−kx)); se² = gᵀCg (Seber & Wild 1989 §5.1; from memory).
  const e = Math.exp(-k * 2.5), g = [e, -a * 2.5 * e];
  const se = Math.sqrt(g[0] * g[0] * C[0] + 2 * g[0] * g[1] * C[2] + g[1] * g[1] * C[3]);
  close(result.at[0].estimate, a * e, 1e-14, "estimate");
  close(result.at[0].se_fit, se, 1e-12, "se_fit");
  assert.match(result.mean_method, /^delta method/);
});

Deno.test("predictKind.run() takes level over the document's confidence", () => {
  const fit = fitOf({ x: X, y: Y }, "y = a + b*x");
  const doc = predict(fit, { at: { x: 9 } }, { confidence: 0.9 }).result;
  const own = predict(fit, { at: { x: 9 }, level: 0.99 }, { confidence: 0.9 }).result;
  assert.equal(doc.level, 0.9);
  assert.equal(own.level, 0.99);
  const t = studentT(9).quantile(0.995);
  close(own.at[0].ci![1] - own.at[0].estimate!, t * own.at[0].se_fit!, 1e-12, "99 %");
});

/** Relative error, or absolute where the exact value is 0. */
const relErr = (got: number, want: number) =>
  Math.abs(got - want) / (want === 0 ? 1 : Math.abs(want));

for (const degree of [3, 5]) {
  Deno.test(`predictKind.run() keeps 12 digits on a degree-${degree} polynomial in raw calendar years`, () => {
    // Exact rational arithmetic (BigInt fractions, ../fit/_raw_years_test.ts): x = 1900 … 2020
    // not centred, invented two-decimal responses. Before: se_fit 0 at 1950 (exact 1.6715) and
    // 150.9 at 2025 (exact 9.318) for degree 5, 2.8e-5 relative off for degree 3 (gᵀ·Cov·g).
    const exact = exactPolynomial(degree);
    const fit = fitOf({ x: YEARS, y: RESPONSES }, `y = polynomial(x, ${degree})`);
    const worst = { estimate: 0, se: 0, seFit: 0, ci: 0, pi: 0 };
    fit.estimates.forEach((b, j) => {
      worst.estimate = Math.max(worst.estimate, relErr(b, exact.estimates[j]));
      worst.se = Math.max(worst.se, relErr(fit.statistics.stdErrors[j]!, exact.stdErrors[j]));
    });
    const points = [1900, 1950, 1987, 2020, 2025];
    const { result } = predict(fit, { at: { x: points } });
    const t = studentT(YEARS.length - degree - 1).quantile(0.975);
    points.forEach((x0, i) => {
      const p = result.at[i], e = exact.at(x0);
      const se = Math.sqrt(e.variance), sePred = Math.sqrt(e.variance + exact.s2);
      worst.estimate = Math.max(worst.estimate, relErr(p.estimate!, e.estimate));
      worst.seFit = Math.max(worst.seFit, relErr(p.se_fit!, se));
      worst.ci = Math.max(worst.ci, relErr(p.ci![0], e.estimate - t * se));
      worst.ci = Math.max(worst.ci, relErr(p.ci![1], e.estimate + t * se));
      worst.pi = Math.max(worst.pi, relErr(p.pi![0], e.estimate - t * sePred));
      worst.pi = Math.max(worst.pi, relErr(p.pi![1], e.estimate + t * sePred));
    });
    for (const [what, err] of Object.entries(worst)) {
      assert.ok(err <= 1e-12, `degree ${degree}, ${what}: relative error ${err.toExponential(2)}`);
    }
  });
}
