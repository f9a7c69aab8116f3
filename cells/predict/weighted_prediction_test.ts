import assert from "node:assert/strict";
import { standardNormal, studentT } from "../../kernel/stats/mod.ts";
import { fitOf, predict } from "./_fixtures_test.ts";
import { add, dec, exactFit, int, mul, type Q, val } from "./_exact_test.ts";
import { parsePredictSpec } from "./spec.ts";
import { parseContext } from "../fit/_fixtures_test.ts";
import { CellError } from "../../kernel/errors.ts";

// An invented 1/x² calibration: the spread grows with x (invented data).
const X = [1, 2, 3, 4, 5, 6, 8, 10];
const Y = [2.52, 4.44, 6.65, 8.34, 10.65, 12.2, 16.98, 20.1];

/** The 1/x² weighted line in exact rational arithmetic, and se_fit² and s² there. */
function exactCalibration() {
  const w = X.map((x) => [1n, BigInt(x * x)] as Q);
  const f = exactFit(X.map((x) => [int(1), int(x)]), Y.map((v) => dec(String(v))), w);
  // se_fit² = s²·gᵀ(XᵀWX)⁻¹g with g = (1, x₀) (Draper & Smith §9.2; from memory for the section).
  const seFit2 = (x0: number) => mul(f.s2, f.form(f.bread, [int(1), int(x0)]));
  return { ...f, seFit2 };
}

function close(got: number | null | undefined, want: number, tol: number, what: string) {
  assert.ok(typeof got === "number", `${what}: ${got}`);
  assert.ok(Math.abs(got - want) <= tol * Math.abs(want), `${what}: ${got} vs ${want}`);
}

Deno.test("predict of a 1/x² calibration: the new observation's weight is 1/x₀² by default", () => {
  const ex = exactCalibration();
  const fit = fitOf({ x: X, y: Y }, "y = a + b*x", { weights: "1/x^2" });
  const t = studentT(X.length - 2).quantile(0.975);
  const { result, warnings } = predict(fit, { at: { x: [1, 10] } });
  assert.deepEqual(warnings, []);
  assert.equal(result.weight_source, 'the fit\'s weights expression "1/x^2" at the point');
  [1, 10].forEach((x0, i) => {
    const p = result.at[i];
    assert.equal(p.weight, 1 / (x0 * x0));
    // se_prediction² = se_fit² + s²/w(x₀) = se_fit² + s²·x₀² (exact rational arithmetic).
    const sp2 = add(ex.seFit2(x0), mul(ex.s2, int(x0 * x0)));
    close(p.se_fit! ** 2, val(ex.seFit2(x0)), 1e-12, `se_fit² at ${x0}`);
    close(p.se_prediction! ** 2, val(sp2), 1e-12, `se_prediction² at ${x0}`);
    // PI = ŷ ± t(0.975; 6)·√(se_fit² + σ²/w(x₀)) (Draper & Smith ch. 9; from memory).
    close(p.pi![1] - p.estimate!, t * Math.sqrt(val(sp2)), 1e-12, `PI half-width at ${x0}`);
    close(p.estimate! - p.pi![0], t * Math.sqrt(val(sp2)), 1e-12, `PI half-width at ${x0}`);
  });
  // Before (w₀ = 1, the old default): at x₀ = 10 the PI was 2.33 times too narrow on these data.
  const old = predict(fit, { at: { x: 10 }, weight: 1 }).result.at[0];
  const ratio = (result.at[1].pi![1] - result.at[1].pi![0]) / (old.pi![1] - old.pi![0]);
  close(
    ratio,
    Math.sqrt(val(add(ex.seFit2(10), mul(ex.s2, int(100)))) / val(add(ex.seFit2(10), ex.s2))),
    1e-12,
    "ratio",
  );
  assert.equal(ratio.toFixed(2), "2.33");
});

Deno.test("predict: se_prediction averages m replicates and a weight per point is used as given", () => {
  const ex = exactCalibration();
  const fit = fitOf({ x: X, y: Y }, "y = a + b*x", { weights: "1/x^2" });
  // se_prediction² = se_fit² + s²/(w₀·m), m = 3 (exact rational arithmetic).
  const rep = predict(fit, { at: { x: 10 }, replicates: 3 }).result.at[0];
  close(rep.se_prediction! ** 2, val(add(ex.seFit2(10), mul(ex.s2, [100n, 3n]))), 1e-12, "m = 3");
  const { result } = predict(fit, { at: { x: [2, 4] }, weight: [1, 0.25] });
  assert.equal(result.weight_source, "given (option weight)");
  assert.deepEqual(result.at.map((p) => p.weight), [1, 0.25]);
  close(
    result.at[1].se_prediction! ** 2,
    val(add(ex.seFit2(4), mul(ex.s2, int(4)))),
    1e-12,
    "w₀ = ¼",
  );
});

Deno.test("predict: a weight in the response is taken at the prediction, with a warning", () => {
  const fit = fitOf({ x: X, y: Y }, "y = a + b*x", { weights: "1/y^2" });
  const { result, warnings } = predict(fit, { at: { x: 5 } });
  const p = result.at[0], s = fit.statistics.sigma!;
  // w₀ = 1/ŷ² (the plug-in of a variance function; common practice, no source).
  assert.equal(p.weight, 1 / p.estimate! ** 2);
  close(p.se_prediction! ** 2, p.se_fit! ** 2 + s * s * p.estimate! ** 2, 1e-14, "s²·ŷ²");
  assert.match(result.weight_source, /"1\/y\^2" at the point, "y" at its prediction$/);
  assert.deepEqual(warnings, [
    'The weight of a new observation is fit "model"\'s weights "1/y^2" with "y" at its prediction, as a new point has no observed "y": give the option weight to set it',
  ]);
});

Deno.test("predict: a weight from a column a point does not give leaves the PI out, saying so", () => {
  const fit = fitOf({ x: X, y: Y, w: X.map((x) => 1 / x) }, "y = a + b*x", { weights: "w" });
  const { result, warnings } = predict(fit, { at: { x: 5 } });
  assert.equal(result.at[0].pi, null);
  assert.equal(result.at[0].se_prediction, null);
  assert.equal(result.at[0].weight, null);
  assert.ok(result.at[0].ci !== null, "the mean response needs no weight");
  assert.deepEqual(warnings, [
    'Prediction intervals are not given: fit "model" has relative weights per row and its weights "w" reads column "w", which a new point does not give: give the weight of a new observation with the option weight',
  ]);
  const given = predict(fit, { at: { x: 5 }, weight: 0.2 }).result.at[0];
  assert.ok(given.pi !== null && given.weight === 0.2);
});

Deno.test("predict: known σ defaults to the fit's known_sigma at the point; bad weights name the point", () => {
  const fit = fitOf({ x: X, y: Y }, "y = a + b*x", { known_sigma: "0.02*x" });
  const { result } = predict(fit, { at: { x: 10 } });
  const p = result.at[0], z = standardNormal.quantile(0.975);
  assert.equal(p.sigma, 0.2);
  // PI = ŷ ± z·√(se_fit² + σ₀²), σ₀ known (common practice, no source).
  close(p.pi![1] - p.estimate!, z * Math.sqrt(p.se_fit! ** 2 + 0.04), 1e-12, "known σ₀");
  const wfit = fitOf({ x: X, y: Y }, "y = a + b*x", { weights: "1/x^2" });
  const zero = predict(wfit, { at: { x: [0, 1] } });
  assert.equal(zero.result.at[0].pi, null);
  assert.ok(zero.result.at[1].pi !== null);
  assert.ok(
    zero.warnings.some((m) =>
      m.startsWith("Prediction intervals are not given at point 1 (Infinity): the weight")
    ),
    zero.warnings.join("\n"),
  );
});

Deno.test("predict solve under 1/x² weights uses the band with s²·x² along x", () => {
  const fit = fitOf({ x: X, y: Y }, "y = a + b*x", { weights: "1/x^2" });
  const { result } = predict(fit, { solve: { y: 18 }, at: { x: 1 } });
  const r = result.solve[0], s = fit.statistics.sigma!, t = studentT(6).quantile(0.975);
  assert.equal(r.method, "prediction-band");
  const [a, b] = fit.estimates, C = fit.statistics.covariance;
  close(r.x.x, (18 - a) / b, 1e-14, "x̂ = (y₀ − a)/b");
  // At each end (18 − f(x))² = t²·(se_fit(x)² + s²x²) (the inverted band; Draper & Smith §3.2).
  for (const x of r.ci!) {
    const se2 = C[0] + 2 * x * C[1] + x * x * C[3];
    const lhs = (18 - a - b * x) ** 2, rhs = t * t * (se2 + s * s * x * x);
    close(lhs, rhs, 1e-9, `band end ${x}`);
  }
  // With a weight given for the new observation the variance is constant: Fieller again.
  assert.equal(predict(fit, { solve: { y: 18 }, weight: 0.01 }).result.solve[0].method, "fieller");
});

Deno.test("parsePredictSpec() reads weight and sigma as one value or one per point", () => {
  const parse = (o: Record<string, unknown>) =>
    parsePredictSpec({ ...parseContext("p", o), kind: "predict" });
  assert.deepEqual(parse({ fit: "f", at: { x: [1, 2] }, weight: [1, 2] }).weight, [1, 2]);
  assert.deepEqual(parse({ fit: "f", at: { x: [1, 2] }, sigma: 0.5 }).sigma, [0.5]);
  const refuses = (o: Record<string, unknown>, message: string, path: (string | number)[]) =>
    assert.throws(() => parse(o), (e: unknown) => {
      assert.ok(e instanceof CellError);
      assert.equal(e.message, message);
      assert.deepEqual(e.path, path);
      return true;
    });
  refuses(
    { fit: "f", at: { x: [1, 2, 3] }, weight: [1, 2] },
    'Option "weight" of predict "p" has 2 values, but "at" gives 3 points: give one value for all, or one per point',
    ["weight"],
  );
  refuses(
    { fit: "f", at: { x: [1, 2] }, weight: [1, -2] },
    'Value "-2" in "weight" of predict "p" is not a positive weight',
    ["weight", 1],
  );
  refuses(
    { fit: "f", at: { x: 1 }, sigma: 0 },
    'Option "sigma" of predict "p" is "0": expected a positive standard deviation',
    ["sigma"],
  );
  refuses(
    { fit: "f", at: { x: 1 }, robust: "sandwich" },
    'Option "robust" of predict "p" is "sandwich": expected one of hc0, hc1, hc2, hc3',
    ["robust"],
  );
});

Deno.test("predict: se_prediction of an unweighted line is s·√(1 + 1/n + (x₀ − x̄)²/Sxx)", () => {
  // Anscombe (1973), The American Statistician 27:17–21, data set I (as printed in the paper).
  const x = [10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5];
  const y = [8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68];
  const ex = exactFit(x.map((v) => [int(1), int(v)]), y.map((v) => dec(String(v))), null);
  const { result } = predict(fitOf({ x, y }, "y = a + b*x"), { at: { x: [4, 9, 20] } });
  [4, 9, 20].forEach((x0, i) => {
    // s²(1 + gᵀ(XᵀX)⁻¹g), the straight-line form above (exact rational arithmetic).
    const want = mul(ex.s2, add(int(1), ex.form(ex.bread, [int(1), int(x0)])));
    close(result.at[i].se_prediction! ** 2, val(want), 1e-12, `se_prediction² at ${x0}`);
  });
  assert.equal(result.weight_source, "none: the fit is unweighted");
  assert.equal("weight" in result.at[0], false);
});
