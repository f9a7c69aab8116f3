/**
 * The fit block of a fit computed in its database (cells/fit/view.tsx with
 * cells/fit/_in_engine_view.tsx): the engine, the route and κ on one line;
 * folded, why the rows were streamed through QR, which number was computed
 * where, the diagnostics the database's sums gave and each statement's time.
 * A fit in memory has no such part. The records are written by hand in the
 * shape of RUN-JSON's `in_engine_detail`; the last test takes one from a
 * real run on a DuckDB file.
 */
import { doesNotMatch, equal, match, ok } from "node:assert/strict";
import { join } from "node:path";
import { renderToString } from "preact-render-to-string";
import { h } from "preact";
import { FitView } from "../../cells/fit/view.tsx";
import type { FitResult } from "../../cells/fit/result.ts";
import type { InEngineRecord } from "../../cells/fit/_in_engine.ts";
import { registry } from "../../cells/mod.ts";
import { Session } from "../../kernel/session/session.ts";
import { formatNumber } from "../../cells/shared/format.ts";
import { makeDuckdb } from "../engine/_engine_testing.ts";

const STEPS = {
  counts: "engine",
  sums: "engine",
  cross_products: "engine",
  solve: "plumb",
  refinement: "engine",
  rss: "engine",
  residual_sums: "engine",
  leverage: "engine",
  breusch_pagan: "engine",
  durbin_watson: "not computed",
  criteria: "plumb",
} as const;

function record(more: Partial<InEngineRecord> = {}): InEngineRecord {
  return {
    engine: "duckdb",
    route: "sums",
    kappa: 1.0011541803674018,
    rows_left_out: 0,
    partition_by: null,
    order_by: null,
    weights: null,
    computed: { ...STEPS },
    note: null,
    sum_residuals: 4.66e-14,
    leverage: { max: 0.0016687, over2p: 0, over3p: 0, sum: 3 },
    durbin_watson: null,
    breusch_pagan: {
      variant: "koenker",
      statistic: 2.5,
      df: 2,
      p_value: 0.2865,
      f: 1.25,
      f_p_value: 0.287,
    },
    passes: [
      { name: "pass 1: counts and sums", ms: 18.2 },
      { name: "pass 2: cross-products", ms: 6.6 },
      { name: "pass 3: residual sums", ms: 20.3 },
    ],
    ...more,
  };
}

/** A fit result in the shape of `FitResult` (numbers invented), with an in-engine record or not. */
function fit(detail: InEngineRecord | null): FitResult {
  return {
    method: "linear",
    model: "y = a + b*x",
    response: "y",
    weighted: false,
    n: 3000,
    p: 2,
    df_residual: 2998,
    parameters: [],
    covariance: [],
    correlation: [],
    covariance_scaled: true,
    rss: 1,
    tss: 2,
    ess: 1,
    r2: 0.5,
    adj_r2: 0.4998,
    r2_kind: "centred",
    sigma: 0.018,
    f_statistic: null,
    f_p_value: null,
    wald_chi2: null,
    wald_df: null,
    wald_p_value: null,
    gof_chi2: null,
    gof_df: null,
    gof_p_value: null,
    reduced_chi2: null,
    log_likelihood: null,
    k: 3,
    k_convention: "k = p + 1",
    aic: null,
    aicc: null,
    bic: null,
    confidence: 0.95,
    inference: "t",
    weighting: "none",
    weighting_statement: "unweighted",
    condition_number: 1,
    fitted: [],
    residuals: [],
    rows: [],
    rows_missing: [],
    sigma_unit: null,
    converged: true,
    iterations: 0,
    rank_deficient: null,
    in_engine: detail !== null,
    ...(detail === null ? {} : { in_engine_detail: detail }),
  } as FitResult;
}

/** The visible text of an HTML fragment, tags dropped and spaces collapsed. */
function text(html: string): string {
  return html.replace(/<!-- -->/g, "").replace(/<[^>]+>/g, " ").replace(/&#39;|&apos;/g, "'")
    .replace(/\s+/g, " ").trim();
}

/** The definition list of a class, as "term: value" lines. */
function pairs(html: string, cls: string): string[] {
  const dl = new RegExp(`<dl class="${cls}">(.*?)</dl>`, "s").exec(html)?.[1] ?? "";
  return [...dl.matchAll(/<dt>(.*?)<\/dt><dd>(.*?)<\/dd>/gs)].map((m) =>
    `${text(m[1])}: ${text(m[2])}`
  );
}

const render = (r: FitResult) => renderToString(h(FitView, { name: "plane", result: r }));

Deno.test("FitView of a fit in DuckDB says where, by which route and at what κ, the rest folded", () => {
  const html = render(fit(record()));
  const line = text(/<p class="plumb-fit-engine-line">(.*?)<\/p>/s.exec(html)![1]);
  // κ to four significant digits by formatNumber, which keeps a value near 1 off 1:
  // 1.00115… → 1.001 (exact arithmetic of rounding).
  equal(
    line,
    "Computed in DuckDB : the rows stayed in the database. Route: sums (Cholesky of the centred cross-products) , κ = 1.001",
  );
  match(html, /<details class="plumb-fit-engine-detail"><summary>Where each number was computed/);
  doesNotMatch(html, /<details[^>]* open/, "folded");
  doesNotMatch(html, /Why QR/, "no note on the sums route");
  equal(
    pairs(html, "plumb-fit-engine-where").join("\n"),
    [
      "In DuckDB: row counts, column sums, centred cross-products, the refinement step, the residual sum of squares, sums of residuals, the leverage summary, Breusch–Pagan's sums",
      "In Plumb, from DuckDB's sums: the estimates, AIC, AICc and BIC",
      "Not computed: Durbin–Watson's sums",
    ].join("\n"),
  );
  equal(
    pairs(html, "plumb-fit-engine-diagnostics").join("\n"),
    [
      // formatNumber(0.0016687, 3) = 0.00167; p by formatP (common practice, no source).
      "Largest leverage: 0.00167 (0 rows above 2p/n, 0 above 3p/n)",
      "Breusch–Pagan, Koenker's form: χ²(2) = 2.5, p 0.29",
      "Durbin–Watson: not computed: the table names no order_by (a database table has no row order)",
      "Σ residuals (zero up to rounding): 4.66e-14",
    ].join("\n"),
  );
  // formatDuration: 18.2 → 18 ms, 6.6 → 6.6 ms (one decimal under 10 ms).
  equal(
    text(/<ol class="plumb-fit-engine-passes">(.*?)<\/ol>/s.exec(html)![1]),
    "pass 1: counts and sums, 18 ms pass 2: cross-products, 6.6 ms pass 3: residual sums, 20 ms",
  );
});

Deno.test("FitView of a fit streamed through QR on PostgreSQL gives the route, the reason and the order", () => {
  const note = "condition number 1.4e+2: sums of cross-products would lose accuracy (about " +
    "κ² × 1.1e-16 = 2.1e-12), so rows were streamed through QR";
  const html = render(fit(record({
    engine: "postgres",
    route: "qr",
    kappa: 136.2,
    note,
    order_by: "batch",
    durbin_watson: 1.83104,
    partition_by: "part",
    weights: "1/flow",
    rows_left_out: 7,
    computed: { ...STEPS, solve: "streamed", durbin_watson: "engine" },
  })));
  match(
    text(html),
    /Computed in PostgreSQL : the rows stayed in the database\. Route: rows streamed through QR in blocks , κ = 136\.2/,
  );
  match(html, /data-route="qr"/);
  equal(text(/<p class="plumb-fit-engine-note">(.*?)<\/p>/s.exec(html)![1]), `Why QR: ${note}`);
  const where = pairs(html, "plumb-fit-engine-where");
  ok(where.includes("In Plumb, from rows streamed through QR: the estimates"), where.join("\n"));
  ok(where[0].endsWith("Breusch–Pagan's sums, Durbin–Watson's sums"), where[0]);
  const diagnostics = pairs(html, "plumb-fit-engine-diagnostics");
  ok(diagnostics.includes("Durbin–Watson: 1.831 (rows in batch's order)"), diagnostics.join("\n"));
  ok(diagnostics.includes("Rows left out (a missing value, or weight 0): 7"));
  ok(diagnostics.includes("Sums taken per partition of: part"));
  ok(diagnostics.includes("Relative weights: 1/flow"));
});

Deno.test("FitView of a fit in memory has no database part", () => {
  const html = render(fit(null));
  doesNotMatch(html, /plumb-fit-engine/);
  doesNotMatch(html, /Computed in/);
});

Deno.test("FitView of a real in-engine fit on DuckDB shows the record's route, κ and statements", async () => {
  const dir = await Deno.makeTempDir({ prefix: "plumb-fit-view-" });
  // Invented rows: x over 2,000 rows, y a line with a wobble.
  await makeDuckdb(join(dir, "lab.duckdb"), [
    "CREATE TABLE runs AS SELECT i AS x, 2 + 0.5 * i + sin(i * 7.77) AS y FROM range(1, 2001) r(i)",
  ]);
  const session = new Session({
    registry,
    workerUrl: new URL("../../cells/worker.ts", import.meta.url),
    dir,
    page: true,
  });
  try {
    const report = await session.run(
      "```table runs\ndatabase: lab.duckdb\nquery: SELECT x, y FROM runs\nkeep_rows: database\n```\n\n" +
        "```fit line\non: runs\nmodel: y = a + b*x\n```\n",
    );
    const cell = report.cells.find((c) => c.name === "line")!;
    const r = cell.result as FitResult;
    equal(r.in_engine, true, JSON.stringify(cell.error));
    const d = r.in_engine_detail!;
    const html = render(r);
    // The page's κ is the record's through the one number formatter (the same function).
    ok(text(html).includes(`κ = ${formatNumber(d.kappa, 4)}`), text(html));
    match(text(html), /Route: sums \(Cholesky of the centred cross-products\)/);
    equal((html.match(/<li>/g) ?? []).length, d.passes.length, "one line per statement");
  } finally {
    session.close();
    await Deno.remove(dir, { recursive: true });
  }
});
