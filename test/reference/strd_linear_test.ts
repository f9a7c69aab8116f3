/**
 * NIST StRD linear least squares (https://www.itl.nist.gov/div898/strd/):
 * all 11 sets through one real analysis document and `plumb run --json`.
 * Every certified estimate, standard deviation, residual standard deviation
 * and R² must agree in at least 12 significant digits (LRE as NIST defines
 * it; for a certified zero, absolute error below 1e−12). NoInt1 and NoInt2
 * certify the uncentred R² (manifest notes), which is what a fit without an
 * intercept reports.
 *
 * Each set's data lines are written to a CSV with the numeric strings copied
 * exactly as printed, so the table sees the data as printed.
 *
 * @module
 */
import assert from "node:assert/strict";
import { fitKind } from "../../cells/fit/mod.ts";
import type { Fit } from "../../cells/fit/mod.ts";
import { tableKind } from "../../cells/table/mod.ts";
import { DEFAULT_SETTINGS } from "../../kernel/document/mod.ts";
import type { RunContext } from "../../kernel/contract/mod.ts";
import {
  dec,
  div,
  inverse,
  mul,
  type Q,
  q,
  sub,
  sum,
  times,
  val,
} from "../../cells/fit/_rational_test.ts";
import {
  lre,
  readReferenceJson,
  readReferenceText,
  referenceTests,
  runDocument,
  strdCsv as csvOf,
} from "./_reference.ts";

/** Ignored, and said once, without the reference data. */
const test = referenceTests("strd_linear");

interface ManifestSet {
  name: string;
  kind: string;
  file: string;
  n_parameters: number;
  data: { first_line: number; columns: string[]; n_rows: number };
  parameters: { name: string; estimate: number; std_dev: number }[];
  residual_std_dev: number;
  r_squared: number;
}

const BAR = 12;

/** Model text for a set: polynomials in x by `polynomial`, Longley by `linear`, NoInt by hand. */
function modelOf(set: ManifestSet): string {
  const p = set.n_parameters;
  if (set.name === "NoInt1" || set.name === "NoInt2") return "y = B1*x";
  if (set.name === "Longley") return "y = linear(x1, x2, x3, x4, x5, x6)";
  if (p === 2) return "y = B0 + B1*x";
  return `y = polynomial(x, ${p - 1})`;
}

test("NIST StRD linear sets: every certified value to 12 digits through plumb run", async () => {
  const manifest = await readReferenceJson<{ sets: ManifestSet[] }>("strd/manifest.json");
  const sets = manifest.sets.filter((s) => s.kind === "linear");
  assert.equal(sets.length, 11);
  const files: Record<string, string> = {};
  const cells: string[] = ["# NIST StRD linear sets", ""];
  for (const set of sets) {
    const id = set.name.toLowerCase();
    files[`${id}.csv`] = csvOf(set, await readReferenceText(`strd/${set.file}`));
    cells.push("```table " + `${id}-data`, `from: ${id}.csv`, "```", "");
    cells.push("```fit " + id, `on: ${id}-data`, `model: ${modelOf(set)}`, "```", "");
  }
  const run = await runDocument(cells.join("\n"), files);
  const rows: { set: string; estimate: number; std_dev: number; sigma: number; r2: number }[] = [];
  const failures: string[] = [];
  for (const set of sets) {
    const cell = run.cells.find((c) => c.name === set.name.toLowerCase());
    assert.ok(cell, `${set.name}: fit cell missing`);
    assert.equal(cell.state, "current", `${set.name}: ${cell.error?.message}`);
    const r = cell.result;
    // Certified values: NIST StRD, set set.name (manifest.json, from the .dat file).
    let est = 15, sd = 15;
    set.parameters.forEach((c, j) => {
      const got = r.parameters[j];
      est = Math.min(est, lre(got.estimate, c.estimate));
      sd = Math.min(sd, lre(got.std_error ?? NaN, c.std_dev));
    });
    const sigma = lre(r.sigma, set.residual_std_dev);
    const r2 = lre(r.r2, set.r_squared);
    rows.push({ set: set.name, estimate: est, std_dev: sd, sigma, r2 });
    const worst = Math.min(est, sd, sigma, r2);
    if (!(worst >= BAR)) failures.push(`${set.name} (worst LRE ${worst.toFixed(1)})`);
  }
  console.log("NIST StRD linear, worst LRE per set (cap 15):");
  console.table(rows.map((x) => ({
    set: x.set,
    estimate: x.estimate.toFixed(1),
    std_dev: x.std_dev.toFixed(1),
    sigma: x.sigma.toFixed(1),
    r2: x.r2.toFixed(1),
  })));
  assert.deepEqual(failures, [], `below ${BAR} digits: ${failures.join(", ")}`);
});

// ---------------------------------------------------------------------------------------------
// Derived quantities (issue 10, item 1): leverage and the mean response's standard error against
// exact rational arithmetic on the data as printed, through check and predict cells.

/** One set's data as printed: the response and predictor strings of each row. */
function printedRows(set: ManifestSet, text: string): string[][] {
  return csvOf(set, text).trimEnd().split("\n").slice(1).map((l) => l.split(","));
}

/** The design row of a set's model, exactly, from a row's predictor fractions. */
function designRow(set: ManifestSet, x: Q[]): Q[] {
  if (set.name === "NoInt1" || set.name === "NoInt2") return [x[0]];
  if (set.name === "Longley") return [q(1n), ...x];
  return Array.from({ length: set.n_parameters }, (_, k) => {
    let v = q(1n);
    for (let j = 0; j < k; j++) v = mul(v, x[0]);
    return v;
  });
}

/**
 * The exact least-squares fit of a set (normal equations in BigInt fractions): its leverages and
 * s²·gᵀ(XᵀX)⁻¹g at given predictor rows, each rounded once.
 */
function exactSet(set: ManifestSet, rows: string[][]) {
  const X = rows.map((r) => designRow(set, r.slice(1).map(dec)));
  const y = rows.map((r) => dec(r[0]));
  const p = X[0].length;
  const xtx = Array.from(
    { length: p },
    (_, a) => Array.from({ length: p }, (_, b) => sum(X.map((r) => mul(r[a], r[b])))),
  );
  const inv = inverse(xtx);
  const beta = times(
    inv,
    Array.from({ length: p }, (_, a) => sum(X.map((r, i) => mul(r[a], y[i])))),
  );
  const rss = sum(X.map((r, i) => {
    const e = sub(y[i], sum(r.map((v, k) => mul(v, beta[k]))));
    return mul(e, e);
  }));
  const s2 = div(rss, q(BigInt(rows.length - p)));
  // gᵀ(XᵀX)⁻¹g without reducing to lowest terms on the way (val needs no reduction): 82 rows of
  // Filip's 11×11 forms in seconds rather than minutes.
  const form = (g: Q[]) => {
    let acc: Q = [0n, 1n];
    g.forEach((v, a) => g.forEach((w, b) => (acc = addRaw(acc, mulRaw(mulRaw(v, inv[a][b]), w)))));
    return acc;
  };
  return {
    leverage: X.map((r) => val(form(r))),
    seFit: (x: string[]) => Math.sqrt(val(mul(s2, form(designRow(set, x.map(dec)))))),
    exactFit: rss[0] === 0n,
  };
}

/** a + b and a·b as fractions, not reduced (exact; the denominators stay positive). */
const addRaw = (a: Q, b: Q): Q => [a[0] * b[1] + b[0] * a[1], a[1] * b[1]];
const mulRaw = (a: Q, b: Q): Q => [a[0] * b[0], a[1] * b[1]];

test("NIST StRD linear sets: leverage and se_fit to 12 digits against exact rational arithmetic", async () => {
  const manifest = await readReferenceJson<{ sets: ManifestSet[] }>("strd/manifest.json");
  const sets = manifest.sets.filter((s) => s.kind === "linear");
  const files: Record<string, string> = {};
  const cells: string[] = ["# NIST StRD linear sets: leverage and se_fit", ""];
  const points: Record<string, string[][]> = {};
  const exact: Record<string, ReturnType<typeof exactSet>> = {};
  for (const set of sets) {
    const id = set.name.toLowerCase(), text = await readReferenceText(`strd/${set.file}`);
    const rows = printedRows(set, text);
    // Points: the first and last rows' predictors (for one predictor also 10% beyond the last)
    points[id] = [rows[0].slice(1), rows[rows.length - 1].slice(1)];
    if (rows[0].length === 2) points[id].push([String(1.1 * Number(rows[rows.length - 1][1]))]);
    exact[id] = exactSet(set, rows);
    const names = set.data.columns.slice(1);
    const at = names.map((c, j) => `${c}: [${points[id].map((pt) => pt[j]).join(", ")}]`);
    files[`${id}.csv`] = csvOf(set, text);
    cells.push("```table " + `${id}-data`, `from: ${id}.csv`, "```", "");
    cells.push("```fit " + id, `on: ${id}-data`, `model: ${modelOf(set)}`, "```", "");
    cells.push("```check " + `${id}-check`, `fit: ${id}`, "```", "");
    cells.push("```predict " + `${id}-at`, `fit: ${id}`, `at: { ${at.join(", ")} }`, "```", "");
  }
  const run = await runDocument(cells.join("\n"), files);
  const failures: string[] = [];
  const table: { set: string; leverage: string; se_fit: string }[] = [];
  for (const set of sets) {
    const id = set.name.toLowerCase(), e = exact[id];
    const check = run.cells.find((c) => c.name === `${id}-check`)!;
    const pred = run.cells.find((c) => c.name === `${id}-at`)!;
    assert.equal(check.state, "current", `${set.name} check: ${check.error?.message}`);
    assert.equal(pred.state, "current", `${set.name} predict: ${pred.error?.message}`);
    // Source: exact rational arithmetic on the data as printed (exactSet above).
    const lev = Math.min(...e.leverage.map((h, i) => lre(check.result.leverage[i], h)));
    const se = e.exactFit
      ? 15 // RSS = 0 (Wampler1): se_fit is 0 up to the residuals' 1e−30; checked below
      : Math.min(...points[id].map((pt, i) => lre(pred.result.at[i].se_fit, e.seFit(pt))));
    if (e.exactFit) {
      pred.result.at.forEach((p: { se_fit: number; estimate: number }) =>
        assert.ok(
          Math.abs(p.se_fit) <= 1e-12 * Math.abs(p.estimate),
          `${set.name}: se_fit ${p.se_fit}`,
        )
      );
    }
    table.push({ set: set.name, leverage: lev.toFixed(1), se_fit: se.toFixed(1) });
    if (!(Math.min(lev, se) >= BAR)) {
      failures.push(`${set.name} (leverage ${lev.toFixed(1)}, se_fit ${se.toFixed(1)})`);
    }
  }
  console.log(
    "NIST StRD linear, worst LRE of leverage and se_fit against exact arithmetic (cap 15):",
  );
  console.table(table);
  assert.deepEqual(failures, [], `below ${BAR} digits: ${failures.join(", ")}`);
});

// ---------------------------------------------------------------------------------------------
// Certified at every scale (issue 10, item 2): a set replicated k times keeps its certified
// estimates (its normal equations are multiplied by k). Fitted in process through the table and
// fit kinds, on whichever path the fit takes at that size.

test("NIST StRD Filip, Wampler4, Longley replicated to 20,000 and Filip to 200,000 rows keep 12 digits", async () => {
  const manifest = await readReferenceJson<{ sets: ManifestSet[] }>("strd/manifest.json");
  const cases: [string, number][] = [["Filip", 20_000], ["Wampler4", 20_000], ["Longley", 20_000], [
    "Filip",
    200_000,
  ]];
  const failures: string[] = [];
  for (const [name, rows] of cases) {
    const set = manifest.sets.find((s) => s.name === name)!;
    const [head, ...lines] = csvOf(set, await readReferenceText(`strd/${set.file}`)).trimEnd()
      .split("\n");
    const k = Math.round(rows / lines.length);
    const csv = [head, ...Array.from({ length: k }, () => lines).flat()].join("\n") + "\n";
    const fit = fitInProcess(csv, modelOf(set));
    // Certified values: NIST StRD (manifest.json); replication leaves the estimates unchanged.
    const worst = Math.min(...set.parameters.map((c, j) => lre(fit.estimates[j], c.estimate)));
    console.log(`${name} × ${k} (${k * lines.length} rows): worst LRE ${worst.toFixed(1)}`);
    if (!(worst >= BAR)) failures.push(`${name} × ${k}: ${worst.toFixed(1)}`);
  }
  assert.deepEqual(failures, [], `below ${BAR} digits: ${failures.join(", ")}`);
});

/** A table from CSV text and a fit of `model` on it, through the kinds' own parse and run. */
function fitInProcess(csv: string, model: string): Fit {
  const settings = { ...DEFAULT_SETTINGS, title: "strd", maxFileBytes: 1 << 30, extra: {} };
  const ctx = (name: string, options: Record<string, unknown>) => ({
    name,
    kind: "",
    options,
    body: "",
    settings,
    warn: () => {},
  });
  const run = (name: string, inputs: Record<string, unknown>) => ({
    name,
    settings,
    inputs: inputs as RunContext["inputs"],
    files: { "data.csv": { path: "data.csv", bytes: new TextEncoder().encode(csv), sha256: "" } },
    warn: () => {},
    progress: () => {},
  });
  const table = tableKind.run(tableKind.parse(ctx("data", { from: "data.csv" })), run("data", {}));
  const spec = fitKind.parse(ctx("fit", { on: "data", model }));
  return fitKind.run(spec, run("fit", { data: table })) as Fit;
}
