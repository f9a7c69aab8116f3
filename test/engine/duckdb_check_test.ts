/**
 * A document whose table stays in a DuckDB file (keep_rows: database), a
 * linear fit computed there and a check of that fit, through `plumb run
 * --json` (the engine in its own process, as in use): the check runs, has
 * the in-engine form, and its numbers equal the in-memory check of the same
 * rows in the same document.
 *
 * @module
 */
import { deepEqual, equal, match, ok } from "node:assert/strict";
import { join } from "node:path";
import { renderToString } from "preact-render-to-string";
import { plumbRunJson } from "../examples/_plumb_run.ts";
import { makeDuckdb, resultOf } from "./_engine_testing.ts";
import { CheckView } from "../../cells/check/view.tsx";
import type { CheckResult } from "../../cells/check/result.ts";

/** Invented readings in sequence (sines of the row number, as duckdb_test.ts), variance growing with x1. */
const READINGS = `CREATE TABLE readings AS SELECT
  i AS id,
  sin(i * 0.37) AS x1,
  cos(i * 0.11) AS x2,
  sin(i * 0.023) + 0.5 * cos(i * 0.7) AS x3,
  3 + 1.5 * sin(i * 0.37) - 2 * cos(i * 0.11) + 0.7 * (sin(i * 0.023) + 0.5 * cos(i * 0.7))
    + (1.2 + sin(i * 0.37)) * 0.3 * sin(i * 7.77) AS y
  FROM range(1, 8001) AS r(i)`;

const MODEL = "y = b0 + b1*x1 + b2*x2 + b3*x3";

const fence = (kind: string, name: string, body: string) =>
  "```" + `${kind} ${name}\n${body}\n` + "```\n\n";

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

Deno.test("a document's table kept in DuckDB → fit → check runs, and the check has the in-engine form", async () => {
  const dir = await Deno.makeTempDir({ prefix: "plumb-duckdb-check-" });
  try {
    await makeDuckdb(join(dir, "plant.duckdb"), [READINGS]);
    const query = "SELECT id, x1, x2, x3, y FROM readings";
    const base = `database: plant.duckdb\nquery: ${query}`;
    const doc = "# A check of a fit in the database\n\n" +
      fence("table", "mem", `${base}\norder_by: id`) +
      fence("table", "eng", `${base}\norder_by: id\nkeep_rows: database`) +
      fence("table", "unordered", `${base}\nkeep_rows: database`) +
      fence("fit", "in-memory", `on: mem\nmodel: ${MODEL}`) +
      fence("fit", "in-engine", `on: eng\nmodel: ${MODEL}`) +
      fence("fit", "no-order", `on: unordered\nmodel: ${MODEL}`) +
      fence("check", "judged-in-memory", "fit: in-memory") +
      fence("check", "judged-in-engine", "fit: in-engine") +
      fence("check", "judged-no-order", "fit: no-order");
    await Deno.writeTextFile(join(dir, "doc.md"), doc);
    const r = await plumbRunJson(join(dir, "doc.md"), "--no-history");
    equal(r.code, 0, r.stderr);
    const mem = resultOf<CheckResult>(r.json, "judged-in-memory");
    const eng = resultOf<CheckResult>(r.json, "judged-in-engine");
    const none = resultOf<CheckResult>(r.json, "judged-no-order");
    equal(mem.in_engine, undefined);
    ok(eng.in_engine !== undefined, "the check of the in-engine fit has its in_engine block");
    match(eng.in_engine.note, /^The 8,000 rows stay in DuckDB, so no panel of rows can be drawn/);
    deepEqual(eng.residuals, []);
    deepEqual(eng.leverage, []);
    equal(eng.n, 8000);
    // The same statistics as the in-memory check of the same rows (issue 18's 1e-9; the
    // in-memory check's own sources are named in cells/check/in_engine_test.ts).
    const pairs: [string, number | null | undefined, number | null | undefined][] = [
      ["Breusch–Pagan", eng.breusch_pagan?.statistic, mem.breusch_pagan?.statistic],
      ["Breusch–Pagan p", eng.breusch_pagan?.p_value, mem.breusch_pagan?.p_value],
      ["Durbin–Watson", eng.durbin_watson, mem.durbin_watson],
      ["DW p", eng.durbin_watson_test?.p_value, mem.durbin_watson_test?.p_value],
      ["condition number", eng.condition_number, mem.condition_number],
      ["Jarque–Bera", eng.jarque_bera?.statistic, mem.jarque_bera?.statistic],
      ["PRESS", eng.press, mem.press],
      ...Object.keys(mem.vif).map((k): [string, number | null, number | null] => [
        `VIF ${k}`,
        eng.vif[k],
        mem.vif[k],
      ]),
    ];
    for (const [name, a, b] of pairs) {
      ok(a != null && b != null && rel(a, b) < 1e-9, `${name}: ${a} vs ${b}`);
    }
    equal(eng.in_engine.leverage.over_2p, mem.leverage.filter((h) => h > 2 * 4 / 8000).length);
    // Breusch–Pagan finds the variance that grows with x1, in both.
    ok(eng.findings.some((f) => f.code === "non-constant-variance"));
    ok(mem.findings.some((f) => f.code === "non-constant-variance"));
    // Without order_by, Durbin–Watson is not computed, and the check says why.
    equal(none.durbin_watson, null);
    ok(none.in_engine!.not_judged[0].includes("not computed: needs an order column"));
    // The view: the sentence, the sums, no chart.
    const html = renderToString(CheckView({ name: "judged-in-engine", result: eng }));
    match(html, /stay in DuckDB/);
    match(html, /From sums over the rows in DuckDB/);
    ok(!html.includes("<svg") && !html.includes("plumb-check-charts"), "no empty chart");
    const plain = renderToString(CheckView({ name: "judged-no-order", result: none }));
    match(plain, /needs an order column/);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});
