/**
 * Reference cases for ordinary and weighted least squares from
 * `../shared/reference/checks/` (README there), run through a real document
 * with `plumb run --json` and compared to 1e-8 relative. Each case's values
 * come from its `source` field (statsmodels 0.13.5 / scipy 1.10.1), printed
 * beside every failure.
 *
 * Run: every case of type `ols` or `wls` whose expected value is not an
 * error. Each is fitted twice: with the default k = p + 1 and with
 * `count_variance: false` (k = p), to check both information-criteria
 * conventions the cases give.
 *
 * @module
 */
import assert from "node:assert/strict";
import { readReferenceJson, REFERENCE_DIR, referenceTests, runDocument } from "./_reference.ts";

/** Ignored, and said once, without the reference data. */
const test = referenceTests("checks_fit");

const CASES = new URL("checks/", REFERENCE_DIR);
const TOL = 1e-8;

interface Coefficient {
  estimate: number;
  std_error: number;
  t_value: number;
  p_value: number;
  ci95_lower: number;
  ci95_upper: number;
}

interface Criteria {
  k: number;
  aic: number;
  bic: number;
  aicc?: number;
}

interface Case {
  id: string;
  source: string;
  data: Record<string, number[]>;
  model: { type: string; response: string; predictors: string[]; weights?: string };
  expected: {
    result?: string;
    n: number;
    terms: string[];
    coefficients: Record<string, Coefficient>;
    r_squared: number;
    adj_r_squared: number;
    f_statistic: number;
    f_p_value: number;
    residual_std_error: number;
    rss?: number;
    tss?: number;
    ess?: number;
    weighted_rss?: number;
    weighted_tss?: number;
    log_likelihood: number;
    information_criteria: { k_coefficients: Criteria; k_coefficients_plus_variance: Criteria };
  };
}

/** The cases to run, read at test time (never copied into the repository). */
async function cases(): Promise<Case[]> {
  const out: Case[] = [];
  for await (const e of Deno.readDir(CASES)) {
    if (!e.name.endsWith(".json")) continue;
    const c = await readReferenceJson<Case>(`checks/${e.name}`);
    if ((c.model.type === "ols" || c.model.type === "wls") && c.expected.result !== "error") {
      out.push(c);
    }
  }
  return out.sort((a, b) => a.id.localeCompare(b.id));
}

/** `y = b0 + b_x1*x1 + …`: one parameter per term, the intercept first. */
function modelOf(c: Case): string {
  return `${c.model.response} = b0 + ${c.model.predictors.map((p) => `b_${p}*${p}`).join(" + ")}`;
}

function csvOf(data: Record<string, number[]>): string {
  const names = Object.keys(data);
  const m = data[names[0]].length;
  const lines = [names.join(",")];
  for (let i = 0; i < m; i++) lines.push(names.map((k) => String(data[k][i])).join(","));
  return lines.join("\n") + "\n";
}

function documentOf(c: Case): string {
  const weights = c.model.weights ? `weights: ${c.model.weights}\n` : "";
  const cell = (name: string, extra: string) =>
    "```fit " + name + "\non: data\nmodel: " + modelOf(c) + "\n" + weights + extra + "```\n";
  return [
    "---\nconfidence: 0.95\n---\n",
    "```table data\nfrom: data.csv\n```\n",
    cell("fit", ""),
    cell("coefficients_only", "count_variance: false\n"),
  ].join("\n");
}

/** Relative agreement to TOL (absolute TOL·scale for values near 0). */
function check(got: unknown, want: number, what: string, source: string, scale = 0) {
  assert.equal(typeof got, "number", `${what}: got ${got} (${source})`);
  const g = got as number;
  const err = Math.abs(g - want);
  assert.ok(
    err <= TOL * Math.max(Math.abs(want), scale),
    `${what}: ${g} vs ${want}, relative ${err / Math.abs(want)} (${source})`,
  );
}

test("fit cells reproduce the ols and wls reference cases to 1e-8", async () => {
  const all = await cases();
  assert.ok(all.length >= 2, "the sensor calibration and wls cases at least");
  for (const c of all) {
    const src = `${c.id}: ${c.source}`;
    const run = await runDocument(documentOf(c), { "data.csv": csvOf(c.data) });
    assert.equal(run.exitCode, 0, `${src}: ${JSON.stringify(run.cells.map((x) => x.error))}`);
    const r = run.cells.find((x) => x.name === "fit")!.result;
    const e = c.expected;
    assert.equal(r.n, e.n, src);
    assert.equal(r.weighted, c.model.type === "wls", src);
    e.terms.forEach((term, j) => {
      const want = e.coefficients[term], got = r.parameters[j];
      const scale = Math.abs(want.estimate) + want.std_error;
      check(got.estimate, want.estimate, `${term} estimate`, src, scale);
      check(got.std_error, want.std_error, `${term} std_error`, src);
      check(got.t, want.t_value, `${term} t`, src, 1);
      check(got.p_value, want.p_value, `${term} p_value`, src);
      check(got.ci[0], want.ci95_lower, `${term} ci lower`, src, scale);
      check(got.ci[1], want.ci95_upper, `${term} ci upper`, src, scale);
    });
    check(r.r2, e.r_squared, "r2", src);
    check(r.adj_r2, e.adj_r_squared, "adj_r2", src);
    check(r.f_statistic, e.f_statistic, "f_statistic", src);
    check(r.f_p_value, e.f_p_value, "f_p_value", src);
    check(r.sigma, e.residual_std_error, "sigma", src);
    check(r.rss, e.rss ?? e.weighted_rss!, "rss", src);
    if (e.tss !== undefined || e.weighted_tss !== undefined) {
      check(r.tss, e.tss ?? e.weighted_tss!, "tss", src);
    }
    if (e.ess !== undefined) check(r.ess, e.ess, "ess", src);
    check(r.log_likelihood, e.log_likelihood, "log_likelihood", src);
    const plus = e.information_criteria.k_coefficients_plus_variance;
    assert.equal(r.k, plus.k, src);
    check(r.aic, plus.aic, "aic (k = p + 1)", src);
    check(r.bic, plus.bic, "bic (k = p + 1)", src);
    check(r.aicc, plus.aicc!, "aicc (k = p + 1)", src);
    const only = run.cells.find((x) => x.name === "coefficients_only")!.result;
    const coef = e.information_criteria.k_coefficients;
    assert.equal(only.k, coef.k, src);
    check(only.aic, coef.aic, "aic (k = p)", src);
    check(only.bic, coef.bic, "bic (k = p)", src);
  }
});
