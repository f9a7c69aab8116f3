/**
 * Reference suite for the `check` cell: every case in
 * `../shared/reference/checks/` that has `diagnostics` expected, plus the
 * lack-of-fit case, run through a real document (table + fit + check) with
 * `plumb run --json`. Values come from each case's `source` (statsmodels
 * 0.13.5 / scipy 1.10.1, or numpy 1.24.2 by the textbook formula), printed
 * beside every failure: 1e-8 relative (absolute near 0), Shapiro–Wilk 1e-4
 * (scipy 1.10 computes it in single precision, README).
 *
 * Anscombe's quartet (Anscombe 1973, The American Statistician 27:17–21),
 * read from the npm package vega-datasets (data/anscombe.json; its series I
 * has 4.81 where the paper prints 4.82): equal lines, different verdicts.
 *
 * @module
 */
import assert from "node:assert/strict";
import { readReferenceJson, REFERENCE_DIR, referenceTests, runDocument } from "./_reference.ts";

/** Ignored, and said once, without the reference data. */
const test = referenceTests("checks_check");

const CASES = new URL("checks/", REFERENCE_DIR);
const TOL = 1e-8;

interface Diag {
  vif: Record<string, number>;
  condition_number: number;
  hat_values: number[];
  studentized_residuals_internal: number[];
  studentized_residuals_external: number[];
  cooks_distance: number[];
  dffits: number[];
  press: number;
  loo_rmse: number;
  durbin_watson: number;
  breusch_pagan_koenker: {
    lm_statistic: number;
    lm_p_value: number;
    f_statistic: number;
    f_p_value: number;
    df: number;
  };
  breusch_pagan_original: { lm_statistic: number; lm_p_value: number; df: number };
  jarque_bera: { statistic: number; p_value: number; skewness: number; kurtosis: number };
  shapiro_wilk: { w: number; p_value: number };
  fitted: number[];
  residuals: number[];
}

interface Case {
  id: string;
  source: string;
  data: Record<string, number[]>;
  model: { type: string; response: string; predictors: string[]; diagnostics?: boolean };
  // deno-lint-ignore no-explicit-any
  expected: any;
}

async function allCases(): Promise<Case[]> {
  const out: Case[] = [];
  for await (const e of Deno.readDir(CASES)) {
    if (e.name.endsWith(".json")) out.push(await readReferenceJson<Case>(`checks/${e.name}`));
  }
  return out.sort((a, b) => a.id.localeCompare(b.id));
}

function csvOf(data: Record<string, number[]>): string {
  const names = Object.keys(data);
  const lines = [names.join(",")];
  for (let i = 0; i < data[names[0]].length; i++) {
    lines.push(names.map((k) => String(data[k][i])).join(","));
  }
  return lines.join("\n") + "\n";
}

function documentOf(response: string, predictors: string[], check = ""): string {
  const model = `${response} = b0 + ${predictors.map((p) => `b_${p}*${p}`).join(" + ")}`;
  return [
    "```table data\nfrom: data.csv\n```\n",
    "```fit line\non: data\nmodel: " + model + "\n```\n",
    "```check judge\nfit: line\n" + check + "```\n",
  ].join("\n");
}

function near(got: unknown, want: number, what: string, src: string, tol = TOL, scale = 0): void {
  assert.equal(typeof got, "number", `${what}: got ${got} (${src})`);
  const err = Math.abs((got as number) - want);
  assert.ok(
    err <= tol * Math.max(Math.abs(want), scale),
    `${what}: ${got} vs ${want}, error ${err} (${src})`,
  );
}

function nearAll(got: unknown[], want: number[], what: string, src: string, scale: number): void {
  assert.equal(got.length, want.length, `${what} length (${src})`);
  want.forEach((w, i) => near(got[i], w, `${what}[${i}]`, src, TOL, scale));
}

test("check cells reproduce the diagnostics of the reference cases", async () => {
  const cases = (await allCases()).filter((c) => c.expected?.diagnostics);
  assert.ok(cases.length >= 2, "the two multiple-regression cases at least");
  for (const c of cases) {
    const src = `${c.id}: ${c.source}`;
    const d: Diag = c.expected.diagnostics;
    const csv = { "data.csv": csvOf(c.data) };
    const run = await runDocument(documentOf(c.model.response, c.model.predictors), csv);
    assert.equal(run.exitCode, 0, `${src}: ${JSON.stringify(run.cells.map((x) => x.error))}`);
    const r = run.cells.find((x) => x.name === "judge")!.result;
    assert.equal(r.n, c.expected.n, src);
    nearAll(r.leverage, d.hat_values, "leverage", src, 1);
    nearAll(
      r.studentized_internal,
      d.studentized_residuals_internal,
      "studentized_internal",
      src,
      1,
    );
    nearAll(
      r.studentized_external,
      d.studentized_residuals_external,
      "studentized_external",
      src,
      1,
    );
    nearAll(
      r.cooks_distance,
      d.cooks_distance,
      "cooks_distance",
      src,
      Math.max(...d.cooks_distance),
    );
    nearAll(r.dffits, d.dffits, "dffits", src, 1);
    near(r.press, d.press, "press", src);
    near(r.loo_rmse, d.loo_rmse, "loo_rmse", src);
    for (const [k, v] of Object.entries(d.vif)) near(r.vif[`b_${k}`], v, `vif ${k}`, src);
    assert.ok(!("b0" in r.vif), `no VIF for the intercept (${src})`);
    near(r.condition_number, d.condition_number, "condition_number", src);
    near(r.durbin_watson, d.durbin_watson, "durbin_watson", src);
    const bk = d.breusch_pagan_koenker;
    assert.equal(r.breusch_pagan.variant, "koenker", src);
    assert.equal(r.breusch_pagan.df, bk.df, src);
    near(r.breusch_pagan.statistic, bk.lm_statistic, "breusch_pagan koenker", src);
    near(r.breusch_pagan.p_value, bk.lm_p_value, "breusch_pagan koenker p", src);
    near(r.breusch_pagan.f, bk.f_statistic, "breusch_pagan f", src);
    near(r.breusch_pagan.f_p_value, bk.f_p_value, "breusch_pagan f p", src);
    near(r.jarque_bera.statistic, d.jarque_bera.statistic, "jarque_bera", src);
    near(r.jarque_bera.p_value, d.jarque_bera.p_value, "jarque_bera p", src);
    near(r.jarque_bera.skewness, d.jarque_bera.skewness, "skewness", src, TOL, 1);
    near(r.jarque_bera.kurtosis, d.jarque_bera.kurtosis, "kurtosis", src);
    near(r.shapiro_wilk.w, d.shapiro_wilk.w, "shapiro_wilk w", src, 1e-4);
    near(r.shapiro_wilk.p_value, d.shapiro_wilk.p_value, "shapiro_wilk p", src, 1e-4);
    // The original (Breusch & Pagan 1979) form, from the same source.
    const orig = await runDocument(
      documentOf(c.model.response, c.model.predictors, "variance_test: original\n"),
      csv,
    );
    const ro = orig.cells.find((x) => x.name === "judge")!.result;
    assert.equal(ro.breusch_pagan.variant, "original", src);
    near(
      ro.breusch_pagan.statistic,
      d.breusch_pagan_original.lm_statistic,
      "breusch_pagan original",
      src,
    );
    near(
      ro.breusch_pagan.p_value,
      d.breusch_pagan_original.lm_p_value,
      "breusch_pagan original p",
      src,
    );
  }
});

test("check cell reproduces the lack-of-fit reference case", async () => {
  const c = await readReferenceJson<Case>("checks/lack_of_fit_dose_levels.json");
  const src = `${c.id}: ${c.source}`;
  const e = c.expected;
  const run = await runDocument(documentOf(c.model.response, c.model.predictors), {
    "data.csv": csvOf(c.data),
  });
  assert.equal(run.exitCode, 0, src);
  const l = run.cells.find((x) => x.name === "judge")!.result.lack_of_fit;
  near(l.ss_pure_error, e.ss_pure_error, "ss_pure_error", src);
  near(l.ss_lack_of_fit, e.ss_lack_of_fit, "ss_lack_of_fit", src);
  assert.equal(l.df1, e.df_lack_of_fit, src);
  assert.equal(l.df2, e.df_pure_error, src);
  near(l.f, e.f_statistic, "lack-of-fit F", src);
  near(l.p_value, e.p_value, "lack-of-fit p", src);
});

interface AnscombeRow {
  Series: string;
  X: number;
  Y: number;
}

async function anscombe(): Promise<Map<string, AnscombeRow[]>> {
  // vega-datasets 3.2.1 (npm), data/anscombe.json; its package exports only the build, so read the file.
  const url = new URL("../data/anscombe.json", import.meta.resolve("vega-datasets"));
  const rows: AnscombeRow[] = JSON.parse(await Deno.readTextFile(url));
  const out = new Map<string, AnscombeRow[]>();
  for (const r of rows) out.set(r.Series, [...(out.get(r.Series) ?? []), r]);
  return out;
}

Deno.test("check cell tells Anscombe's four equal lines apart", async () => {
  const series = await anscombe();
  assert.deepEqual([...series.keys()], ["I", "II", "III", "IV"]);
  // deno-lint-ignore no-explicit-any
  const got: Record<string, { fit: any; check: any }> = {};
  for (const [name, rows] of series) {
    const run = await runDocument(documentOf("Y", ["X"]), {
      "data.csv": "X,Y\n" + rows.map((r) => `${r.X},${r.Y}`).join("\n") + "\n",
    });
    assert.equal(run.exitCode, 0, `${name}: ${JSON.stringify(run.cells.map((x) => x.error))}`);
    got[name] = {
      fit: run.cells.find((x) => x.name === "line")!.result,
      check: run.cells.find((x) => x.name === "judge")!.result,
    };
  }
  for (const [name, { fit }] of Object.entries(got)) {
    // Anscombe (1973): slope 0.500 and intercept 3.00 for all four, to the paper's digits; R² ≈ 0.67
    // (the paper prints r = 0.82; 0.67 is its square, from memory to two digits).
    assert.equal(fit.parameters[1].estimate.toFixed(3), "0.500", `${name} slope`);
    assert.equal(fit.parameters[0].estimate.toFixed(2), "3.00", `${name} intercept`);
    assert.equal(fit.r2.toFixed(2), "0.67", `${name} R²`);
  }
  const codes = (s: string) => got[s].check.findings.map((f: { code: string }) => f.code);
  // I: a straight line with scatter; nothing alarming about the line. In this file's row
  // order (vega-datasets; not a sequence in time) neighbouring residuals alternate in sign:
  // d = 3.21 (Anscombe's data; the statistic is the reference check's definition), which the
  // exact law for this design puts at P(d ≥ 3.21) ≈ 0.012, so the alternation finding is
  // raised, and only it.
  assert.deepEqual(codes("I"), ["alternation"], JSON.stringify(got.I.check.findings));
  assert.equal(got.I.check.durbin_watson.toFixed(2), "3.21");
  // II: an exact parabola; the curvature is found.
  assert.ok(codes("II").includes("curvature"), JSON.stringify(got.II.check.findings));
  // III: a line with one point off it (x = 13, y = 12.74, source row 3).
  const out = got.III.check.findings.find((f: { code: string }) => f.code === "outlier");
  assert.ok(out, JSON.stringify(got.III.check.findings));
  assert.deepEqual(out.rows, [3]);
  // IV: every x is 8 except one row (x = 19, source row 8): that row has leverage 1.
  const one = got.IV.check.findings.find((f: { code: string }) =>
    f.code === "determined-by-one-row"
  );
  assert.ok(one, JSON.stringify(got.IV.check.findings));
  assert.deepEqual(one.rows, [8]);
  const iv = got.IV.check;
  assert.equal(iv.studentized_internal[7], null);
  assert.equal(iv.cooks_distance[7], null);
  assert.equal(iv.dffits[7], null);
  assert.equal(iv.press, null);
});
