import assert from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { standardNormal, studentT } from "../../kernel/stats/mod.ts";
import { fitKind } from "./mod.ts";
import { fitResult as fit, makeTable, parseContext, runContext } from "./_fixtures_test.ts";
import type { Table } from "../../kernel/contract/mod.ts";
import type { Fit } from "./fit.ts";
import { exactWls, int, q, val } from "./_rational_test.ts";

function refuses(
  options: Record<string, unknown>,
  table: Table,
  message: string,
  path: (string | number)[],
) {
  const spec = fitKind.parse(parseContext("f", { on: "data", ...options }));
  assert.throws(() => fitKind.run(spec, runContext("f", "data", table)), (e: unknown) => {
    assert.ok(e instanceof CellError, `expected CellError, got ${e}`);
    assert.equal(e.message, message);
    assert.deepEqual(e.path, path);
    return true;
  });
}

const X = [0, 1, 2, 3, 4], Y = [1, 3, 2, 5, 4];

Deno.test("fitKind.run() with weights matches weighted least squares in exact arithmetic", () => {
  const W = [1, 2, 1, 2, 4];
  const ex = exactWls(X, Y, W.map(int));
  const { result, warnings } = fit("wls", "y = a + b*x", makeTable({ x: X, y: Y, w: W }), {
    weights: "w",
  });
  const s2 = val(ex.rss) / 3;
  const close = (got: number, want: number, what: string) =>
    assert.ok(Math.abs(got - want) <= 1e-14 * Math.abs(want), `${what}: ${got} vs ${want}`);
  close(result.parameters[0].estimate, val(ex.a), "a");
  close(result.parameters[1].estimate, val(ex.b), "b");
  close(result.rss, val(ex.rss), "weighted RSS");
  close(result.parameters[0].std_error!, Math.sqrt(s2 * val(ex.varA)), "se a");
  close(result.parameters[1].std_error!, Math.sqrt(s2 * val(ex.varB)), "se b");
  assert.equal(result.weighted, true);
  assert.equal(result.weighting, "relative");
  assert.equal(result.covariance_scaled, true);
  assert.equal(result.inference, "t");
  // Residuals and fitted values on the original scale: y − (a + b·x).
  close(result.residuals[4], 4 - val(ex.a) - 4 * val(ex.b), "residual row 5");
  close(result.fitted[4] + result.residuals[4], 4, "fitted + residual = y");
  // Weighted log-likelihood (DESIGN.md §5): −n/2(ln 2π + ln(RSSw/n) + 1) + ½Σ ln w.
  const halfLogW = 0.5 * W.reduce((s, w) => s + Math.log(w), 0);
  const logL = -2.5 * (Math.log(2 * Math.PI) + Math.log(val(ex.rss) / 5) + 1) + halfLogW;
  close(result.log_likelihood!, logL, "log L");
  assert.equal(result.k, 3);
  close(result.aic!, 6 - 2 * logL, "AIC");
  // AICc = AIC + 2k(k + 1)/(n − k − 1) = AIC + 24 with n = 5, k = 3 (DESIGN.md §5).
  close(result.aicc!, 6 - 2 * logL + 24, "AICc");
  assert.deepEqual(warnings, []);
});

Deno.test("fitKind.run() with known_sigma does not rescale the covariance", () => {
  // σ = (1, 2, 1, 2, 0.5) → w = 1/σ² = (1, 1/4, 1, 1/4, 4); Cov = (XᵀWX)⁻¹ exactly
  // (hand computation, exactWls above).
  const sd = [1, 2, 1, 2, 0.5];
  const w = [int(1), q(1n, 4n), int(1), q(1n, 4n), int(4)];
  const ex = exactWls(X, Y, w);
  const { result } = fit("abs", "y = a + b*x", makeTable({ x: X, y: Y, sd }), {
    known_sigma: "sd",
  });
  const close = (got: number, want: number, what: string) =>
    assert.ok(Math.abs(got - want) <= 1e-14 * Math.abs(want), `${what}: ${got} vs ${want}`);
  close(result.parameters[1].estimate, val(ex.b), "b");
  close(result.covariance[1][1]!, val(ex.varB), "Var b not rescaled");
  close(result.parameters[0].std_error!, Math.sqrt(val(ex.varA)), "se a");
  assert.equal(result.covariance_scaled, false);
  assert.equal(result.weighting, "absolute");
  assert.equal(
    result.weighting_statement,
    "absolute (known σ): covariance not rescaled by the residual variance",
  );
  // Normal reference: z interval and p (known covariance; common practice, no source).
  const z = standardNormal.upperQuantile(0.025);
  const b = result.parameters[1];
  close(b.ci![1], b.estimate + z * b.std_error!, "z interval");
  close(b.p_value!, 2 * standardNormal.upper(b.estimate / b.std_error!), "z p-value");
  // log L = −½Σ(r/σ)² − Σ ln σ − n/2 ln 2π, k = p (DESIGN.md §5; nothing else estimated).
  const logL = -0.5 * val(ex.rss) - sd.reduce((s, v) => s + Math.log(v), 0) -
    2.5 * Math.log(2 * Math.PI);
  close(result.log_likelihood!, logL, "log L");
  assert.equal(result.k, 2);
  close(result.aicc!, 4 - 2 * logL + 12 / 2, "AICc with k = 2, n = 5");
});

Deno.test("fitKind.run() gives a positive log-likelihood and negative AIC for tiny residuals", () => {
  // y = 1 + 2x + 1e-6·(1, −1, −1, 1, 1, −1): RSS ≈ 6e-12, so log L ≈ −3(ln 2π + ln 1e-12 + 1) > 0
  // (formula of DESIGN.md §5).
  const x = [0, 1, 2, 3, 4, 5], e = [1, -1, -1, 1, 1, -1];
  const y = x.map((v, i) => 1 + 2 * v + 1e-6 * e[i]);
  const { result } = fit("tight", "y = a + b*x", makeTable({ x, y }));
  const logL = -3 * (Math.log(2 * Math.PI) + Math.log(result.rss / 6) + 1);
  assert.ok(result.log_likelihood! > 30, String(result.log_likelihood));
  assert.ok(Math.abs(result.log_likelihood! - logL) < 1e-12 * logL);
  assert.ok(result.aic! < 0 && result.aicc! < 0 && result.bic! < 0, `${result.aic}`);
  assert.ok(Math.abs(result.bic! - (3 * Math.log(6) - 2 * logL)) < 1e-12 * Math.abs(logL));
});

Deno.test("fitKind.run() reports p-values near 1e-300 as numbers, not 0", () => {
  // n = 200, slope 1, deterministic residuals of size ~ 0.3: t ≈ 3000/… gives p ≪ 1e-100;
  // p = 2·P(T₁₉₈ > |t|) computed directly (kernel/stats), checked against the same
  // function and after a JSON round trip.
  const x = Array.from({ length: 200 }, (_, i) => i);
  const y = x.map((v) => v + 9 * Math.sin(1.7 * v));
  const { result } = fit("steep", "y = a + b*x", makeTable({ x, y }));
  const b = result.parameters[1];
  const json = JSON.parse(JSON.stringify(result));
  assert.ok(b.p_value! > 0 && b.p_value! < 1e-150, String(b.p_value));
  assert.equal(json.parameters[1].p_value, b.p_value);
  const want = 2 * studentT(198).upper(b.t!);
  assert.ok(Math.abs(b.p_value! - want) <= 1e-13 * want);
  assert.ok(result.f_p_value! > 0 && result.f_p_value! < 1e-150, String(result.f_p_value));
});

Deno.test("fitKind.run() counts only mean parameters with count_variance: false", () => {
  const x = [0, 1, 2, 3, 4, 5, 6], y = [1, 3, 2, 5, 4, 6, 8];
  const a = fit("a", "y = a + b*x", makeTable({ x, y })).result;
  const b = fit("b", "y = a + b*x", makeTable({ x, y }), { count_variance: false }).result;
  assert.equal(a.k, 3);
  assert.equal(b.k, 2);
  assert.equal(b.k_convention, "k = p: mean parameters only (count_variance: false)");
  // AIC = 2k − 2 log L (DESIGN.md §5): the two differ by exactly 2.
  assert.ok(Math.abs(a.aic! - b.aic! - 2) < 1e-12);
  assert.equal(a.log_likelihood, b.log_likelihood);
});

Deno.test("fitKind.run() intervals follow the document's confidence level", () => {
  const x = [0, 1, 2, 3, 4, 5], y = [1.1, 2.9, 5.2, 7.1, 8.8, 11.2];
  const spec = fitKind.parse(parseContext("c", { on: "data", model: "y = a + b*x" }));
  const ctx = runContext("c", "data", makeTable({ x, y }));
  const ctx90 = { ...ctx, settings: { ...ctx.settings, confidence: 0.9 } };
  const r = fitKind.summary(fitKind.run(spec, ctx90) as Fit, spec);
  const b = r.parameters[1];
  // t₀.₉₅ with 4 df = 2.132 (NIST/SEMATECH e-Handbook §1.3.6.7.2, from memory).
  const half = (b.ci![1] - b.ci![0]) / 2;
  assert.ok(Math.abs(half / b.std_error! - 2.132) < 5e-4, String(half / b.std_error!));
  assert.equal(r.confidence, 0.9);
});

Deno.test("fitKind.run() leaves zero-weight rows out of n with a warning", () => {
  const { result, warnings } = fit(
    "z",
    "y = a + b*x",
    makeTable({ x: [0, 1, 2, 3, 4, 5], y: [1, 3, 2, 5, 4, 9], w: [1, 1, 0, 1, 1, 0] }),
    { weights: "w" },
  );
  assert.equal(result.n, 4);
  assert.deepEqual(result.rows, [1, 2, 4, 5]);
  assert.equal(warnings[0], "2 rows of weight 0 left out of the fit (not counted in n): rows 3, 6");
});

Deno.test("fitKind.run() leaves out rows whose weight column is missing", () => {
  const { result, warnings } = fit(
    "m",
    "y = a + b*x",
    makeTable({ x: [0, 1, 2, 3, 4, 5], y: [1, 3, 2, 5, 4, 9], sd: [1, NaN, 1, 2, 1, 1] }),
    { known_sigma: "sd" },
  );
  assert.equal(result.n, 5);
  assert.equal(warnings[0], '1 row left out for missing values in "sd" of "known_sigma": row 2');
});

Deno.test("fitKind.run() refuses negative, NaN and infinite weights naming the rows", () => {
  const t = makeTable({ x: [0, 1, 2, 3, 4], y: [1, 3, 2, 5, 4], w: [1, -2, 1, 0, 4] });
  refuses(
    { model: "y = a + b*x", weights: "w" },
    t,
    'Cannot fit "f": weight "w" is negative, NaN or infinite in row 2 (-2): weights must be finite and at least 0',
    ["weights"],
  );
  refuses(
    { model: "y = a + b*x", weights: "1/w" },
    t,
    'Cannot fit "f": weight "1/w" is negative, NaN or infinite in rows 2 (-0.5), 4 (Infinity): weights must be finite and at least 0',
    ["weights"],
  );
  refuses(
    { model: "y = a + b*x", weights: "sqrt(w)" },
    t,
    'Cannot fit "f": weight "sqrt(w)" is negative, NaN or infinite in row 2 (NaN): weights must be finite and at least 0',
    ["weights"],
  );
  refuses(
    { model: "y = a + b*x", known_sigma: "w" },
    t,
    'Cannot fit "f": known standard deviation "w" is zero, negative, NaN or infinite in rows 2 (-2), 4 (0): each must be finite and positive',
    ["known_sigma"],
  );
  refuses(
    { model: "y = a + b*x", weights: "wt" },
    t,
    'Unknown column "wt": "weights" may use only columns and the constants pi and e',
    ["weights"],
  );
});

Deno.test("fitKind.run() refuses an all-missing column and an overflowing term", () => {
  refuses(
    { model: "y = a + b*x" },
    makeTable({ x: [1, 2, 3, 4], y: [NaN, NaN, NaN, NaN] }),
    'Cannot fit "f": 0 rows for 2 parameters "a" and "b": a fit needs more rows than parameters',
    ["model"],
  );
  refuses(
    { model: "y = a + b*exp(x)" },
    makeTable({ x: [1, 2, 1000, 3, 4], y: [1, 2, 3, 4, 5] }),
    'Cannot fit "f": term "exp(x)" of parameter "b" is not finite in row 3',
    ["model"],
  );
});

Deno.test("fitKind.run() gives TSS = ESS + RSS and the F test for a weighted line", () => {
  const x = [0, 1, 2, 3, 4, 5, 6, 7], y = [1, 3, 2, 5, 4, 6, 8, 7];
  const { result } = fit("f", "y = a + b*x", makeTable({ x, y, w: [1, 2, 1, 2, 1, 2, 1, 2] }), {
    weights: "w",
  });
  // Identity for linear least squares with an intercept (DESIGN.md §5), weighted sums.
  assert.ok(Math.abs(result.tss - result.ess - result.rss) < 1e-12 * result.tss);
  // F = t² for one slope (common practice, no source).
  const t = result.parameters[1].t!;
  assert.ok(Math.abs(result.f_statistic! - t * t) < 1e-10 * t * t);
  assert.ok(Math.abs(result.f_p_value! - result.parameters[1].p_value!) < 1e-12);
});
