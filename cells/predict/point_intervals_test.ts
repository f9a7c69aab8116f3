/**
 * Predict's labelled intervals (issue 19): the mean response's profile
 * interval against the t interval (linear) and an independent profile
 * (nonlinear), its bootstrap intervals against the fit's replicates read
 * directly, the bootstrap prediction interval against a brute-force
 * prediction-error resampling, a log response back-transformed, and
 * seeded determinism.
 */
import assert from "node:assert/strict";
import { fitOf, makeTable, predict } from "./_fixtures_test.ts";
import { fitKind } from "../fit/mod.ts";
import type { Fit } from "../fit/mod.ts";
import { parseContext, runContext, SETTINGS } from "../fit/_fixtures_test.ts";
import { standardNormal, studentT } from "../../kernel/stats/mod.ts";
import { mulberry32 } from "../../kernel/random.ts";
import type { LabelledInterval, PredictPointResult } from "./result.ts";

const by = (list: LabelledInterval[] | undefined, m: LabelledInterval["method"]) =>
  list?.find((i) => i.method === m);

/** |got − want| ≤ tol·|want|, with a message. */
function near(got: number | null | undefined, want: number, tol: number, what: string) {
  assert.ok(
    got !== null && got !== undefined && Math.abs(got - want) <= tol * Math.abs(want),
    `${what}: ${got} vs ${want}`,
  );
}

/**
 * Puromycin, treated cells: Treloar (1974), as tabulated in Bates & Watts,
 * *Nonlinear Regression Analysis and Its Applications* (1988), Appendix A1.3
 * (the same data as cells/fit/intervals_test.ts).
 */
const CONC = [0.02, 0.02, 0.06, 0.06, 0.11, 0.11, 0.22, 0.22, 0.56, 0.56, 1.10, 1.10];
const RATE = [76, 47, 97, 107, 123, 139, 159, 152, 191, 201, 207, 200];

/** The root of g on [a, b] by bisection (g changes sign there). */
function bisect(g: (x: number) => number, a: number, b: number): number {
  let ga = g(a);
  for (let it = 0; it < 200; it++) {
    const m = (a + b) / 2, gm = g(m);
    if (gm === 0) return m;
    if (Math.sign(gm) === Math.sign(ga)) {
      a = m;
      ga = gm;
    } else b = m;
  }
  return (a + b) / 2;
}

/** The minimum of h on [a, b] by golden-section search (h unimodal there). */
function golden(h: (x: number) => number, a: number, b: number): number {
  const r = (Math.sqrt(5) - 1) / 2;
  for (let it = 0; it < 200; it++) {
    const c = b - r * (b - a), d = a + r * (b - a);
    if (h(c) < h(d)) b = d;
    else a = c;
  }
  return h((a + b) / 2);
}

Deno.test("the profile interval of a linear fit's mean response is its t interval (exact)", () => {
  // Invented, deterministic data: a quadratic with a wobble.
  const x = Array.from({ length: 14 }, (_, i) => i + 1);
  const y = x.map((v) => 2 + 0.5 * v - 0.03 * v * v + 0.4 * Math.sin(2.3 * v));
  const fit = fitOf({ x, y }, "y = a + b*x + c*x^2", { intervals: ["profile"] });
  const { result } = predict(fit, { at: { x: [0.5, 7, 16] } });
  assert.match(result.interval_methods!, /profile: of f\(x₀; θ\)/);
  for (const p of result.at) {
    const w = by(p.intervals, "wald")!, pr = by(p.intervals, "profile")!;
    // Wald is ci, and first.
    assert.equal(p.intervals![0], w);
    assert.deepEqual([w.lower, w.upper], p.ci);
    // For a model linear in θ the profiled criterion is quadratic in the mean response, so
    // |τ| = t at ŷ₀ ± t·se_fit (Bates & Watts 1988, §6.1; exact, rounding only).
    near(pr.lower, p.ci![0], 1e-8, `profile lower at x = ${p.x.x}`);
    near(pr.upper, p.ci![1], 1e-8, `profile upper at x = ${p.x.x}`);
    assert.equal(pr.note, undefined);
    // Without replicates, a new observation has only its Wald interval (pi).
    assert.deepEqual(p.pi_intervals, [{
      method: "wald",
      level: 0.95,
      lower: p.pi![0],
      upper: p.pi![1],
    }]);
  }
});

Deno.test("a nonlinear fit's mean response at x₀ has the profile computed independently (reparametrised, golden section), asymmetric", () => {
  const fit = fitOf({ conc: CONC, rate: RATE }, "rate = Vm*conc/(K + conc)", {
    start: { Vm: 200, K: 0.1 },
  });
  const x0 = 0.05;
  const { result } = predict(fit, { at: { conc: [x0] } });
  const p = result.at[0];
  const pr = by(p.intervals, "profile")!;
  // Independent: hold μ = Vm·x₀/(K + x₀) by writing Vm = μ(K + x₀)/x₀; the model is then
  // μ·(K + x₀)/x₀·c/(K + c), and S̃(μ) = min over K (golden section on a bracket).
  const rss = (mu: number, k: number) =>
    CONC.reduce((s, c, i) => s + (RATE[i] - (mu * (k + x0)) / x0 * c / (k + c)) ** 2, 0);
  const profiled = (mu: number) => golden((k) => rss(mu, k), 1e-4, 1);
  const n = CONC.length, nu = n - 2;
  const s0 = profiled(p.estimate!);
  // S(μ) − S₀ = s²·t² at the limits, s² = S₀/ν (Bates & Watts 1988, §6.1).
  const rise = (s0 / nu) * studentT(nu).upperQuantile(0.025) ** 2;
  const lo = bisect((mu) => profiled(mu) - s0 - rise, p.estimate! - 60, p.estimate!);
  const hi = bisect((mu) => profiled(mu) - s0 - rise, p.estimate!, p.estimate! + 60);
  // To 1e-6 relative (the golden section converges further than that).
  near(pr.lower, lo, 1e-6, "profile lower");
  near(pr.upper, hi, 1e-6, "profile upper");
  // Not the Wald interval: the profile is asymmetric about ŷ₀ where the delta method is not.
  const below = p.estimate! - pr.lower!, above = pr.upper! - p.estimate!;
  assert.ok(Math.abs(above / below - 1) > 0.01, `${below} below, ${above} above`);
  // The same as the fit's own derived quantity of the same expression (one machinery).
  const derivedFit = fitOf({ conc: CONC, rate: RATE }, "rate = Vm*conc/(K + conc)", {
    start: { Vm: 200, K: 0.1 },
    derived: { mu: `Vm*${x0}/(K + ${x0})` },
  });
  const d = derivedFit.intervals!.derived[0];
  near(by(d.intervals, "profile")!.lower, pr.lower!, 1e-9, "as derived, lower");
  near(by(d.intervals, "profile")!.upper, pr.upper!, 1e-9, "as derived, upper");
});

/** y = a·exp(−b·x) data, invented, with a seeded multiplicative wobble. */
function decay(n: number): { x: number[]; y: number[] } {
  const r = mulberry32(11);
  const x = Array.from({ length: n }, (_, i) => (i * 8) / (n - 1));
  const y = x.map((v) => 5 * Math.exp(-0.35 * v) + 0.15 * (r() - 0.5));
  return { x, y };
}

/** θ*₍₍B+1₎q₎, interpolated between ranks (Davison & Hinkley 1997, eq. 5.18). */
function order(sorted: number[], q: number): number {
  const r = (sorted.length + 1) * q, k = Math.floor(r), f = r - k;
  return sorted[k - 1] + f * (sorted[k] - sorted[k - 1]);
}

Deno.test("bootstrap percentile and BCa of the mean response equal those of f(x₀; θ*) read from the fit's replicates", () => {
  const fit = fitOf(decay(25), "y = a*exp(-b*x)", {
    start: { a: 4, b: 0.3 },
    bootstrap: { resamples: 999 },
  });
  const x0 = 3;
  const { result } = predict(fit, { at: { x: [x0] } });
  const p = result.at[0];
  const run = fit.intervals!.bootstrap!;
  const f = (a: number, b: number) => a * Math.exp(-b * x0);
  const values: number[] = [];
  for (let r = 0; r < run.b; r++) values.push(f(run.replicates[2 * r], run.replicates[2 * r + 1]));
  values.sort((u, v) => u - v);
  const pct = by(p.intervals, "bootstrap-percentile")!;
  // The percentile limits are the order statistics (D&H eq. 5.18) of g(θ*): exact to rounding.
  near(pct.lower, order(values, 0.025), 1e-12, "percentile lower");
  near(pct.upper, order(values, 0.975), 1e-12, "percentile upper");
  // BCa (Efron & Tibshirani 1993, §14.3, eqs. 14.14–14.15) from the same values and the
  // fit's jackknife, computed here by those formulas.
  const est = f(fit.estimates[0], fit.estimates[1]);
  const below = values.reduce((s, v) => s + (v < est ? 1 : v === est ? 0.5 : 0), 0);
  const N = standardNormal;
  const z0 = N.quantile(below / values.length);
  const jack = Array.from(
    { length: run.jackknifeRows },
    (_, i) => f(run.jackknife![2 * i], run.jackknife![2 * i + 1]),
  );
  const mean = jack.reduce((s, v) => s + v, 0) / jack.length;
  const s2 = jack.reduce((s, v) => s + (mean - v) ** 2, 0);
  const s3 = jack.reduce((s, v) => s + (mean - v) ** 3, 0);
  const acc = s3 / (6 * s2 ** 1.5);
  const level = (za: number) => N.cdf(z0 + (z0 + za) / (1 - acc * (z0 + za)));
  const bca = by(p.intervals, "bootstrap-bca")!;
  near(bca.lower, order(values, level(N.quantile(0.025))), 1e-12, "BCa lower");
  near(bca.upper, order(values, level(N.quantile(0.975))), 1e-12, "BCa upper");
  assert.ok(bca.mc_error!.lower! > 0 && pct.mc_error!.upper! > 0);
  // Profile too (a nonlinear fit carries it by default), between Wald and the bootstrap.
  assert.deepEqual(p.intervals!.map((i) => i.method), [
    "wald",
    "profile",
    "bootstrap-percentile",
    "bootstrap-bca",
  ]);
  assert.match(result.interval_methods!, /999 residual resamples/);
});

Deno.test("the bootstrap prediction interval agrees with a brute-force prediction-error resampling within its Monte Carlo error", () => {
  // Invented: a straight line with seeded uniform noise, n = 30.
  const r = mulberry32(5);
  const x = Array.from({ length: 30 }, (_, i) => i / 2);
  const y = x.map((v) => 1 + 0.7 * v + 2 * (r() - 0.5));
  const fit = fitOf({ x, y }, "y = a + b*x", { bootstrap: { resamples: 4000 } });
  const x0 = 12;
  const { result } = predict(fit, { at: { x: [x0] } });
  const p = result.at[0];
  const boot = by(p.pi_intervals, "bootstrap-percentile")!;
  assert.equal(p.pi_intervals![0].method, "wald");
  // Brute force, Davison & Hinkley (1997) Alg. 6.4 with M = 25 errors per replicate and our own
  // draws: δ* = x₀ᵀβ* − (x₀ᵀβ̂ + ε*), ε* from the centred modified residuals rᵢ/√(1 − hᵢ),
  // hᵢ = 1/n + (xᵢ − x̄)²/Sxx for a line (hand formula).
  const n = x.length, xbar = x.reduce((s, v) => s + v, 0) / n;
  const sxx = x.reduce((s, v) => s + (v - xbar) ** 2, 0);
  const mod = fit.residuals.map((e, i) => e / Math.sqrt(1 - (1 / n + (x[i] - xbar) ** 2 / sxx)));
  const mbar = mod.reduce((s, v) => s + v, 0) / n;
  const run = fit.intervals!.bootstrap!;
  const yhat = fit.estimates[0] + fit.estimates[1] * x0;
  const u = mulberry32(99);
  const deltas: number[] = [];
  for (let k = 0; k < run.b; k++) {
    const star = run.replicates[2 * k] + run.replicates[2 * k + 1] * x0;
    for (let m = 0; m < 25; m++) deltas.push(star - (yhat + mod[Math.floor(u() * n)] - mbar));
  }
  deltas.sort((a, b) => a - b);
  const lo = yhat - order(deltas, 0.975), hi = yhat - order(deltas, 0.025);
  // Within 4 Monte Carlo errors of ours (the brute force's own is 5 times smaller).
  assert.ok(Math.abs(boot.lower! - lo) <= 4 * boot.mc_error!.lower!, `${boot.lower} vs ${lo}`);
  assert.ok(Math.abs(boot.upper! - hi) <= 4 * boot.mc_error!.upper!, `${boot.upper} vs ${hi}`);
  // And near the normal-theory interval for data this plain (within 15 %; common practice, no
  // source: uniform errors have lighter tails, so the bootstrap interval is a little narrower).
  const wald = p.pi!;
  near(boot.upper! - boot.lower!, wald[1] - wald[0], 0.15, "width against the t interval");
});

Deno.test("bootstrap prediction intervals repeat with the seed, are per point, and change with another seed", () => {
  const fit = fitOf(decay(20), "y = a*exp(-b*x)", {
    start: { a: 4, b: 0.3 },
    bootstrap: { resamples: 400 },
  });
  const one = predict(fit, { at: { x: [2, 5] } }).result.at;
  const again = predict(fit, { at: { x: [2, 5] } }).result.at;
  assert.deepEqual(again.map((p) => p.pi_intervals), one.map((p) => p.pi_intervals));
  assert.deepEqual(again.map((p) => p.intervals), one.map((p) => p.intervals));
  // Each point draws its own stream: the first point's interval does not depend on the others.
  const alone = predict(fit, { at: { x: [2] } }).result.at[0];
  assert.deepEqual(alone.pi_intervals, one[0].pi_intervals);
  const other = predict(fit, { at: { x: [2, 5] } }, { seed: 2 }).result.at;
  const b1 = by(one[0].pi_intervals, "bootstrap-percentile")!;
  const b2 = by(other[0].pi_intervals, "bootstrap-percentile")!;
  assert.notEqual(b1.lower, b2.lower);
  // The mean response's bootstrap rests on the fit's replicates only: the same under another seed.
  assert.deepEqual(other[0].intervals, one[0].intervals);
});

Deno.test("a log response reports every labelled interval back-transformed, the model scale kept", () => {
  const { x, y } = decay(20);
  const fit = fitOf({ x, y: y.map((v) => Math.max(v, 0.05)) }, "log(y) = a - b*x", {
    intervals: ["profile"],
    bootstrap: { resamples: 300 },
  });
  const { result } = predict(fit, { at: { x: [1, 4] } });
  for (const p of result.at as PredictPointResult[]) {
    const ms = p.model_scale!;
    assert.equal(p.intervals!.length, 4);
    p.intervals!.forEach((iv, k) => {
      const m = ms.intervals![k];
      assert.equal(iv.method, m.method);
      // exp is increasing: the ends map through in order (response_scale.ts).
      assert.equal(iv.lower, Math.exp(m.lower!));
      assert.equal(iv.upper, Math.exp(m.upper!));
    });
    assert.deepEqual([p.intervals![0].lower, p.intervals![0].upper], p.ci);
    assert.deepEqual([p.pi_intervals![0].lower, p.pi_intervals![0].upper], p.pi);
    const b = by(p.pi_intervals, "bootstrap-percentile")!;
    const bm = by(ms.pi_intervals, "bootstrap-percentile")!;
    assert.equal(b.upper, Math.exp(bm.upper!));
    // A Monte Carlo error L ± u maps to half the width of exp over it.
    near(
      b.mc_error!.upper,
      (Math.exp(bm.upper! + bm.mc_error!.upper!) - Math.exp(bm.upper! - bm.mc_error!.upper!)) / 2,
      1e-12,
      "mapped Monte Carlo error",
    );
  }
});

Deno.test("a fit without profile or bootstrap gives Wald only, said in interval_methods", () => {
  const spec = fitKind.parse(parseContext("model", { on: "data", model: "y = a + b*x" }));
  const fit = fitKind.run(
    spec,
    runContext("model", "data", makeTable({ x: [1, 2, 3, 4], y: [1.1, 1.9, 3.2, 3.9] })),
  ) as Fit;
  const { result } = predict(fit, { at: { x: [2.5] } }, SETTINGS);
  assert.deepEqual(result.at[0].intervals!.map((i) => i.method), ["wald"]);
  assert.match(result.interval_methods!, /carries no profile or bootstrap/);
});

Deno.test("the CLI lines and the page name every interval's method", async () => {
  const { renderToString } = await import("preact-render-to-string");
  const { PredictView } = await import("./view.tsx");
  const { predictKind } = await import("./mod.ts");
  const fit = fitOf({ conc: CONC, rate: RATE }, "rate = Vm*conc/(K + conc)", {
    start: { Vm: 200, K: 0.1 },
    bootstrap: { resamples: 300 },
  });
  const { result } = predict(fit, { at: { conc: [0.05, 0.5] } });
  const lines = predictKind.details!(result);
  assert.equal(lines.length, 2);
  assert.match(
    lines[0],
    /^conc = 0\.05: .* · 95% mean Wald .*; profile .*; bootstrap percentile .*; bootstrap BCa .* · new observation Wald .*; bootstrap percentile /,
  );
  const html = renderToString(PredictView({ name: "p", result }));
  for (const m of ["Wald", "profile", "bootstrap percentile", "bootstrap BCa", "MC ±"]) {
    assert.ok(html.includes(m), m);
  }
  assert.ok(html.includes("Interval methods: wald: ci and pi; profile"));
  // A Wald-only prediction keeps its one line and its page as before.
  const plain = fitOf({ x: [1, 2, 3, 4], y: [1.1, 1.9, 3.2, 3.9] }, "y = a + b*x");
  const wald = predict(plain, { at: { x: [2.5] } }).result;
  assert.deepEqual(predictKind.details!(wald), []);
  assert.ok(!renderToString(PredictView({ name: "p", result: wald })).includes("Interval methods"));
});

Deno.test("under 1/x² weights the bootstrap prediction interval widens with x as the Wald one does", () => {
  // Invented: errors proportional to x (σᵢ = 0.05·xᵢ), fitted with weights 1/x².
  const r = mulberry32(21);
  const x = Array.from({ length: 40 }, (_, i) => 1 + (i % 20) * 0.5);
  const y = x.map((v) => 2 + 3 * v + 0.05 * v * 2 * Math.sqrt(3) * (r() - 0.5));
  const fit = fitOf({ x, y }, "y = a + b*x", {
    weights: "1/x^2",
    bootstrap: { resamples: 2000 },
  });
  const { result } = predict(fit, { at: { x: [1.5, 10] } });
  const width = (list: LabelledInterval[] | undefined, m: LabelledInterval["method"]) => {
    const i = by(list, m)!;
    return i.upper! - i.lower!;
  };
  const [near1, far] = result.at;
  // The new observation's error is scaled by 1/√w₀ = x₀ (s²/w₀, new_observation.ts): the ratio of
  // widths follows the Wald intervals' within 20 % (common practice, no source; Monte Carlo noise).
  const boot = width(far.pi_intervals, "bootstrap-percentile") /
    width(near1.pi_intervals, "bootstrap-percentile");
  const wald = width(far.pi_intervals, "wald") / width(near1.pi_intervals, "wald");
  near(boot, wald, 0.2, "width ratio, x = 10 against x = 1.5");
  assert.ok(wald > 5, String(wald));
});
