/**
 * The chart's bands: of the mean and of a new observation, pointwise and
 * simultaneous (Scheffé, bootstrap sup-t). Each numerical check names its
 * source beside it.
 */
import { deepEqual, equal, ok, rejects } from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { seededRandom } from "../../kernel/random.ts";
import { fisherF, standardNormal, studentT } from "../../kernel/stats/mod.ts";
import type { Fit } from "../fit/fit.ts";
import { addFit, addFitWith, addTable, type Cells, runChartCell } from "./_testing.ts";
import { pointwiseMultiplier, scheffeMultiplier } from "./_band_quantiles.ts";
import { leastReplicates } from "./_bootstrap_band.ts";
import { chartKind } from "./mod.ts";

// Small straight-line data (invented), x = 1..5: x̄ = 3, Sxx = 10.
const XS = [1, 2, 3, 4, 5], YS = [1.1, 1.9, 3.2, 3.8, 5.1];
const LINE = { on: "t", x: "x", y: "y", band: "line" };

async function lineCells(): Promise<Cells> {
  const cells: Cells = {};
  await addTable(cells, "t", { columns: ["x", "y"], rows: XS.map((x, i) => [x, YS[i]]) });
  await addFit(cells, "line", "t", "y = a + b*x");
  return cells;
}

/** s·√(1/n + (x0 − x̄)²/Sxx) for the small line: the standard error of its mean at x0. */
function lineSe(fit: Fit, x0: number): number {
  return fit.statistics.sigma! * Math.sqrt(1 / 5 + (x0 - 3) ** 2 / 10);
}

function near(actual: number, expected: number, tol: number, what: string) {
  ok(Math.abs(actual - expected) <= tol, `${what}: ${actual} vs ${expected}`);
}

Deno.test("scheffeMultiplier() gives the Working–Hotelling W of a published worked example", () => {
  // Kutner, Nachtsheim, Neter & Li, Applied Linear Statistical Models, 5th ed., §2.6 / §4.3,
  // Toluca Company example (n = 25, 1 − α = 0.90): W² = 2F(0.90; 2, 23) = 2(2.549) = 5.098,
  // W = 2.258 (from memory).
  near(fisherF(2, 23).upperQuantile(0.1), 2.549, 5e-4, "F(0.90; 2, 23)");
  const w = scheffeMultiplier("t", 2, 23, 0.9);
  near(w.q, 2.258, 5e-4, "W");
  equal(w.of, "√(2·F(0.9; 2, 23))");
  // With known σ the S-method's quantile is χ²: √χ²(0.95; 2) = √(−2 ln 0.05) (exact: χ²₂ is exponential).
  near(scheffeMultiplier("normal", 2, 23, 0.95).q, Math.sqrt(-2 * Math.log(0.05)), 1e-12, "√χ²₂");
  // One direction: Scheffé's q is the two-sided t quantile (F(c; 1, ν) = t²; exact identity).
  near(scheffeMultiplier("t", 1, 7, 0.95).q, pointwiseMultiplier("t", 7, 0.95).q, 1e-9, "d = 1");
});

Deno.test("runChart() scheffe band of a straight line is Working–Hotelling: W·s·√(1/n + (x0 − x̄)²/Sxx)", async () => {
  const cells = await lineCells();
  const { out } = await runChartCell(cells, { ...LINE, band_method: "scheffe" });
  const d = out.data, fit = cells.line as Fit, b = d.band!;
  // W = √(2·F(0.95; 2, n − 2)) (Working & Hotelling 1929; Kutner et al. 5th ed. §2.6, from memory).
  const w = Math.sqrt(2 * fisherF(2, 3).upperQuantile(0.05));
  near(b.quantile, w, 1e-12, "W");
  for (const i of [0, 40, 80, 160]) {
    const half = w * lineSe(fit, d.grid[i]);
    near(b.hi[i]! - d.curves[0].y[i]!, half, 1e-12, `upper half width at grid ${i}`);
    near(d.curves[0].y[i]! - b.lo[i]!, half, 1e-12, `lower half width at grid ${i}`);
  }
  deepEqual([b.kind, b.coverage, b.method, b.quantile_of], [
    "mean",
    "simultaneous",
    "Scheffé, simultaneous",
    "√(2·F(0.95; 2, 3))",
  ]);
  ok(b.note!.startsWith("Working–Hotelling"), b.note!);
  equal(b.label, "line: 95% band of the mean (Scheffé, simultaneous)");
  // W exceeds the pointwise t: a simultaneous band is wider everywhere (exact: F(2, ν)·2 > t² here).
  ok(w > studentT(3).upperQuantile(0.025));
});

Deno.test("runChart() band of a new observation of a straight line: t·s·√(1/m + 1/n + (x0 − x̄)²/Sxx)", async () => {
  const cells = await lineCells();
  const fit = cells.line as Fit, s = fit.statistics.sigma!;
  // Draper & Smith, Applied Regression Analysis, 3rd ed., §1.4 (eq. 1.4.8 for m = 1; the mean of m
  // new observations replaces 1 by 1/m), from memory; the sums written out by hand, not the fit's.
  const t = studentT(3).upperQuantile(0.025);
  for (const m of [1, 4]) {
    const { out } = await runChartCell(cells, {
      ...LINE,
      band_for: "both",
      ...(m > 1 ? { new_observations: m } : {}),
    });
    const [mean, obs] = out.data.bands;
    equal(mean.kind, "mean");
    equal(obs.kind, "observation");
    equal(out.data.band, mean, "band is the first of bands");
    for (const i of [0, 57, 160]) {
      const x0 = out.data.grid[i];
      const half = t * s * Math.sqrt(1 / m + 1 / 5 + (x0 - 3) ** 2 / 10);
      near(obs.hi[i]! - out.data.curves[0].y[i]!, half, 1e-12, `m = ${m} at x0 = ${x0}`);
    }
    equal(obs.method, "delta, pointwise");
    equal(obs.quantile_of, "t(0.975; 3)");
    ok(obs.new_observation!.startsWith("s²/m for"), obs.new_observation!);
    equal(out.data.marks, 1 + 1 + 2);
  }
});

Deno.test("runChart() scheffe band of a new observation uses √((p+1)·F(c; p+1, ν))", async () => {
  const cells = await lineCells();
  const { out } = await runChartCell(cells, {
    ...LINE,
    band_for: "observation",
    band_method: "scheffe",
    band_level: 0.9,
  });
  const b = out.data.bands[0], fit = cells.line as Fit, s = fit.statistics.sigma!;
  equal(out.data.bands.length, 1);
  // Scheffé's S-method over the p + 1 = 3 directions (θ̂ − θ, e₀) (Scheffé 1959, §3.5; from memory).
  const q = Math.sqrt(3 * fisherF(3, 3).upperQuantile(0.1));
  near(b.quantile, q, 1e-12, "q");
  equal(b.level, 0.9);
  const x0 = out.data.grid[100];
  near(
    b.hi[100]! - out.data.curves[0].y[100]!,
    q * s * Math.sqrt(1 + 1 / 5 + (x0 - 3) ** 2 / 10),
    1e-12,
    "half width",
  );
  equal(b.label, "line: 90% band of a new observation (Scheffé, simultaneous)");
});

Deno.test("runChart() pointwise band of a nonlinear fit equals the delta method by central differences", async () => {
  // Invented decay data: y = 5·exp(−0.4·x) + 1 plus seeded noise.
  const r = seededRandom(11);
  const rows = Array.from({ length: 15 }, (_, i) => {
    const x = 0.5 * i;
    return [x, 5 * Math.exp(-0.4 * x) + 1 + 0.05 * r.normal()];
  });
  const cells: Cells = {};
  await addTable(cells, "d", { columns: ["x", "y"], rows });
  await addFit(cells, "decay", "d", "y = a*exp(-b*x) + c", { a: 4, b: 0.5, c: 0.5 });
  const fit = cells.decay as Fit;
  const { out } = await runChartCell(cells, { on: "d", x: "x", y: "y", band: "decay" });
  const band = out.data.band!;
  const f = (th: number[], x: number) => th[0] * Math.exp(-th[1] * x) + th[2];
  const est = Array.from(fit.estimates), cov = fit.statistics.covariance;
  const t = studentT(fit.statistics.dfResidual).upperQuantile(0.025);
  for (const i of [0, 33, 120, 160]) {
    const x0 = out.data.grid[i];
    // g by central differences, h = 1e-6·max(1, |θ|) (common practice, no source).
    const g = est.map((v, j) => {
      const h = 1e-6 * Math.max(1, Math.abs(v));
      const up = est.slice(), down = est.slice();
      up[j] += h;
      down[j] -= h;
      return (f(up, x0) - f(down, x0)) / (2 * h);
    });
    let v = 0;
    for (let j = 0; j < 3; j++) for (let k = 0; k < 3; k++) v += g[j] * cov[j + 3 * k] * g[k];
    const half = t * Math.sqrt(v);
    // Delta method, se_fit = √(gᵀ Cov g) (Bates & Watts 1988, §2.3.1; from memory).
    near(band.hi[i]! - out.data.curves[0].y[i]!, half, 1e-7 * half, `x0 = ${x0}`);
  }
  const s = await runChartCell(cells, {
    on: "d",
    x: "x",
    y: "y",
    band: "decay",
    band_method: "scheffe",
  });
  ok(s.out.data.band!.note!.startsWith("linearised"), s.out.data.band!.note!);
  // The linearised Scheffé multiplier: √(3·F(0.95; 3, 12)) (the S-method on the tangent plane).
  near(s.out.data.band!.quantile, Math.sqrt(3 * fisherF(3, 12).upperQuantile(0.05)), 1e-12, "q");
});

Deno.test("runChart() band of a new observation of a 1/x² weighted fit takes s²·x0² at each x", async () => {
  // Invented calibration rows whose spread grows with x.
  const xs = [1, 2, 3, 4, 5, 6, 8, 10];
  const ys = [2.1, 3.9, 6.3, 7.7, 10.4, 11.5, 16.9, 19.2];
  const cells: Cells = {};
  await addTable(cells, "c", { columns: ["x", "y"], rows: xs.map((x, i) => [x, ys[i]]) });
  await addFitWith(cells, "w", { on: "c", model: "y = a + b*x", weights: "1/x^2" });
  const fit = cells.w as Fit, s = fit.statistics.sigma!;
  const { out } = await runChartCell(cells, {
    on: "c",
    x: "x",
    y: "y",
    band: "w",
    band_for: "both",
  });
  const [mean, obs] = out.data.bands;
  const t = studentT(6).upperQuantile(0.025);
  for (const i of [0, 80, 160]) {
    const x0 = out.data.grid[i];
    const se = (mean.hi[i]! - out.data.curves[0].y[i]!) / t;
    // s₀² = s²/w₀ with w₀ = 1/x0² (Draper & Smith 3rd ed. ch. 9; from memory), exact arithmetic beside it.
    near(
      obs.hi[i]! - out.data.curves[0].y[i]!,
      t * Math.sqrt(se * se + s * s * x0 * x0),
      1e-9,
      `x0 = ${x0}`,
    );
  }
  ok(obs.new_observation!.includes("1/x^2"), obs.new_observation!);
});

Deno.test("runChart() band of a new observation says what it assumes when the weights read another column", async () => {
  const xs = [1, 2, 3, 4, 5, 6], ys = [1.2, 1.8, 3.3, 3.9, 5.2, 5.8], ws = [1, 1, 2, 2, 4, 4];
  const cells: Cells = {};
  await addTable(cells, "c", {
    columns: ["x", "y", "w"],
    rows: xs.map((x, i) => [x, ys[i], ws[i]]),
  });
  await addFitWith(cells, "f", { on: "c", model: "y = a + b*x", weights: "w" });
  const fit = cells.f as Fit, s = fit.statistics.sigma!;
  const { out, warnings } = await runChartCell(cells, {
    on: "c",
    x: "x",
    y: "y",
    band: "f",
    band_for: "observation",
  });
  // s²·mean(1/wᵢ) = s²·(1 + 1 + ½ + ½ + ¼ + ¼)/6 = s²·0.5833… (exact arithmetic).
  const v0 = s * s * 3.5 / 6;
  const b = out.data.band!, i = 30, x0 = out.data.grid[i];
  const t = studentT(4).upperQuantile(0.025);
  const { out: meanOut } = await runChartCell(cells, { on: "c", x: "x", y: "y", band: "f" });
  const se = (meanOut.data.band!.hi[i]! - meanOut.data.curves[0].y[i]!) / t;
  near(b.hi[i]! - out.data.curves[0].y[i]!, t * Math.sqrt(se * se + v0), 1e-9, `x0 = ${x0}`);
  ok(b.new_observation!.includes("mean variance, assumed"), b.new_observation!);
  ok(
    warnings.some((w) =>
      w.startsWith(
        `Band of a new observation of "f" in chart "c" assumes the fitted rows' mean variance`,
      ) &&
      w.includes(`reads column "w"`)
    ),
    warnings.join("\n"),
  );
});

Deno.test("runChart() bands of a known-σ fit use the normal quantile, and χ² for Scheffé", async () => {
  const cells: Cells = {};
  await addTable(cells, "k", {
    columns: ["x", "y"],
    rows: XS.map((x, i) => [x, YS[i]]),
  });
  await addFitWith(cells, "ks", { on: "k", model: "y = a + b*x", known_sigma: "0.2" });
  const { out } = await runChartCell(cells, {
    on: "k",
    x: "x",
    y: "y",
    band: "ks",
    band_for: "both",
  });
  const [mean, obs] = out.data.bands;
  // z(0.975) = 1.959964 (NIST/SEMATECH e-Handbook §1.3.6.7.1).
  near(mean.quantile, 1.959964, 1e-6, "z");
  equal(mean.quantile_of, "z(0.975)");
  // A new observation's σ₀ is the known_sigma expression at x: 0.2 (exact arithmetic).
  const i = 70, y0 = out.data.curves[0].y[i]!;
  const se = (mean.hi[i]! - y0) / mean.quantile;
  near(
    obs.hi[i]! - y0,
    standardNormal.upperQuantile(0.025) * Math.sqrt(se * se + 0.04),
    1e-12,
    "σ₀",
  );
  const sch = await runChartCell(cells, {
    on: "k",
    x: "x",
    y: "y",
    band: "ks",
    band_method: "scheffe",
  });
  equal(sch.out.data.band!.quantile_of, "√χ²(0.95; 2)");
});

/**
 * The fraction of seeded trials in which the band covers the true line at
 * every grid point (x = 1..10, true line 2 + 0.5·x, σ = 1, n = 10).
 */
async function coverage(trials: number, options: Record<string, unknown>, seed: number) {
  const r = seededRandom(seed);
  const xs = Array.from({ length: 10 }, (_, i) => i + 1);
  let everywhere = 0, single = 0;
  for (let k = 0; k < trials; k++) {
    const cells: Cells = {};
    await addTable(cells, "t", {
      columns: ["x", "y"],
      rows: xs.map((x) => [x, 2 + 0.5 * x + r.normal()]),
    });
    await addFit(cells, "line", "t", "y = a + b*x");
    const { out } = await runChartCell(cells, { ...LINE, ...options });
    const b = out.data.band!, g = out.data.grid;
    if (b.kind === "mean") {
      if (g.every((x, i) => b.lo[i]! <= 2 + 0.5 * x && 2 + 0.5 * x <= b.hi[i]!)) everywhere++;
    } else {
      // One new observation at a random x of the plotted range, and the shared-error event the
      // Scheffé band of a new observation is built for (the same e₀ at every x).
      const i = Math.floor(r() * g.length), e0 = r.normal();
      const y0 = 2 + 0.5 * g[i] + r.normal();
      if (b.lo[i]! <= y0 && y0 <= b.hi[i]!) single++;
      if (g.every((x, j) => b.lo[j]! <= 2 + 0.5 * x + e0 && 2 + 0.5 * x + e0 <= b.hi[j]!)) {
        everywhere++;
      }
    }
  }
  return { everywhere: everywhere / trials, single: single / trials };
}

Deno.test("simultaneous bands cover at their level in a seeded simulation; pointwise ones do not", async () => {
  // 400 trials: the binomial standard error at 0.95 is 0.011; we accept 3 of them below
  // (common practice, no source). Working–Hotelling over all x is exact at 0.95, so over the
  // plotted range it covers at least that.
  const trials = 400;
  const wh = await coverage(trials, { band_method: "scheffe" }, 1);
  ok(wh.everywhere >= 0.95 - 3 * 0.011, `Working–Hotelling covered ${wh.everywhere}`);
  const pw = await coverage(trials, {}, 1);
  ok(pw.everywhere < wh.everywhere, `pointwise ${pw.everywhere} vs simultaneous ${wh.everywhere}`);
  ok(
    pw.everywhere < 0.95 - 3 * 0.011,
    `the pointwise band covers the whole line less often: ${pw.everywhere}`,
  );
  const obs = await coverage(trials, { band_for: "observation", band_method: "scheffe" }, 2);
  ok(obs.everywhere >= 0.95 - 3 * 0.011, `mean curve plus one new observation: ${obs.everywhere}`);
  ok(obs.single >= 0.95 - 3 * 0.011, `one new observation: ${obs.single}`);
});

/** The small line with a hand-made bootstrap: B replicates that shift the intercept by k·ε, k = 1..B. */
async function lineWithReplicates(b: number, eps: number) {
  const cells = await lineCells();
  const fit = cells.line as Fit;
  const reps = new Float64Array(2 * b);
  for (let k = 0; k < b; k++) {
    reps[2 * k] = fit.estimates[0] + (k + 1) * eps;
    reps[2 * k + 1] = fit.estimates[1];
  }
  const withBoot = { ...fit, bootstrap: { replicates: reps, b, resample: "residuals", seed: 7 } };
  cells.line = withBoot as Fit;
  return cells;
}

Deno.test("runChart() bootstrap band takes the sup-t order statistic ⌈(B+1)c⌉ of the replicates", async () => {
  const eps = 0.01, B = 39;
  const cells = await lineWithReplicates(B, eps);
  const fit = cells.line as Fit;
  const { out } = await runChartCell(cells, { ...LINE, band_method: "bootstrap" });
  const b = out.data.band!;
  // Replicate k moves the line by k·ε at every x, so max |f* − f̂|/se_fit is k·ε over the
  // smallest se_fit, s/√5 at x̄ = 3 (on the grid: 1 + 4·80/160); rank ⌈40·0.95⌉ = 38
  // (exact arithmetic; the rank rule of Davison & Hinkley 1997, eq. 5.18).
  const q = 38 * eps / lineSe(fit, 3);
  near(b.quantile, q, 1e-9 * q, "sup-t quantile");
  equal(b.method, "bootstrap sup-t, simultaneous, B = 39");
  equal(b.label, "line: 95% band of the mean (bootstrap sup-t, simultaneous, B = 39)");
  ok(b.quantile_of.startsWith("order statistic 38 of 39"), b.quantile_of);
  near(b.hi[0]! - out.data.curves[0].y[0]!, q * lineSe(fit, 1), 1e-9, "half width at x = 1");
  // Too few replicates for the level: ⌈(B+1)c⌉ > B (exact arithmetic: B ≥ c/(1 − c)).
  equal(leastReplicates(0.95), 19);
  const few = await lineWithReplicates(18, eps);
  const e = await refusal(few, { ...LINE, band_method: "bootstrap" });
  equal(
    e.message,
    `Cannot draw a bootstrap band of fit "line" in chart "c" at level 0.95: it needs at least 19 replicates, and the fit has 18`,
  );
});

async function refusal(cells: Cells, options: Record<string, unknown>): Promise<CellError> {
  let caught: unknown;
  await rejects(async () => {
    try {
      await runChartCell(cells, options);
    } catch (e) {
      caught = e;
      throw e;
    }
  }, CellError);
  return caught as CellError;
}

Deno.test("runChart() refuses a bootstrap band of a fit without replicates, at band_method", async () => {
  const e = await refusal(await lineCells(), { ...LINE, band_method: "bootstrap" });
  equal(
    e.message,
    `Cannot draw a bootstrap band of fit "line" in chart "c": the fit has no bootstrap replicates: ask the fit for bootstrap intervals (intervals: [wald, bootstrap], or bootstrap: { resamples: 2000 })`,
  );
  deepEqual(e.path, ["band_method"]);
});

Deno.test("runChart() bootstrap band from the fit's own residual bootstrap lies between t and a wide bound", async () => {
  // Invented line, n = 20, seeded noise; the fit's bootstrap: 999 residual resamples.
  const r = seededRandom(5);
  const cells: Cells = {};
  await addTable(cells, "t", {
    columns: ["x", "y"],
    rows: Array.from({ length: 20 }, (_, i) => [i, 1 + 0.3 * i + 0.5 * r.normal()]),
  });
  await addFitWith(cells, "line", {
    on: "t",
    model: "y = a + b*x",
    bootstrap: { resamples: 999, resample: "residuals" },
  });
  const { out } = await runChartCell(cells, { ...LINE, band_method: "bootstrap" });
  const q = out.data.band!.quantile;
  // The sup over a range of the t ratio exceeds the pointwise t and, for a straight line, stays
  // near Working–Hotelling's W (its bound over every x); 15 % allowance for the resampling
  // (common practice, no source).
  const t = studentT(18).upperQuantile(0.025),
    w = Math.sqrt(2 * fisherF(2, 18).upperQuantile(0.05));
  ok(q > 0.95 * t && q < 1.15 * w, `t ${t}, sup-t ${q}, W ${w}`);
  ok(out.data.band!.method.endsWith("B = 999"), out.data.band!.method);
  equal(
    chartKind.line(chartKind.summary(out, {} as never)),
    "y against x · 20 points · 1 curve · line: 95% band of the mean (bootstrap sup-t, simultaneous, B = 999)",
  );
});
