/**
 * The in-engine linear fit (cells/fit/_in_engine.ts) against an in-memory
 * DuckDB (the test double of `_in_engine_testing.ts`), compared with the
 * project's own in-memory fit and check of the same rows, and with NIST's
 * certified values.
 *
 * @module
 */
import assert from "node:assert/strict";
import { parseColumnExpression, parseModel } from "../../kernel/expr/mod.ts";
import { seededRandom } from "../../kernel/random.ts";
import { digits, loadStrd } from "../../kernel/linalg/_strd.ts";
import { fitInEngine, type InEngineFit, type InEngineRequest, KAPPA_LIMIT } from "./_in_engine.ts";
import { DuckDbTestEngine, PgTestEngine, TEST_DB } from "./_in_engine_testing.ts";
import { postgresInstalled } from "../../test/engine/_cluster.ts";
import { startShardedEngine } from "../../test/engine/_shards.ts";
import { readingsInMemory } from "../../test/engine/_readings.ts";
import { fitKind } from "./mod.ts";
import { makeTable, parseContext, runContext } from "./_fixtures_test.ts";
import type { Fit } from "./fit.ts";
import { checkKind } from "../check/mod.ts";
import type { CheckResult } from "../check/result.ts";

const NAMES = ["t", "x1", "x2", "x3", "x4", "x5", "w", "part", "y"] as const;
type Columns = Record<(typeof NAMES)[number], Float64Array>;

/**
 * Invented readings: five predictors (two of them correlated, one in the thousands), a
 * weight, a partition label and a response with unit normal noise; every 97th x2 missing.
 */
function invented(n: number, seed: number): Columns {
  const r = seededRandom(seed);
  const c = Object.fromEntries(NAMES.map((k) => [k, new Float64Array(n)])) as Columns;
  for (let i = 0; i < n; i++) {
    c.t[i] = i + 1;
    c.x1[i] = 10 + 2 * r.normal();
    c.x2[i] = i % 97 === 5 ? NaN : 100 * r();
    c.x3[i] = 0.3 * c.x1[i] + r.normal();
    c.x4[i] = -5 + 0.5 * r.normal();
    c.x5[i] = 1000 * (1 + r());
    c.w[i] = 0.5 + r();
    c.part[i] = i % 3;
    const x2 = Number.isNaN(c.x2[i]) ? 0 : c.x2[i];
    c.y[i] = 3 + 1.5 * c.x1[i] - 2 * x2 + 0.75 * c.x3[i] + 4 * c.x4[i] - 2.5e-3 * c.x5[i] +
      (1 + 0.02 * c.x1[i]) * r.normal();
  }
  return c;
}

const LINEAR = "y = linear(x1, x2, x3, x4, x5)";

/** The in-engine fit of `text` over table `name`, failing the test when there is none. */
async function engineFit(
  engine: DuckDbTestEngine,
  text: string,
  columns: readonly string[],
  extra: Partial<InEngineRequest> = {},
  table = "readings",
): Promise<InEngineFit & { warnings: string[] }> {
  const warnings: string[] = [];
  const got = await fitInEngine(
    {
      name: "line",
      model: parseModel(text, [...columns]),
      query: `SELECT * FROM ${table}`,
      columns: new Map(columns.map((c) => [c, "number" as const])),
      confidence: 0.95,
      countVariance: true,
      warn: (m) => warnings.push(m),
      ...extra,
    },
    engine,
    TEST_DB,
  );
  if (!got.ok) throw new Error(`${got.cannot}: ${got.why}`);
  return { ...got.fit, warnings };
}

/** The project's in-memory fit (fitKind.run: Householder QR, refined) of the same rows. */
function memoryFit(data: Record<string, Float64Array>, text: string, extra = {}): Fit {
  const spec = fitKind.parse(parseContext("line", { on: "data", model: text, ...extra }));
  return fitKind.run(spec, runContext("line", "data", makeTable(data))) as Fit;
}

/** The in-memory check of a fit (Durbin–Watson, Breusch–Pagan, leverage). */
function memoryCheck(fit: Fit): CheckResult {
  const ctx = {
    name: "judge",
    kind: "check",
    body: "",
    warn() {},
    options: { fit: "line" },
    settings: runContext("x", "x", makeTable({ a: [1] })).settings,
  };
  const spec = checkKind.parse(ctx);
  const run = runContext("judge", "line", makeTable({ a: [1] }));
  const out = checkKind.run(spec, { ...run, inputs: { line: fit } });
  return checkKind.summary(out as never, spec) as CheckResult;
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

/** Every coefficient, standard error, RSS, σ, R², adj. R², log L, AIC, AICc and BIC within `tol`. */
function assertSameFit(e: InEngineFit, m: Fit, tol: number): void {
  const s = e.statistics, t = m.statistics;
  assert.deepEqual(e.parameters, m.parameters);
  assert.equal(s.n, t.n);
  e.estimates.forEach((v, j) => {
    assert.ok(rel(v, m.estimates[j]) < tol, `${e.parameters[j]}: ${v} vs ${m.estimates[j]}`);
    const se = s.stdErrors[j]!, me = t.stdErrors[j]!;
    assert.ok(rel(se, me) < tol, `se ${e.parameters[j]}: ${se} vs ${me}`);
  });
  const pairs: [string, number | null, number | null][] = [
    ["rss", s.rss, t.rss],
    ["sigma", s.sigma, t.sigma],
    ["r2", s.r2, t.r2],
    ["adjR2", s.adjR2, t.adjR2],
    ["logL", s.logLikelihood, t.logLikelihood],
    ["aic", s.aic, t.aic],
    ["aicc", s.aicc, t.aicc],
    ["bic", s.bic, t.bic],
  ];
  for (const [name, a, b] of pairs) {
    assert.ok(a !== null && b !== null && rel(a, b) < tol, `${name}: ${a} vs ${b}`);
  }
}

Deno.test("fitInEngine() equals the in-memory fit of 20,000 rows to 1e-9 (5 predictors, sums)", async () => {
  const data = invented(20_000, 7);
  const engine = await DuckDbTestEngine.open();
  try {
    await engine.load("readings", data);
    const e = await engineFit(engine, LINEAR, NAMES);
    const m = memoryFit(data, LINEAR);
    // The same estimator computed by Householder QR in memory: agreement to 1e-9 is the
    // issue's criterion (issue 18, "Done when").
    assertSameFit(e, m, 1e-9);
    assert.equal(e.route, "sums");
    assert.ok(e.kappa < KAPPA_LIMIT, String(e.kappa));
    assert.equal(e.rowsLeftOut.missing, m.rowsMissing?.length);
    assert.equal(e.rowsRead, 20_000);
    assert.deepEqual(e.warnings, ['207 rows of the query left out for missing values in "x2"']);
    // Σhᵢ = trace of the hat matrix = p (exact arithmetic); Σeᵢ = 0 with an intercept.
    assert.ok(Math.abs(e.leverage.sum - 6) < 1e-9, String(e.leverage.sum));
    assert.ok(Math.abs(e.sumResiduals) < 1e-9 * Math.sqrt(e.n) * e.statistics.sigma!);
    assert.equal(e.computed.sums, "engine");
    assert.equal(e.computed.rss, "engine");
    assert.equal(e.computed.solve, "plumb");
    assert.equal(e.computed.durbin_watson, "not computed");
    assert.deepEqual(e.passes.map((p) => p.name.slice(0, 6)), [
      "pass 1",
      "pass 2",
      "pass 3",
      "pass 5",
    ]);
  } finally {
    engine.close();
  }
});

Deno.test("fitInEngine() with weights, and grouped by a partition column, equals the in-memory fit", async () => {
  const data = invented(20_000, 11);
  const engine = await DuckDbTestEngine.open();
  try {
    await engine.load("readings", data);
    const weights = { expr: parseColumnExpression("w", [...NAMES]), text: "w" };
    const e = await engineFit(engine, LINEAR, NAMES, { weights });
    // The same weighted estimator by QR in memory (issue 18's 1e-9).
    assertSameFit(e, memoryFit(data, LINEAR, { weights: "w" }), 1e-9);
    const grouped = await engineFit(engine, LINEAR, NAMES, { partitionBy: "part" });
    assertSameFit(grouped, memoryFit(data, LINEAR), 1e-9);
    assert.ok(grouped.passes.every((p) => p.sql.includes("GROUP BY plumb_part")));
  } finally {
    engine.close();
  }
});

Deno.test("fitInEngine() fits a model with a part free of parameters, and one without intercept", async () => {
  const data = invented(5_000, 3);
  const engine = await DuckDbTestEngine.open();
  try {
    await engine.load("readings", data);
    for (const text of ["y = 2*x1 + a + b*x2 + c*log(x5)", "y = b1*x1 + b2*x4"]) {
      const e = await engineFit(engine, text, NAMES);
      // The same estimator by QR in memory; an offset changes TSS (of y, not y − offset).
      assertSameFit(e, memoryFit(data, text), 1e-9);
    }
    const noInt = await engineFit(engine, "y = b1*x1 + b2*x4", NAMES);
    assert.equal(noInt.hasIntercept, false);
    assert.equal(noInt.statistics.r2Centred, false);
  } finally {
    engine.close();
  }
});

Deno.test("fitInEngine() Durbin–Watson, Breusch–Pagan and leverage agree with the in-memory check to 1e-9", async () => {
  const data = invented(20_000, 5);
  const engine = await DuckDbTestEngine.open();
  try {
    await engine.load("readings", data);
    const weights = { expr: parseColumnExpression("w", [...NAMES]), text: "w" };
    for (const extra of [{}, { weights }]) {
      const e = await engineFit(engine, LINEAR, NAMES, { order: "t", ...extra });
      const m = memoryFit(data, LINEAR, "weights" in extra ? { weights: "w" } : {});
      const c = memoryCheck(m);
      // The in-memory check kind's numbers on the same rows, in the same order (cells/check).
      assert.ok(
        rel(e.durbinWatson!, c.durbin_watson!) < 1e-9,
        `${e.durbinWatson} ${c.durbin_watson}`,
      );
      const bp = e.breuschPagan!, mb = c.breusch_pagan!;
      assert.equal(bp.df, mb.df);
      assert.ok(rel(bp.statistic, mb.statistic) < 1e-9, `${bp.statistic} vs ${mb.statistic}`);
      assert.ok(rel(bp.p_value, mb.p_value) < 1e-9, `${bp.p_value} vs ${mb.p_value}`);
      assert.ok(rel(bp.f!, mb.f!) < 1e-9, `${bp.f} vs ${mb.f}`);
      const h = c.leverage, p = 6, n = h.length;
      assert.ok(rel(e.leverage.max, Math.max(...h)) < 1e-9, `${e.leverage.max}`);
      assert.equal(e.leverage.over2p, h.filter((v) => v > 2 * p / n).length);
      assert.equal(e.leverage.over3p, h.filter((v) => v > 3 * p / n).length);
      assert.equal(e.computed.durbin_watson, "engine");
    }
  } finally {
    engine.close();
  }
});

/** Loads a NIST StRD set into DuckDB as a table of its columns. */
async function strdTable(engine: DuckDbTestEngine, name: string) {
  const set = await loadStrd(name);
  if (set === null) return null;
  await engine.load(
    name.toLowerCase(),
    Object.fromEntries(set.columns.map((c, i) => [c, set.data[i]])),
  );
  return set;
}

/** The worst of the digits of every certified estimate, standard deviation, σ and R². */
function worstDigits(e: InEngineFit, set: NonNullable<Awaited<ReturnType<typeof loadStrd>>>) {
  let worst = Infinity;
  set.parameters.forEach((c, j) => {
    worst = Math.min(worst, digits(e.estimates[j], c.estimate));
    worst = Math.min(worst, digits(e.statistics.stdErrors[j]!, c.std_dev));
  });
  worst = Math.min(worst, digits(e.statistics.sigma!, set.residual_std_dev));
  return Math.min(worst, digits(e.statistics.r2!, set.r_squared));
}

Deno.test("fitInEngine() streams NIST StRD Longley through QR and meets every certified value to 12 digits", async () => {
  const engine = await DuckDbTestEngine.open();
  try {
    const set = await strdTable(engine, "Longley");
    if (set === null) return;
    const e = await engineFit(
      engine,
      "y = linear(x1, x2, x3, x4, x5, x6)",
      set.columns,
      {},
      "longley",
    );
    // κ of the centred, scaled Longley design is 110 (this code's singular values; raw, 4.9e9),
    // past KAPPA_LIMIT = 94.9: the rows go through QR.
    assert.equal(e.route, "qr");
    assert.ok(e.kappa > KAPPA_LIMIT && e.kappa < 120, String(e.kappa));
    assert.match(e.note!, /^condition number 1\.1e\+2: sums of cross-products would lose accuracy/);
    assert.equal(e.computed.solve, "streamed");
    // NIST StRD certified values; 12 digits is the project's bar for them, which the in-memory
    // fit meets (test/reference/strd_linear_test.ts, BAR = 12). Measured here: 14.0.
    const worst = worstDigits(e, set);
    assert.ok(worst >= 12, `Longley: ${worst.toFixed(1)} digits`);
  } finally {
    engine.close();
  }
});

Deno.test("fitInEngine() streams NIST StRD Wampler4 through QR: 8 digits for its constant term, 11 for the rest", async () => {
  const engine = await DuckDbTestEngine.open();
  try {
    const set = await strdTable(engine, "Wampler4");
    if (set === null) return;
    const e = await engineFit(engine, "y = polynomial(x, 5)", set.columns, {}, "wampler4");
    assert.equal(e.route, "qr");
    // NIST StRD certified values. The constant term (1, standard error 215) is the estimate a
    // QR in double leaves least accurate: κ 1.6e3 (centred, scaled) and residuals a fifth of
    // the response put it near κ²u·‖r‖/(‖X‖‖θ‖); measured here 8.6 digits (the in-memory fit
    // reaches 12 only in double-double from the data as printed, solve_linear.ts).
    const est = Math.min(...set.parameters.map((c, j) => digits(e.estimates[j], c.estimate)));
    assert.ok(est >= 8, `estimates: ${est.toFixed(1)} digits`);
    set.parameters.forEach((c, j) => {
      assert.ok(digits(e.statistics.stdErrors[j]!, c.std_dev) >= 11, `se ${c.name}`);
    });
    assert.ok(digits(e.statistics.sigma!, set.residual_std_dev) >= 11);
    assert.ok(digits(e.statistics.r2!, set.r_squared) >= 11);
  } finally {
    engine.close();
  }
});

Deno.test("fitInEngine() fits NIST StRD Pontius and Norris from sums to 12 certified digits", async () => {
  const engine = await DuckDbTestEngine.open();
  try {
    const sets: [string, string][] = [["Norris", "y = B0 + B1*x"], [
      "Pontius",
      "y = polynomial(x, 2)",
    ]];
    for (const [name, text] of sets) {
      const set = await strdTable(engine, name);
      if (set === null) return;
      const e = await engineFit(engine, text, set.columns, {}, name.toLowerCase());
      assert.equal(e.route, "sums", name);
      // NIST StRD certified values, the project's 12-digit bar.
      const worst = worstDigits(e, set);
      assert.ok(worst >= 12, `${name}: ${worst.toFixed(1)} digits`);
    }
  } finally {
    engine.close();
  }
});

Deno.test("fitInEngine() says why it cannot fit: no SQL, not finite, too few rows, the engine's error", async () => {
  const engine = await DuckDbTestEngine.open();
  try {
    await engine.run(
      "CREATE TABLE r AS SELECT * FROM (VALUES (1.0, 2.0, 'a'), (0.0, 3.0, 'b'), (2.0, 5.0, 'c'), (3.0, 7.0, 'd')) AS v(x, y, label)",
    );
    const columns = new Map<string, "number" | "text">([["x", "number"], ["y", "number"], [
      "label",
      "text",
    ]]);
    const ask = (text: string, query = "SELECT * FROM r") =>
      fitInEngine(
        {
          name: "line",
          model: parseModel(text, ["x", "y", "label"]),
          query,
          columns,
          confidence: 0.95,
          countVariance: true,
          warn: () => {},
        },
        engine,
        TEST_DB,
      );
    assert.deepEqual(await ask("y = a + b*label"), {
      ok: false,
      cannot: "translate",
      why:
        'Cannot fit "line" in the database: term "label" of "b" has no SQL (column "label" holds text)',
    });
    assert.deepEqual(await ask("y = a + b*log(x)"), {
      ok: false,
      cannot: "data",
      why: 'Cannot fit "line": term "log(x)" of parameter "b" is not finite in 1 row of the query',
    });
    assert.deepEqual(await ask("y = a + b*x", "SELECT * FROM r WHERE x > 1.5"), {
      ok: false,
      cannot: "data",
      why:
        'Cannot fit "line": the query gives 2 rows to fit 2 parameters; it needs more rows than parameters',
    });
    const failed = await ask("y = a + b*x", "SELECT * FROM missing_table");
    assert.equal(failed.ok, false);
    assert.ok(!failed.ok && failed.cannot === "engine" && /missing_table/.test(failed.why));
    const exact = await ask("y = a + b*x", "SELECT x, 2*x + 1 AS y FROM r");
    assert.ok(exact.ok && exact.fit.rss < 1e-25, "an exact fit has RSS 0 to rounding");
  } finally {
    engine.close();
  }
});

Deno.test({
  name:
    "fitInEngine() on a sharded PostgreSQL: each pass aggregates on the shards, the fit equals the in-memory one",
  ignore: !postgresInstalled(),
  sanitizeResources: false,
  sanitizeOps: false,
  fn: async () => {
    const rows = 20_000;
    const sharded = await startShardedEngine({ basePort: 55790, rows, seed: 11 });
    try {
      const names = ["part", "x1", "x2", "x3", "x4", "x5", "y"];
      const got = await fitInEngine(
        {
          name: "line",
          model: parseModel(LINEAR, names),
          query: "SELECT part, x1, x2, x3, x4, x5, y FROM readings",
          columns: new Map(names.map((c) => [c, "number" as const])),
          partitionBy: "part",
          order: "x1",
          confidence: 0.95,
          countVariance: true,
          warn: () => {},
        },
        new PgTestEngine(sharded.url),
        { engine: "postgres", urlFrom: "UNUSED" },
      );
      assert.ok(got.ok, got.ok ? "" : got.why);
      const mem = readingsInMemory(rows, 11);
      const data = Object.fromEntries([...mem.x.map((v, j) => [`x${j + 1}`, v]), ["y", mem.y]]);
      // The same estimator by Householder QR in memory on the same rows: issue 18's 1e-9.
      assertSameFit(got.fit, memoryFit(data, LINEAR), 1e-9);
      for (const pass of got.fit.passes.filter((p) => /^pass [1235]/.test(p.name))) {
        const plan = await sharded.explain(pass.sql);
        for (const k of [1, 2]) {
          assert.match(
            plan,
            new RegExp(`Relations: Aggregate on \\(public\\.readings_p${k} `),
            pass.name,
          );
        }
      }
      // Durbin–Watson's windows (passes 4 and 6) need the rows in order: the coordinator
      // computes them.
      assert.equal(got.fit.passes.length, 6);
    } finally {
      await sharded.stop();
    }
  },
});
