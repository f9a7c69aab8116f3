/**
 * The check of a fit computed in its database (in_engine.ts) against the
 * in-memory check of the same rows: an in-memory DuckDB through the test
 * double of cells/fit/_in_engine_testing.ts, the fit kind's own in-engine
 * route (a table kept in the engine), then the check kind on each fit.
 *
 * Source of every expected number: agreement with the in-memory check
 * (cells/check/diagnose.ts), itself held to its published sources in its own
 * tests: Breusch–Pagan (Breusch & Pagan 1979, Koenker 1981; kernel/stats
 * diagnostics_test.ts), Durbin–Watson (Durbin & Watson 1950, 1971;
 * durbin_watson_exact_test.ts), leverage, studentized residuals and Cook's
 * distance (Belsley, Kuh & Welsch 1980; Cook 1977; influence_test.ts), VIF
 * (Marquardt 1970; vif_test.ts), Jarque–Bera (Jarque & Bera 1987). The
 * tolerance is issue 18's: 1e-9 relative.
 *
 * @module
 */
import assert from "node:assert/strict";
import { seededRandom } from "../../kernel/random.ts";
import type { Table } from "../../kernel/contract/mod.ts";
import { DuckDbTestEngine, TEST_DB } from "../fit/_in_engine_testing.ts";
import { fitKind } from "../fit/mod.ts";
import type { Fit } from "../fit/fit.ts";
import { makeTable, parseContext, runContext } from "../fit/_fixtures_test.ts";
import { check } from "./_fixtures_test.ts";
import type { CheckResult } from "./result.ts";

const MODEL = "y = b0 + b1*x1 + b2*x2 + b3*x3 + b4*x4";

/**
 * Invented readings in sequence t: four predictors (x3 correlated with x1, x4 in the
 * thousands), noise from a t-like law (a normal over a root of a χ²) growing with x1, a drift
 * along t, and a few far rows so that every count has something to count.
 */
function readings(n: number, seed: number): Record<string, Float64Array> {
  const r = seededRandom(seed);
  const c = Object.fromEntries(
    ["t", "x1", "x2", "x3", "x4", "w", "y"].map((k) => [k, new Float64Array(n)]),
  );
  let drift = 0;
  for (let i = 0; i < n; i++) {
    c.t[i] = i + 1;
    c.x1[i] = 10 + 2 * r.normal();
    c.x2[i] = i % 500 === 7 ? 400 + 10 * r() : 100 * r();
    c.x3[i] = 0.8 * c.x1[i] + r.normal();
    c.x4[i] = 1000 * (1 + r());
    c.w[i] = 0.5 + r();
    const chi = (r.normal() ** 2 + r.normal() ** 2 + r.normal() ** 2 + r.normal() ** 2) / 4;
    drift = 0.7 * drift + r.normal();
    const far = i % 997 === 3 ? 12 : 0;
    c.y[i] = 3 + 1.5 * c.x1[i] - 0.02 * c.x2[i] + 0.75 * c.x3[i] - 2.5e-3 * c.x4[i] +
      Math.exp(0.3 * (c.x1[i] - 10)) * (r.normal() / Math.sqrt(chi) + drift) + far;
  }
  return c;
}

/** The in-memory fit of the rows (fitKind.run). */
function memoryFit(data: Record<string, Float64Array>, extra = {}): Fit {
  const spec = fitKind.parse(parseContext("model", { on: "data", model: MODEL, ...extra }));
  return fitKind.run(spec, runContext("model", "data", makeTable(data))) as Fit;
}

/** The fit kind's in-engine fit of the same rows, kept in `engine` (order_by t unless null). */
async function engineFit(
  engine: DuckDbTestEngine,
  data: Record<string, Float64Array>,
  order: string | null,
  extra = {},
): Promise<Fit> {
  const table: Table = {
    ...makeTable(data),
    database: {
      ref: TEST_DB,
      query: "SELECT * FROM readings",
      partitionBy: null,
      orderBy: order,
      fingerprint: "test",
      kept: true,
      rowsInEngine: data.t.length,
    },
  };
  const spec = fitKind.parse(parseContext("model", { on: "data", model: MODEL, ...extra }));
  const fit = await fitKind.run(spec, { ...runContext("model", "data", table), engine }) as Fit;
  assert.ok(
    fit.inEngine !== undefined && fit.keptIn !== undefined,
    "the fit was computed in the engine",
  );
  return fit;
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

function close(name: string, a: number | null | undefined, b: number | null | undefined): void {
  assert.ok(a != null && b != null, `${name}: ${a} vs ${b}`);
  assert.ok(rel(a, b) < 1e-9, `${name}: ${a} vs ${b} (relative ${rel(a, b)})`);
}

/** Every number the in-engine check judges from sums against the in-memory check's. */
function assertSameJudgement(e: CheckResult, m: CheckResult, ordered: boolean): void {
  const x = e.in_engine!;
  assert.ok(x !== undefined && m.in_engine === undefined);
  // Constant variance.
  close("Breusch–Pagan", e.breusch_pagan?.statistic, m.breusch_pagan?.statistic);
  close("Breusch–Pagan p", e.breusch_pagan?.p_value, m.breusch_pagan?.p_value);
  close("Breusch–Pagan F", e.breusch_pagan?.f, m.breusch_pagan?.f);
  assert.equal(e.breusch_pagan?.variant, m.breusch_pagan?.variant);
  // Independence: d, and its null law's moments and p-values (beta law on both sides: n − p
  // is past the exact law's 2,000 df, DURBIN_WATSON_EXACT_DF).
  if (ordered) {
    close("Durbin–Watson", e.durbin_watson, m.durbin_watson);
    const a = e.durbin_watson_test!, b = m.durbin_watson_test!;
    assert.equal(b.distribution, "beta");
    close("DW expected", a.expected, b.expected);
    close("DW variance", a.variance, b.variance);
    close("DW p", a.p_value, b.p_value);
    close("DW p negative", a.p_value_negative, b.p_value_negative);
  } else {
    assert.equal(e.durbin_watson, null);
    assert.equal(e.durbin_watson_test, null);
    assert.ok(x.not_judged.some((s) => /not computed: needs an order column/.test(s)));
  }
  // Leverage: the largest and the counts over 2p/n and 3p/n.
  const h = m.leverage, n = h.length, p = m.p;
  close("leverage max", x.leverage.max, Math.max(...h));
  assert.equal(x.leverage.over_2p, h.filter((v) => v > 2 * p / n).length);
  assert.equal(x.leverage.over_3p, h.filter((v) => v > 3 * p / n).length);
  // Outliers and influence.
  const t = m.studentized_external.map((v) => Math.abs(v ?? NaN));
  close("max |t|", x.influence.max_abs_studentized, Math.max(...t));
  assert.equal(x.influence.studentized_over_3, t.filter((v) => v > 3).length);
  const cook = m.cooks_distance.map((v) => v ?? NaN);
  close("max Cook's D", x.influence.max_cooks_distance, Math.max(...cook));
  assert.equal(x.influence.cooks_over_cut, cook.filter((v) => v > x.influence.cooks_cut).length);
  close("PRESS", e.press, m.press);
  close("leave-one-out RMSE", e.loo_rmse, m.loo_rmse);
  // Collinearity.
  assert.deepEqual(Object.keys(e.vif), Object.keys(m.vif));
  for (const k of Object.keys(m.vif)) close(`VIF ${k}`, e.vif[k], m.vif[k]);
  assert.equal(e.vif_form, m.vif_form);
  close("condition number", e.condition_number, m.condition_number);
  // Normality from the moments (Jarque–Bera; the in-memory check gives it beside Shapiro–Wilk).
  close("Jarque–Bera", e.jarque_bera?.statistic, m.jarque_bera?.statistic);
  close("Jarque–Bera p", e.jarque_bera?.p_value, m.jarque_bera?.p_value);
  close("skewness", e.jarque_bera?.skewness, m.jarque_bera?.skewness);
  close("kurtosis", e.jarque_bera?.kurtosis, m.jarque_bera?.kurtosis);
  // The per-row fields are empty; the findings about rows count them.
  assert.equal(e.residuals.length, 0);
  assert.equal(e.leverage.length, 0);
}

Deno.test("check of an in-engine fit equals the in-memory check of the same 12,000 rows to 1e-9", async () => {
  const data = readings(12_000, 3);
  const engine = await DuckDbTestEngine.open();
  try {
    await engine.load("readings", data);
    const mem = memoryFit(data);
    for (const order of ["t", null]) {
      const fit = await engineFit(engine, data, order);
      for (const variance_test of ["koenker", "original"]) {
        const e = check(fit, { variance_test }), m = check(mem, { variance_test });
        assertSameJudgement(e, m, order !== null);
      }
      const e = check(fit);
      const codes = e.findings.map((f) => f.code);
      // The far rows make outliers, the wide x2 rows leverage, x1 the variance, the drift
      // correlation (when ordered), the t-like noise non-normality: said in plain words.
      for (const c of ["outlier", "high-leverage", "non-constant-variance", "non-normal"]) {
        assert.ok(codes.includes(c as never), `${c} in ${codes}`);
      }
      assert.equal(codes.includes("autocorrelation"), order !== null);
      const outlier = e.findings.find((f) => f.code === "outlier")!;
      assert.match(outlier.message, /^\d+ rows have externally studentized residuals beyond ±3/);
      assert.match(outlier.message, /counted, not named\.$/);
      assert.deepEqual(outlier.rows, []);
      if (order !== null) {
        assert.match(
          e.findings.find((f) => f.code === "autocorrelation")!.message,
          /in the order of "t"/,
        );
      }
      assert.match(e.in_engine!.note, /^The 12,000 rows stay in DuckDB, so no panel of rows/);
    }
  } finally {
    engine.close();
  }
});

Deno.test("check of a weighted in-engine fit equals the in-memory check to 1e-9", async () => {
  const data = readings(6_000, 5);
  const engine = await DuckDbTestEngine.open();
  try {
    await engine.load("readings", data);
    const e = check(await engineFit(engine, data, "t", { weights: "w" }));
    assertSameJudgement(e, check(memoryFit(data, { weights: "w" })), true);
  } finally {
    engine.close();
  }
});

Deno.test("check of in-engine fits without an intercept and with a part free of parameters equals the in-memory check to 1e-9", async () => {
  const data = readings(4_000, 7);
  const engine = await DuckDbTestEngine.open();
  try {
    await engine.load("readings", data);
    for (const model of ["y = b1*x1 + b2*x3 + b3*x4", "y = 2*x1 + a + b*x2 + c*log(x4)"]) {
      const e = check(await engineFit(engine, data, "t", { model }));
      assertSameJudgement(e, check(memoryFit(data, { model })), true);
      assert.equal(e.vif_form, model.includes(" a ") ? "centred" : "uncentred");
    }
  } finally {
    engine.close();
  }
});

Deno.test("check of an in-engine fit refuses robust: at its option, in a sentence", async () => {
  const data = readings(500, 9);
  const engine = await DuckDbTestEngine.open();
  try {
    await engine.load("readings", data);
    const fit = await engineFit(engine, data, null);
    assert.throws(() => check(fit, { robust: "hc3" }), {
      name: "CellError",
      message:
        'Cannot give robust: hc3 for "model": it was fitted in the database, and its rows stay there; heteroscedasticity-consistent covariances are not computed there yet: remove robust, or give the table keep_rows: memory',
    });
  } finally {
    engine.close();
  }
});
