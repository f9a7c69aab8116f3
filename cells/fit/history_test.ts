import { deepEqual, equal, match, ok } from "node:assert/strict";
import type { Change, ChangeContext, RowChanges, Table } from "../../kernel/contract/mod.ts";
import { tableKind } from "../table/mod.ts";
import { tableHistory } from "../table/history.ts";
import { parseCtx, runCtx } from "../table/_testing.ts";
import { fitKind } from "./mod.ts";
import type { Fit } from "./fit.ts";
import {
  compareParameter,
  DIFFERENCE_TEST,
  fitHistory,
  type FitKept,
  type ParameterShift,
} from "./history.ts";
import { parseContext, runContext } from "./_fixtures_test.ts";

const REPO = new URL("../../", import.meta.url);

/** The real table kind on `text` (units of the fade example). */
async function table(text: string, options: Record<string, unknown> = {}) {
  const spec = tableKind.parse(parseCtx({ from: "d.csv", ...options }));
  const out = await tableKind.run(spec, runCtx({ "d.csv": text }));
  return { out, kept: tableHistory.keep(out, spec, tableKind.summary(out, spec)) };
}

/** The real fit kind of `model` on `data`, kept as the history keeps it. */
async function fit(data: Table, model: string, name = "f"): Promise<FitKept> {
  const spec = fitKind.parse(parseContext(name, { on: "data", model }));
  const out = (await fitKind.run(spec, runContext(name, "data", data))) as Fit;
  return fitHistory.keep(out, spec, fitKind.summary(out, spec)) as FitKept;
}

const ctx = (cell: string, rows: RowChanges | null = null): ChangeContext => ({
  cell,
  level: 0.95,
  rows,
});
const changes = (a: unknown, b: unknown, c = ctx("f")) =>
  fitHistory.changes(a as FitKept, b as FitKept, c);
const codes = (cs: Change[]) => cs.map((c) => c.code);
const moved = (cs: Change[]) =>
  cs.filter((c) => c.code === "parameter-moved").map((c) => c.numbers as unknown as ParameterShift);

/**
 * Invented readings y = 3 + slope·x plus a fixed wobble, x = first..last:
 * the wobble (±0.3, sines of x) stands in for noise and is the same in every run.
 */
function line(first: number, last: number, slope = 2): string {
  const rows = ["x,y"];
  for (let x = first; x <= last; x++) {
    rows.push(`${x},${(3 + slope * x + 0.3 * Math.sin(2.7 * x)).toFixed(4)}`);
  }
  return rows.join("\n");
}

/**
 * Two-sided tail of the standard normal by Simpson's rule on its density,
 * 2∫_{|z|}^{|z|+12} φ(t) dt (the rest is below e^{-72}φ(z)): a route to p
 * that shares nothing with kernel/stats.
 */
function twoSidedBySimpson(z: number): number {
  const a = Math.abs(z), b = a + 12, n = 20_000, h = (b - a) / n;
  const phi = (t: number) => Math.exp(-t * t / 2) / Math.sqrt(2 * Math.PI);
  let s = phi(a) + phi(b);
  for (let i = 1; i < n; i++) s += (i % 2 ? 4 : 2) * phi(a + i * h);
  return 2 * s * h / 3;
}

Deno.test("fit history: a slope that moved outside its interval, with its test", async () => {
  const before = (await table(line(1, 20))).out;
  const steeper = await table(
    `${line(1, 20)}\n${line(21, 40, 2.6).split("\n").slice(1).join("\n")}`,
  );
  const a = await fit(before, "y = b0 + b1*x", "line");
  const b = await fit(steeper.out, "y = b0 + b1*x", "line");
  const rows = tableHistory.changes((await table(line(1, 20))).kept, steeper.kept, ctx("t"))[0]
    .rows!;
  deepEqual(rows, { added: 20, removed: 0, changed: 0 });
  const c = changes(a, b, ctx("line", rows));
  const slope = moved(c).find((m) => m.name === "b1")!;
  ok(slope, JSON.stringify(codes(c)));
  const [was, now] = [a.parameters[1], b.parameters[1]];
  equal(slope.change, now.estimate - was.estimate);
  equal(slope.relative, (now.estimate - was.estimate) / Math.abs(was.estimate));
  equal(slope.outside_previous_interval, now.estimate > was.ci![1]);
  equal(slope.outside_previous_interval, true);
  // The standard normal test of a difference of two independent estimates (common practice,
  // no source): z = Δ/√(se₁² + se₂²), p = 2(1 − Φ(|z|)); p here by Simpson's rule on φ.
  const z = (now.estimate - was.estimate) / Math.sqrt(was.std_error! ** 2 + now.std_error! ** 2);
  ok(Math.abs(slope.z! - z) <= 1e-12 * Math.abs(z));
  const p = twoSidedBySimpson(z);
  ok(Math.abs(slope.p_value! - p) <= 1e-8 * p, `${slope.p_value} vs ${p}`);
  equal(slope.significant, p < 0.05);
  equal(slope.level, 0.95);
  equal(slope.test, DIFFERENCE_TEST);
  match(slope.test, /independent/);
  match(slope.test, /conservative when the runs share rows/);
  const sentence = c.find((x) => x.numbers.name === "b1")!.sentence;
  match(sentence, /^line: b1 moved from [\d.]+ \[[\d.]+, [\d.]+\] to [\d.]+ \[[\d.]+, [\d.]+\], /);
  match(sentence, /outside its previous 95% interval \(z = [\d.]+, p = [\d.e-]+\)\.$/);
  const n = c.find((x) => x.code === "rows-used-changed")!;
  equal(n.sentence, "line: fitted to 40 rows (was 20) with 20 new rows.");
  equal(n.weight, "minor");
});

Deno.test("fit history: more rows from the same law leave the estimates steady", async () => {
  const a = await fit((await table(line(1, 20))).out, "y = b0 + b1*x");
  const b = await fit((await table(line(1, 30))).out, "y = b0 + b1*x");
  const c = changes(a, b);
  deepEqual(moved(c), []);
  const steady = c.find((x) => x.code === "parameters-steady")!;
  equal(steady.weight, "minor");
  const shifts = steady.numbers.parameters as ParameterShift[];
  deepEqual(shifts.map((s) => [s.name, s.outside_previous_interval, s.significant]), [
    ["b0", false, false],
    ["b1", false, false],
  ]);
  const largest = shifts.reduce((m, s) => (Math.abs(s.z!) > Math.abs(m.z!) ? s : m));
  equal(steady.numbers.largest, largest.name);
  match(
    steady.sentence,
    new RegExp(
      `^f: b0 and b1 stayed within their previous 95% intervals \\(largest shift: ${largest.name}, [\\d.]+ standard errors of the difference\\)\\.$`,
    ),
  );
  deepEqual(codes(changes(b, b)), [], "the same fit says nothing");
});

Deno.test("fit history: the difference test of two estimates (exact case)", () => {
  // z = Δ/√(se₁² + se₂²) = 3/5 = 0.6 (3-4-5 triangle, exact arithmetic); two-sided p of the
  // standard normal at 0.6 is 0.548506 (normal table, Abramowitz & Stegun 26.2) and by Simpson.
  const c = compareParameter(
    { name: "b", estimate: 10, std_error: 3, ci: [4, 16], unit: "mm" },
    { name: "b", estimate: 13, std_error: 4, ci: [5, 21], unit: "mm" },
    0.95,
  );
  equal(c.z, 0.6);
  ok(Math.abs(c.p_value! - 0.548506) < 1e-6);
  ok(Math.abs(c.p_value! - twoSidedBySimpson(0.6)) < 1e-12);
  deepEqual([c.outside_previous_interval, c.significant, c.relative], [false, false, 0.3]);
});

/** A kept fit of one parameter `k` (hand-made, as an older or another run would keep it). */
function one(
  estimate: number,
  se: number | null,
  ci: unknown,
  extra: Record<string, unknown> = {},
) {
  return {
    method: "nonlinear",
    model: "y = exp(-k*t)",
    response: "y",
    n: 12,
    level: 0.95,
    sigma: 0.02,
    sigma_unit: "V",
    converged: true,
    parameters: [{ name: "k", estimate, std_error: se, ci, unit: "1/s" }],
    ...extra,
  };
}

Deno.test("fit history: outside the interval but not significant, and the reverse, in words", () => {
  // Outside [1.0, 2.0] at 2.1; z = 0.6/√(0.25² + 0.5²) = 1.073, p = 0.283 (erfc(z/√2), Python's
  // math.erfc): not significant.
  const out = changes(one(1.5, 0.25, [1.0, 2.0]), one(2.1, 0.5, [1.1, 3.1]), ctx("slow"));
  deepEqual(codes(out), ["parameter-moved"]);
  match(
    out[0].sentence,
    /^slow: k moved from .* 1\/s, outside its previous 95% interval, though not a significant change \(z = 1\.1, p = 0\.28\)\.$/,
  );
  // Inside a wide earlier interval, yet z = 0.6/√(0.1² + 0.1²) = 4.243, p = 2.21e-5 (as above).
  const sig = changes(one(1.5, 0.1, [0.5, 2.5]), one(2.1, 0.1, [1.9, 2.3]), ctx("slow"));
  deepEqual(codes(sig), ["parameter-moved"]);
  match(
    sig[0].sentence,
    /a significant change \(z = 4\.2, p = 2\.2e-5\), though inside its previous 95% interval\.$/,
  );
});

Deno.test("fit history: model, parameters, convergence and σ", async () => {
  const data = (await table(line(1, 20))).out;
  const a = await fit(data, "y = b0 + b1*x");
  const other = changes(a, await fit(data, "y = b0 + b1*x + b2*x^2"));
  deepEqual(codes(other), ["model-changed"]);
  equal(
    other[0].sentence,
    "f: the model is now y = b0 + b1*x + b2*x^2 (was y = b0 + b1*x); its estimates are not compared.",
  );
  // The same model text, but the table gained a column b1: b1 is no longer a parameter.
  const text = line(1, 20).split("\n").map((l, i) => `${l},${i === 0 ? "b1" : "2"}`).join("\n");
  const withColumn = (await table(text)).out;
  const col = changes(a, await fit(withColumn, "y = b0 + b1*x"));
  ok(codes(col).includes("parameters-changed"), codes(col).join());
  deepEqual(col.find((c) => c.code === "parameters-changed")!.numbers, {
    added: [],
    removed: ["b1"],
  });

  const lost = changes(
    one(1.5, 0.1, [1.3, 1.7]),
    one(1.5, 0.1, [1.3, 1.7], { converged: false }),
    ctx("slow", { added: 3, removed: 0, changed: 1 }),
  );
  deepEqual(codes(lost), ["convergence-lost"]);
  equal(lost[0].sentence, "slow: the fit no longer converged with 3 new rows, 1 row changed.");
  equal(lost[0].weight, "notable");
  const back = changes(one(1.5, 0.1, [1.3, 1.7], { converged: false }), one(1.5, 0.1, [1.3, 1.7]));
  deepEqual(codes(back), ["convergence-regained"]);

  const sigma = changes(one(1.5, 0.1, [1.3, 1.7]), one(1.5, 0.1, [1.3, 1.7], { sigma: 0.025 }));
  deepEqual(codes(sigma), ["sigma-changed"]);
  // (0.025 − 0.02)/0.02 = +25 % exactly: minor (notable beyond ±50 %).
  equal(sigma[0].sentence, "f: the residual standard error is 0.025 V (was 0.02, +25%).");
  equal(sigma[0].weight, "minor");
  equal(changes(one(1, 0.1, null), one(1, 0.1, null, { sigma: 0.04 }))[0].weight, "notable");
});

Deno.test("fit history: kept values of older versions, fields missing, never read as zero", () => {
  // An earlier interval with a missing limit is no interval: −1 is not "below 0".
  const c = changes(one(1.5, null, [null, 5]), one(-1, null, [-2, 0]));
  deepEqual(codes(c), ["parameter-not-judged"]);
  const s = c[0].numbers as unknown as ParameterShift;
  deepEqual([s.outside_previous_interval, s.z, s.p_value, s.significant], [null, null, null, null]);
  equal(c[0].weight, "minor");
  equal(
    c[0].sentence,
    "f: k moved from 1.5 to -1 [-2, 0] 1/s; without an earlier interval or both standard errors the move is not judged.",
  );
  // A standard error on one side only: no test, but the interval still judges.
  const oneSe = changes(one(1, 0.1, [0.8, 1.2]), one(1.1, null, null));
  deepEqual(codes(oneSe), ["parameters-steady"]);
  equal(oneSe[0].sentence, "f: k stayed within its previous 95% interval.");
  // No standard errors, but intervals: judged by the interval alone.
  const byCi = changes(one(1, null, [0.5, 1.5]), one(2, null, [1.5, 2.5]));
  deepEqual(codes(byCi), ["parameter-moved"]);
  match(byCi[0].sentence, /outside its previous 95% interval\.$/);
  // Whole fields missing one by one: no throw, the rest still compared.
  const now = one(2, 0.1, [1.8, 2.2], { n: 20, sigma: 0.03 });
  for (const field of Object.keys(now)) {
    const older: Record<string, unknown> = { ...one(1, 0.1, [0.8, 1.2]) };
    delete older[field];
    ok(Array.isArray(changes(older, now)), field);
    ok(Array.isArray(fitHistory.trend!(older as unknown as FitKept)), field);
  }
  const noN = { ...one(1, 0.1, [0.8, 1.2]) } as Record<string, unknown>;
  delete noN.n;
  ok(!codes(changes(noN, now)).includes("rows-used-changed"));
  const junk = [null, {}, { parameters: [null, 3, { name: "k" }] }, { parameters: "k" }];
  for (const j of junk) {
    deepEqual(changes(j, now), [], JSON.stringify(j));
    deepEqual(fitHistory.trend!(j as unknown as FitKept), []);
  }
  deepEqual(fitHistory.trend!(one(1, 0.1, [null, 2]) as unknown as FitKept), [
    { series: "k", unit: "1/s", value: 1, lower: null, upper: null, n: 12 },
  ]);
});

Deno.test("fit history: the fade example's later rows move root's a outside its interval", async () => {
  // examples/fade (invented data): batch7.csv, then the same with batch7-later.csv's rows appended.
  const first = await Deno.readTextFile(new URL("examples/fade/data/batch7.csv", REPO));
  const later = await Deno.readTextFile(new URL("examples/fade/data/batch7-later.csv", REPO));
  const options = {
    units: { cycle: "cycles", capacity: "mAh", temperature: "°C" },
    exclude: [{ rows: [41], why: "thermocouple came loose during cycle 205" }],
  };
  const t1 = await table(first, options);
  const t2 = await table(first.trimEnd() + "\n" + later.split("\n").slice(1).join("\n"), options);
  const rows = tableHistory.changes(t1.kept, t2.kept, ctx("cycles"));
  deepEqual(codes(rows), ["rows-added"]);
  equal(rows[0].sentence, "cycles: 40 rows added (rows 121–160).");
  const model = "capacity = q0 - a*sqrt(cycle)";
  const a1 = await fit(t1.out, model, "root"), a2 = await fit(t2.out, model, "root");
  const c = changes(a1, a2, ctx("root", rows[0].rows!));
  const a = moved(c).find((m) => m.name === "a")!;
  equal(a.outside_previous_interval, true);
  equal(a.significant, true);
  equal(a.unit, "mAh/cycles^0.5");
  const sentence = c.find((x) => x.numbers.name === "a")!.sentence;
  // plumb run of the example before the append: a = 9.882 [9.828, 9.936] mAh/cycles^0.5.
  match(
    sentence,
    /^root: a moved from 9\.882 \[9\.828, 9\.936\] to [\d.]+ \[[\d.]+, [\d.]+\] mAh\/cycles\^0\.5, outside its previous 95% interval \(z = [\d.]+, p = [\d.e-]+\)\.$/,
  );
  equal(
    c.find((x) => x.code === "rows-used-changed")!.sentence,
    "root: fitted to 159 rows (was 119) with 40 new rows.",
  );
  const trend = fitHistory.trend!(a2);
  deepEqual(trend.map((s) => [s.series, s.unit, s.n]), [["q0", "mAh", 159], [
    "a",
    "mAh/cycles^0.5",
    159,
  ]]);
  ok(trend.every((s) => s.lower! < s.value && s.value < s.upper!));
});
