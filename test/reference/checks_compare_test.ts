/**
 * Reference cases for the `compare` cell from `../shared/reference/checks/`
 * (README there), run through a real document with `plumb run --json` and
 * compared to 1e-8 relative. Every value comes from the case's `source`
 * field (statsmodels 0.13.5 / scipy 1.10.1), printed beside each check.
 *
 * - `poly_degree_series_drying_curve`: degrees 1–4 of a raw-power
 *   polynomial; the F tests between consecutive degrees, Δ AIC / BIC / AICc
 *   from the best, Akaike weights (AIC and AICc) and the best degree.
 * - `log_vs_raw_deposit_growth`: a straight line for y and for log(y); the
 *   log model's log-likelihood on the original scale (log L − Σ ln y), its
 *   criteria from that value, and ΔAIC log − raw.
 *
 * @module
 */
import assert from "node:assert/strict";
import { readReferenceJson, referenceTests, runDocument, type RunJson } from "./_reference.ts";

/** Ignored, and said once, without the reference data. */
const test = referenceTests("checks_compare");

const TOL = 1e-8;

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

function csvOf(data: Record<string, number[]>): string {
  const names = Object.keys(data);
  const lines = [names.join(",")];
  for (let i = 0; i < data[names[0]].length; i++) {
    lines.push(names.map((k) => String(data[k][i])).join(","));
  }
  return lines.join("\n") + "\n";
}

function cell(kind: string, name: string, body: string): string {
  return "```" + `${kind} ${name}\n${body}` + "```\n";
}

function resultOf(run: RunJson & { exitCode: number }, name: string, src: string) {
  assert.equal(run.exitCode, 0, `${src}: ${JSON.stringify(run.cells.map((c) => c.error))}`);
  const c = run.cells.find((x) => x.name === name);
  assert.ok(c && c.error === null, `${src}: ${JSON.stringify(c?.error)}`);
  return c.result;
}

interface PolyCase {
  id: string;
  source: string;
  data: Record<string, number[]>;
  model: { response: string; predictor: string; degrees: number[] };
  expected: {
    fits: { degree: number; log_likelihood: number; rss: number }[];
    comparisons: {
      from_degree: number;
      to_degree: number;
      df_numerator: number;
      df_denominator: number;
      ss_extra: number;
      f_statistic: number;
      p_value: number;
    }[];
    selection: {
      delta_aic: number[];
      delta_bic: number[];
      delta_aicc: number[];
      akaike_weights: number[];
      akaike_weights_aicc: number[];
      best_degree_aic: number;
      best_degree_bic: number;
      best_degree_aicc: number;
    };
  };
}

test("compare reproduces poly_degree_series_drying_curve: F tests, Δ and Akaike weights to 1e-8", async () => {
  const c = await readReferenceJson<PolyCase>("checks/poly_degree_series_drying_curve.json");
  const src = `${c.id}: ${c.source}`;
  const { response, predictor, degrees } = c.model;
  const names = degrees.map((d) => `degree${d}`);
  const fits = degrees.map((d, i) =>
    cell("fit", names[i], `on: data\nmodel: ${response} = polynomial(${predictor}, ${d})\n`)
  );
  const compares = ["aic", "bic", "aicc"].map((by) =>
    cell("compare", `by_${by}`, `fits: [${names.join(", ")}]\nby: ${by}\n`)
  );
  const doc = [cell("table", "data", "from: data.csv\n"), ...fits, ...compares].join("\n");
  const run = await runDocument(doc, { "data.csv": csvOf(c.data) });
  const e = c.expected;

  const aic = resultOf(run, "by_aic", src);
  // Log-likelihoods and RSS as the fits give them (statsmodels' llf and ssr per degree).
  e.fits.forEach((f, i) => {
    check(
      aic.rows[i].log_likelihood_original_scale,
      f.log_likelihood,
      `degree ${f.degree} log L`,
      src,
    );
    check(aic.rows[i].rss, f.rss, `degree ${f.degree} rss`, src);
  });
  // Consecutive-degree F tests (statsmodels compare_f_test); our table has every nested pair.
  for (const cmp of e.comparisons) {
    const t = aic.nested_tests.find((x: { smaller: string; larger: string }) =>
      x.smaller === `degree${cmp.from_degree}` && x.larger === `degree${cmp.to_degree}`
    );
    const what = `F test degree ${cmp.from_degree} → ${cmp.to_degree}`;
    assert.ok(t, `${what} missing (${src})`);
    assert.equal(t.df1, cmp.df_numerator, `${what} df1 (${src})`);
    assert.equal(t.df2, cmp.df_denominator, `${what} df2 (${src})`);
    check(t.ss_extra, cmp.ss_extra, `${what} ss_extra`, src);
    check(t.f, cmp.f_statistic, `${what} F`, src);
    check(t.p_value, cmp.p_value, `${what} p`, src);
  }
  assert.equal(aic.nested_tests.length, 6, `every pair of degrees is nested (${src})`);

  // Selection: Δ from the best, Akaike weights exp(−Δ/2)/Σ, best degree per criterion.
  const sel = e.selection;
  const byCriterion = [
    ["aic", aic, sel.delta_aic, sel.akaike_weights, sel.best_degree_aic],
    ["bic", resultOf(run, "by_bic", src), sel.delta_bic, null, sel.best_degree_bic],
    [
      "aicc",
      resultOf(run, "by_aicc", src),
      sel.delta_aicc,
      sel.akaike_weights_aicc,
      sel.best_degree_aicc,
    ],
  ] as const;
  for (const [by, r, deltas, weights, best] of byCriterion) {
    deltas.forEach((d, i) => check(r.rows[i].delta, d, `Δ${by} degree ${degrees[i]}`, src, 1));
    weights?.forEach((w, i) =>
      check(r.rows[i].weight, w, `${by} weight degree ${degrees[i]}`, src)
    );
    assert.equal(r.preferred, `degree${best}`, `best by ${by} (${src})`);
  }
});

interface LogCase {
  id: string;
  source: string;
  data: Record<string, number[]>;
  model: { response: string; predictors: string[] };
  expected: {
    sum_log_y: number;
    raw_model: { log_likelihood: number; information_criteria: Record<string, Criteria> };
    log_model: {
      log_likelihood: number;
      log_likelihood_original_scale: number;
      information_criteria: Record<string, Criteria>;
    };
    delta_aic_log_minus_raw: number;
    preferred_by_aic: string;
  };
}

interface Criteria {
  k: number;
  aic: number;
  bic: number;
  aicc?: number;
}

test("compare reproduces log_vs_raw_deposit_growth: log L on the original scale and criteria to 1e-8", async () => {
  const c = await readReferenceJson<LogCase>("checks/log_vs_raw_deposit_growth.json");
  const src = `${c.id}: ${c.source}`;
  const y = c.model.response, x = c.model.predictors[0];
  const fit = (name: string, lhs: string, extra = "") =>
    cell("fit", name, `on: data\nmodel: ${lhs} = b0 + b1*${x}\n${extra}`);
  const doc = [
    cell("table", "data", "from: data.csv\n"),
    fit("raw", y),
    fit("log", `log(${y})`),
    fit("raw_p", y, "count_variance: false\n"),
    fit("log_p", `log(${y})`, "count_variance: false\n"),
    cell("compare", "shape", "fits: [raw, log]\nby: aic\n"),
    cell("compare", "shape_p", "fits: [raw_p, log_p]\nby: aic\n"),
  ].join("\n");
  const run = await runDocument(doc, { "data.csv": csvOf(c.data) });
  const e = c.expected;
  const plus = resultOf(run, "shape", src), only = resultOf(run, "shape_p", src);
  const [raw, log] = plus.rows;
  check(raw.log_likelihood_original_scale, e.raw_model.log_likelihood, "raw log L", src);
  check(log.log_likelihood, e.log_model.log_likelihood, "log model log L (log scale)", src);
  check(
    log.log_likelihood_original_scale,
    e.log_model.log_likelihood_original_scale,
    "log model log L on the original scale",
    src,
  );
  check(-log.log_jacobian, e.sum_log_y, "Σ ln y", src);
  // Criteria from the original-scale log L, under both k conventions of the case.
  const conventions = [
    ["k_coefficients_plus_variance", plus, ""],
    ["k_coefficients", only, "_p"],
  ] as const;
  for (const [key, r, suffix] of conventions) {
    const models = [["raw", e.raw_model], ["log", e.log_model]] as const;
    models.forEach(([name, m], i) => {
      const want = m.information_criteria[key], got = r.rows[i];
      assert.equal(got.k, want.k, `${name} k (${key}) (${src})`);
      check(got.aic, want.aic, `${name} aic (${key})`, src);
      check(got.bic, want.bic, `${name} bic (${key})`, src);
      if (want.aicc !== undefined) check(got.aicc, want.aicc, `${name} aicc (${key})`, src);
    });
    check(r.rows[1].aic - r.rows[0].aic, e.delta_aic_log_minus_raw, `ΔAIC log − raw (${key})`, src);
    assert.equal(r.preferred, e.preferred_by_aic + suffix, `preferred by AIC (${src})`);
  }
  check(raw.delta, -e.delta_aic_log_minus_raw, "Δ of the raw model", src);
});
