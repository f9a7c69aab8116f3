/**
 * Intervals labelled by method (issue 19): profile likelihood against
 * independent computations of the same profile, the linear case against the
 * t interval, a profile that does not close, and the bootstrap against a
 * brute-force resampling of its own.
 */
import assert from "node:assert/strict";
import { fitResult, makeTable, parseContext, runContext } from "./_fixtures_test.ts";
import { fitKind } from "./mod.ts";
import type { Fit } from "./fit.ts";
import { studentT } from "../../kernel/stats/mod.ts";
import { mulberry32 } from "../../kernel/random.ts";
import type { LabelledInterval } from "./_profile.ts";

type Param = { name: string; estimate: number; std_error: number; intervals: LabelledInterval[] };

const paramsOf = (r: unknown) => (r as { parameters: Param[] }).parameters;
const byMethod = (p: Param, m: LabelledInterval["method"]) =>
  p.intervals.find((i) => i.method === m)!;

/**
 * Puromycin, treated cells: Treloar (1974), as tabulated in Bates & Watts,
 * *Nonlinear Regression Analysis and Its Applications* (1988), Appendix A1.3,
 * and fitted there with the Michaelis–Menten model (ch. 2, 6); the data from
 * memory of that table (the R datasets copy agrees).
 */
const CONC = [0.02, 0.02, 0.06, 0.06, 0.11, 0.11, 0.22, 0.22, 0.56, 0.56, 1.10, 1.10];
const RATE = [76, 47, 97, 107, 123, 139, 159, 152, 191, 201, 207, 200];

/** RSS of the Michaelis–Menten model minimised over Vm in closed form, at fixed K (Vm enters linearly). */
function rssAtK(k: number): { rss: number; vm: number } {
  let sgy = 0, sgg = 0, syy = 0;
  for (let i = 0; i < CONC.length; i++) {
    const g = CONC[i] / (k + CONC[i]);
    sgy += g * RATE[i];
    sgg += g * g;
    syy += RATE[i] * RATE[i];
  }
  return { rss: syy - (sgy * sgy) / sgg, vm: sgy / sgg };
}

/** RSS minimised over K at fixed Vm: golden-section search on a bracket (a one-dimensional minimum). */
function rssAtVm(vm: number): number {
  const rss = (k: number) => CONC.reduce((s, c, i) => s + (RATE[i] - (vm * c) / (k + c)) ** 2, 0);
  let a = 1e-4, b = 1;
  const r = (Math.sqrt(5) - 1) / 2;
  for (let it = 0; it < 200; it++) {
    const c = b - r * (b - a), d = a + r * (b - a);
    if (rss(c) < rss(d)) b = d;
    else a = c;
  }
  return rss((a + b) / 2);
}

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

Deno.test("profile intervals of the Puromycin fit equal the profile computed independently (closed form in Vm, golden section in K), and K's is asymmetric", () => {
  const { result } = fitResult(
    "mm",
    "rate = Vm*conc/(K + conc)",
    makeTable({ conc: CONC, rate: RATE }),
    { start: { Vm: 200, K: 0.1 } },
  );
  const [vm, k] = paramsOf(result);
  const n = CONC.length, nu = n - 2;
  const s0 = rssAtK(k.estimate).rss;
  // The interval |τ| ≤ t: S(θⱼ) − S₀ = s²·t², s² = S₀/ν (Bates & Watts 1988, §6.1).
  const rise = (s0 / nu) * studentT(nu).upperQuantile(0.025) ** 2;
  const kLo = bisect((x) => rssAtK(x).rss - s0 - rise, 0.01, k.estimate);
  const kHi = bisect((x) => rssAtK(x).rss - s0 - rise, k.estimate, 0.5);
  const vmLo = bisect((x) => rssAtVm(x) - s0 - rise, 150, vm.estimate);
  const vmHi = bisect((x) => rssAtVm(x) - s0 - rise, vm.estimate, 300);
  const pk = byMethod(k, "profile"), pvm = byMethod(vm, "profile");
  // Limits to 1e-6 relative (each independent computation converges further than that).
  const near = (got: number | null, want: number) =>
    assert.ok(Math.abs(got! - want) <= 1e-6 * Math.abs(want), `${got} vs ${want}`);
  near(pk.lower, kLo);
  near(pk.upper, kHi);
  near(pvm.lower, vmLo);
  near(pvm.upper, vmHi);
  // Bates & Watts' point: K's profile interval is asymmetric, longer above, unlike Wald's.
  const above = pk.upper! - k.estimate, below = k.estimate - pk.lower!;
  assert.ok(above / below > 1.2, `K: ${below} below, ${above} above`);
  const wald = byMethod(k, "wald");
  assert.ok(Math.abs((wald.upper! - k.estimate) - (k.estimate - wald.lower!)) < 1e-12);
  assert.equal(pk.note, undefined);
});

Deno.test("a linear fit's profile interval is its t interval (exact for Gaussian errors)", () => {
  // Invented, deterministic data: a line with a wobble.
  const x = Array.from({ length: 15 }, (_, i) => i + 1);
  const y = x.map((v) => 1.5 + 0.8 * v + 0.3 * Math.sin(3.1 * v));
  const { result } = fitResult("line", "y = a + b*x", makeTable({ x, y }), {
    intervals: ["profile"],
  });
  for (const p of paramsOf(result)) {
    const w = byMethod(p, "wald"), pr = byMethod(p, "profile");
    // P(c) is quadratic in c for a linear model: the crossing is the t limit (exact; rounding only).
    assert.ok(Math.abs(pr.lower! - w.lower!) <= 1e-8 * Math.abs(w.lower!), `${p.name} lower`);
    assert.ok(Math.abs(pr.upper! - w.upper!) <= 1e-8 * Math.abs(w.upper!), `${p.name} upper`);
  }
});

Deno.test("a profile that does not close above is said, with no number", () => {
  // Invented: y = a·(1 − exp(−b·x)) on data that never bend (a straight line through 0).
  // As b → 0 with a·b fixed the model tends to the line c·x, so S(a) stays at most the
  // line's RSS for every large a: when that is under the threshold the profile never
  // closes above (exact limit of the model; Bates & Watts 1988 §6.2 discuss such profiles).
  const x = [1, 2, 3, 4, 5, 6, 7, 8];
  const y = x.map((v) => 2 * v * (1 - 0.01 * v) + 0.2 * Math.cos(2.3 * v));
  const { result, warnings } = fitResult("rise", "y = a*(1 - exp(-b*x))", makeTable({ x, y }), {
    start: { a: 50, b: 0.05 },
  });
  const [a] = paramsOf(result);
  const pr = byMethod(a, "profile");
  // The line's RSS at its best slope, against the fit's threshold.
  const sxy = x.reduce((s, v, i) => s + v * y[i], 0), sxx = x.reduce((s, v) => s + v * v, 0);
  const lineRss = y.reduce((s, v, i) => s + (v - (sxy / sxx) * x[i]) ** 2, 0);
  const fitRss = (result as { rss: number }).rss;
  const threshold = (fitRss / 6) * studentT(6).upperQuantile(0.025) ** 2;
  assert.ok(lineRss - fitRss < threshold, "the case is open above by construction");
  assert.equal(pr.upper, null, JSON.stringify(pr) + warnings.join());
  assert.match(pr.note!, /does not close above/);
  assert.ok(pr.lower !== null && pr.lower < a.estimate);
});

Deno.test("bootstrap percentile limits of a slope agree with a brute-force resampling within their Monte Carlo error", () => {
  // Invented data; the brute force below redraws the same modified, centred residuals
  // (Davison & Hinkley 1997, Alg. 6.3) with its own generator, 200,000 times, the slope
  // of each by its closed form Σ(x − x̄)(y* − ȳ*)/Sxx.
  const x = Array.from({ length: 30 }, (_, i) => i / 3);
  const y = x.map((v, i) => 4 + 1.2 * v + 0.9 * Math.sin(7.7 * i) * (1 + 0.1 * v));
  const { result } = fitResult("line", "y = a + b*x", makeTable({ x, y }), {
    bootstrap: { resamples: 4000 },
  });
  const b = paramsOf(result)[1];
  const pct = byMethod(b, "bootstrap-percentile");
  const n = x.length;
  const xm = x.reduce((s, v) => s + v, 0) / n;
  const sxx = x.reduce((s, v) => s + (v - xm) ** 2, 0);
  const a0 = paramsOf(result)[0].estimate, b0 = b.estimate;
  const fitted = x.map((v) => a0 + b0 * v);
  const h = x.map((v) => 1 / n + (v - xm) ** 2 / sxx);
  const e = y.map((v, i) => (v - fitted[i]) / Math.sqrt(1 - h[i]));
  const em = e.reduce((s, v) => s + v, 0) / n;
  const centred = e.map((v) => v - em);
  const rand = mulberry32(20261205);
  const draws = 200_000;
  const slopes = new Float64Array(draws);
  for (let d = 0; d < draws; d++) {
    let sxy = 0;
    for (let i = 0; i < n; i++) {
      const ys = fitted[i] + centred[Math.floor(rand() * n)];
      sxy += (x[i] - xm) * ys;
    }
    slopes[d] = sxy / sxx;
  }
  slopes.sort();
  const q = (p: number) => slopes[Math.round(p * (draws - 1))];
  const lo = q(0.025), hi = q(0.975);
  // Four Monte Carlo standard errors of Plumb's limits (the brute force's own is ~20× smaller).
  assert.ok(Math.abs(pct.lower! - lo) < 4 * pct.mc_error!.lower!, `${pct.lower} vs ${lo}`);
  assert.ok(Math.abs(pct.upper! - hi) < 4 * pct.mc_error!.upper!, `${pct.upper} vs ${hi}`);
  assert.ok(pct.mc_error!.lower! > 0 && pct.mc_error!.lower! < 0.05 * (hi - lo));
  // Seeded from the document's seed: the same run gives the same limits.
  const again = fitResult("line", "y = a + b*x", makeTable({ x, y }), {
    bootstrap: { resamples: 4000 },
  });
  assert.deepEqual(byMethod(paramsOf(again.result)[1], "bootstrap-percentile"), pct);
  assert.ok(byMethod(b, "bootstrap-bca").lower !== null);
});

Deno.test("interval options are checked where written", () => {
  const t = makeTable({ x: [1, 2, 3, 4], y: [1, 2, 3, 5] });
  assert.throws(
    () => fitResult("f", "y = a + b*x", t, { intervals: ["wald", "jackknife"] }),
    /the methods are wald, profile, bootstrap/,
  );
  assert.throws(
    () => fitResult("f", "y = a + b*x", t, { bootstrap: { resamples: 10 } }),
    /whole number from 200/,
  );
  assert.throws(
    () => fitResult("f", "y = a + b*x", t, { bootstrap: { resample: "rows" } }),
    /residuals .* or cases/,
  );
});

/** Fieller's interval for ρ with a + ρ·b = 0 (ρ = −a/b): the roots of (â + ρb̂)² = t²·Var(â + ρb̂). */
function fieller(a: number, b: number, vaa: number, vab: number, vbb: number, t: number) {
  const A = b * b - t * t * vbb, B = 2 * (a * b - t * t * vab), C = a * a - t * t * vaa;
  const disc = Math.sqrt(B * B - 4 * A * C);
  const r1 = (-B - disc) / (2 * A), r2 = (-B + disc) / (2 * A);
  return [Math.min(r1, r2), Math.max(r1, r2)];
}

type Derived = {
  name: string;
  estimate: number;
  std_error: number;
  intervals: LabelledInterval[];
  note?: string;
};

for (
  const c of [{ slope: 0.8, noise: 0.3, label: "a well-determined slope" }, {
    slope: 0.12,
    noise: 0.45,
    label: "a weak slope",
  }]
) {
  Deno.test(`derived x0 = −a/b of a line (${c.label}): the profile interval is Fieller's exactly; the delta method is said to disagree when it does`, () => {
    // Invented, deterministic data.
    const x = Array.from({ length: 12 }, (_, i) => i + 1);
    const y = x.map((v) => 1.5 + c.slope * v + c.noise * Math.sin(3.1 * v));
    const { result } = fitResult("line", "y = a + b*x", makeTable({ x, y }), {
      intervals: ["profile"],
      derived: { x0: "-a/b" },
    });
    const r = result as unknown as {
      parameters: Param[];
      covariance: number[][];
      df_residual: number;
      derived: Derived[];
    };
    const [a, b] = r.parameters;
    const t = studentT(r.df_residual).upperQuantile(0.025);
    const [lo, hi] = fieller(
      a.estimate,
      b.estimate,
      r.covariance[0][0],
      r.covariance[0][1],
      r.covariance[1][1],
      t,
    );
    const x0 = r.derived[0];
    assert.ok(Math.abs(x0.estimate + a.estimate / b.estimate) < 1e-12 * Math.abs(x0.estimate));
    const prof = x0.intervals.find((i) => i.method === "profile")!;
    // Fieller (1954): for a linear model the likelihood-ratio set of ρ is exactly his interval.
    assert.ok(Math.abs(prof.lower! - lo) <= 1e-7 * Math.abs(lo), `${prof.lower} vs ${lo}`);
    assert.ok(Math.abs(prof.upper! - hi) <= 1e-7 * Math.abs(hi), `${prof.upper} vs ${hi}`);
    // The delta method: se² = ∇gᵀ·Cov·∇g, ∇g = (−1/b, a/b²) (exact derivative).
    const g = [-1 / b.estimate, a.estimate / b.estimate ** 2];
    const v = g[0] * g[0] * r.covariance[0][0] + 2 * g[0] * g[1] * r.covariance[0][1] +
      g[1] * g[1] * r.covariance[1][1];
    assert.ok(Math.abs(x0.std_error - Math.sqrt(v)) <= 1e-10 * Math.sqrt(v));
    const wald = x0.intervals[0];
    const off = Math.max(Math.abs(wald.lower! - lo), Math.abs(wald.upper! - hi)) /
      (t * x0.std_error);
    if (off > 0.1) assert.match(x0.note!, /the methods disagree: the profile interval/);
    else assert.equal(x0.note, undefined);
    if (c.slope === 0.12) assert.ok(off > 0.1, `the weak slope's case disagrees (${off})`);
    else assert.ok(off < 0.1, `the strong slope's case agrees (${off})`);
  });
}

Deno.test("a derived half-life carries delta, profile and bootstrap intervals; a bad expression is refused on its name", () => {
  // Invented decay data.
  const t = Array.from({ length: 20 }, (_, i) => i * 0.5);
  const y = t.map((v, i) => 10 * Math.exp(-0.3 * v) + 0.15 * Math.cos(2.7 * i));
  const { result } = fitResult("decay", "y = y0*exp(-k*t)", makeTable({ t, y }), {
    start: { y0: 8, k: 0.2 },
    bootstrap: { resamples: 1000 },
    derived: { half_life: "log(2)/k" },
  });
  const hl = (result as unknown as { derived: Derived[] }).derived[0];
  const k = paramsOf(result)[1];
  assert.ok(Math.abs(hl.estimate - Math.LN2 / k.estimate) < 1e-12);
  assert.deepEqual(hl.intervals.map((i) => i.method), [
    "wald",
    "profile",
    "bootstrap-percentile",
    "bootstrap-bca",
  ]);
  // log(2)/k is monotone in k: its profile interval is k's mapped through it (exact).
  const pk = byMethod(k, "profile");
  const ph = hl.intervals[1];
  assert.ok(Math.abs(ph.lower! - Math.LN2 / pk.upper!) <= 1e-7 * ph.lower!);
  assert.ok(Math.abs(ph.upper! - Math.LN2 / pk.lower!) <= 1e-7 * ph.upper!);
  assert.throws(
    () =>
      fitResult("decay", "y = y0*exp(-k*t)", makeTable({ t, y }), {
        start: { y0: 8, k: 0.2 },
        derived: { half_life: "log(2)/kk" },
      }),
    (e: Error & { path?: unknown }) =>
      /Unknown parameter "kk" in derived quantity "half_life"/.test(e.message),
  );
});

Deno.test("the document's intervals setting is each fit's default; a fit's own option overrides it", () => {
  const x = Array.from({ length: 10 }, (_, i) => i + 1);
  const y = x.map((v) => 2 + 0.5 * v + 0.2 * Math.sin(2.2 * v));
  const t = makeTable({ x, y });
  const withSetting = (extra: Record<string, unknown>) => {
    const spec = fitKind.parse({
      ...parseContext("f", { on: "data", model: "y = a + b*x", ...extra }),
    });
    const ctx = runContext("f", "data", t);
    const settings = { ...ctx.settings, intervals: ["wald", "profile"] };
    const out = fitKind.run(spec, { ...ctx, settings }) as Fit;
    return fitKind.summary(out, spec);
  };
  const methods = (r: unknown) => paramsOf(r)[1].intervals.map((i) => i.method);
  assert.deepEqual(methods(withSetting({})), ["wald", "profile"]);
  assert.deepEqual(methods(withSetting({ intervals: ["wald"] })), ["wald"]);
});
