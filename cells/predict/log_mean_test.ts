import assert from "node:assert/strict";
import { studentT } from "../../kernel/stats/mod.ts";
import { fitOf, predict } from "./_fixtures_test.ts";
import { add, exact, exactFit, int, mul, type Q, val } from "./_exact_test.ts";

// An invented exponential growth, fitted as log(y) = a + b·x.
const X = [1, 2, 3, 4, 5, 6];
const Y = [2.9, 7.1, 21.5, 52.0, 160.3, 398.0];

function close(got: number | null | undefined, want: number, tol: number, what: string) {
  assert.ok(typeof got === "number", `${what}: ${got}`);
  assert.ok(Math.abs(got - want) <= tol * Math.abs(want), `${what}: ${got} vs ${want}`);
}

/**
 * The log-scale fit in exact rational arithmetic on the fitted response
 * values (each double of log y is an exact fraction), then μ̂, s², se_fit²
 * and the residuals rounded once to doubles.
 */
function exactLogFit(z: Float64Array, x0: number) {
  const f = exactFit(X.map((x) => [int(1), int(x)]), [...z].map(exact), null);
  const g: Q[] = [int(1), exact(x0)];
  return {
    mu: val(add(f.beta[0], mul(f.beta[1], g[1]))),
    s2: val(f.s2),
    seFit2: val(mul(f.s2, f.form(f.bread, g))),
    residuals: f.residuals.map(val),
  };
}

Deno.test("predict of log(y) gives the median and two labelled means against exact values", () => {
  const fit = fitOf({ x: X, y: Y }, "log(y) = a + b*x");
  const x0 = 4.5, ex = exactLogFit(fit.y, x0);
  const { result } = predict(fit, { at: { x: x0 } });
  const p = result.at[0], t = studentT(4).quantile(0.975);
  assert.match(result.estimate_is!, /^the median of y /);
  // Median: exp(μ̂) (common practice, no source).
  close(p.estimate, Math.exp(ex.mu), 1e-14, "median exp(μ̂)");
  const [ln, duan] = p.mean_estimates!;
  assert.equal(ln.method, "lognormal");
  assert.match(ln.label, /^mean of y for normal errors on the log scale: exp\(μ\)·exp\(σ₀²\/2\)/);
  // Lognormal mean exp(μ̂ + s²/2) (Aitchison & Brown 1957; from memory), on exact μ̂ and s².
  close(ln.estimate, Math.exp(ex.mu + ex.s2 / 2), 1e-14, "exp(μ̂ + s²/2)");
  // Cox's interval exp(θ̂ ± t·√(se_fit² + s⁴/(2ν))), ν = 4 (Land 1972; Zhou & Gao 1997; from memory).
  const sd = Math.sqrt(ex.seFit2 + ex.s2 * ex.s2 / 8);
  close(ln.ci![0], Math.exp(ex.mu + ex.s2 / 2 - t * sd), 1e-13, "Cox lower");
  close(ln.ci![1], Math.exp(ex.mu + ex.s2 / 2 + t * sd), 1e-13, "Cox upper");
  assert.equal(duan.method, "smearing");
  assert.match(duan.label, /Duan's smearing estimate \(1983\)/);
  // Duan (1983), JASA 78:605–610: exp(μ̂)·(1/n)Σ exp(eᵢ), on exact residuals.
  const smear = ex.residuals.reduce((s, e) => s + Math.exp(e), 0) / X.length;
  close(duan.estimate, Math.exp(ex.mu) * smear, 1e-14, "smearing");
  assert.equal(duan.ci, null);
  // Both means exceed the median here (s² > 0, residuals spread both ways).
  assert.ok(ln.estimate! > p.estimate! && duan.estimate! > p.estimate!);
});

Deno.test("predict of log10(y) scales by ln 10; other transforms give no mean estimates", () => {
  const fit = fitOf({ x: X, y: Y }, "log10(y) = a + b*x");
  const ex = exactLogFit(fit.y, 2);
  const p = predict(fit, { at: { x: 2 } }).result.at[0];
  const c = Math.LN10;
  // E[10^Z] = exp(c·μ + c²σ²/2), Z normal (the lognormal mean with c = ln 10; from memory).
  close(p.mean_estimates![0].estimate, Math.exp(c * ex.mu + c * c * ex.s2 / 2), 1e-13, "log10");
  const smear = ex.residuals.reduce((s, e) => s + 10 ** e, 0) / X.length;
  close(p.mean_estimates![1].estimate, 10 ** ex.mu * smear, 1e-13, "log10 smearing");
  const root = predict(fitOf({ x: X, y: Y }, "sqrt(y) = a + b*x"), { at: { x: 2 } }).result;
  assert.equal(root.at[0].mean_estimates, undefined);
  assert.match(root.estimate_is!, /^the median of y/);
});

Deno.test("predict of log(y) with 1/x weights smears residuals scaled to the point", () => {
  const fit = fitOf({ x: X, y: Y }, "log(y) = a + b*x", { weights: "1/x" });
  const p = predict(fit, { at: { x: 3 } }).result.at[0];
  const s2 = fit.statistics.sigma! ** 2, w0 = 1 / 3, mu = p.model_scale!.estimate!;
  // eᵢ√(wᵢ/w₀) are the residuals at the point's variance s²/w₀ (our extension; no source).
  const smear =
    [...fit.residuals].reduce((s, e, i) => s + Math.exp(e * Math.sqrt((1 / X[i]) / w0)), 0) /
    X.length;
  close(p.mean_estimates![1].estimate, Math.exp(mu) * smear, 1e-13, "weighted smearing");
  close(p.mean_estimates![0].estimate, Math.exp(mu + s2 / w0 / 2), 1e-14, "exp(μ̂ + s²/(2w₀))");
});
