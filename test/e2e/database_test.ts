/**
 * Tables from a database in the live page, in headless Chromium against the
 * real `plumb serve` on a temporary folder holding a document and a DuckDB
 * file in a folder beside it, under a name longer than a phone's line
 * (3,000 invented dryer batches, built with
 * @duckdb/node-api as the engine suites build theirs):
 *
 * ```
 *  measurements/….duckdb ─▶ table line-one (rows in memory)   ─▶ fit line-plane
 *                        ─▶ table batches  (keep_rows: database) ─▶ fit plane  (sums route)
 *                                                                ─▶ fit curve  (κ > 95: QR)
 *                        ─▶ table scrap    (a query that deletes: refused at its place)
 * ```
 *
 * At 390, 960 and 1440 px: each table block shows its engine, its file, its
 * query and its fingerprint with nothing wider than the block; the refused
 * query's block shows the located error while every other block has its
 * result; the fits on the kept table say they were computed in DuckDB, by
 * which route, at what κ, and (opened) what was computed where; the page
 * never scrolls sideways. Then the query is edited on disk and the live
 * workspace reruns: the page shows the new row count, fingerprint and fit.
 * Screenshots: test/artifacts/database-*.png (the page, and each block alone).
 */
import { equal, match, ok } from "node:assert/strict";
import { join } from "node:path";
import type { Page } from "puppeteer-core";
import type { CellMessage } from "../../kernel/server/protocol.ts";
import { formatNumber } from "../../cells/shared/format.ts";
import { makeDuckdb } from "../engine/_engine_testing.ts";
import {
  ARTIFACTS,
  type Session,
  settled,
  skipWithoutBrowser,
  THREE_WIDTHS,
  withServedBrowser,
} from "./_harness.ts";

const ignore = skipWithoutBrowser("database");

/**
 * Invented batches of a dryer: inlet temperature in [160, 180] °C, airflow
 * in [1, 3] m³/s, outlet moisture with a slight curvature in temperature
 * and a wobble. Three production lines take batches in turn (batch i runs
 * on line 1 + i mod 3).
 */
const BATCHES = `CREATE TABLE batches AS
  SELECT batch, line, inlet_temp, airflow,
    18 - 0.05 * inlet_temp - 1.2 * airflow + 0.0004 * (inlet_temp - 170) ^ 2
      + 0.2 * sin(batch * 7.77) AS moisture
  FROM (SELECT i AS batch, 1 + (i % 3) AS line,
      160 + 20 * (0.5 + 0.5 * sin(i * 0.37)) AS inlet_temp,
      2 + cos(i * 0.11) AS airflow
    FROM range(1, 3001) AS r(i))`;

const fence = (kind: string, name: string, body: string) =>
  "```" + `${kind} ${name}\n${body}\n` + "```\n\n";

/** A file in a folder below the document, its path longer than a phone's line. */
const FILE = "measurements/dryer-outlet-moisture-line-survey-2026.duckdb";
const QUERY = "SELECT batch, inlet_temp, airflow, moisture FROM batches WHERE line = 1";
const NARROWED = `${QUERY} AND batch <= 1500`;
const KEPT_QUERY = "SELECT batch, inlet_temp, airflow, moisture\nFROM batches";
const BAD = "SELECT batch FROM batches; DELETE FROM batches";

function doc(query: string): string {
  return "---\ntitle: Outlet moisture of the dryer\n---\n\n" +
    "_Invented data: 3,000 batches of a dryer._\n\n" +
    fence(
      "table",
      "line-one",
      `database: ${FILE}\nquery: ${query}\nunits: { inlet_temp: degC, airflow: m^3/s }`,
    ) +
    fence(
      "table",
      "batches",
      `database: ${FILE}\nquery: |\n  ${
        KEPT_QUERY.replace("\n", "\n  ")
      }\nkeep_rows: database\norder_by: batch`,
    ) +
    fence("fit", "line-plane", "on: line-one\nmodel: moisture = a + b*inlet_temp + c*airflow") +
    fence("fit", "plane", "on: batches\nmodel: moisture = a + b*inlet_temp + c*airflow") +
    fence(
      "fit",
      "curve",
      "on: batches\nmodel: moisture = a + b*inlet_temp + c*inlet_temp^2 + d*airflow",
    ) +
    fence("table", "scrap", `database: ${FILE}\nquery: ${BAD}`);
}

const BLOCKS = ["line-one", "batches", "line-plane", "plane", "curve", "scrap"];
const WIDTHS = THREE_WIDTHS;

/** Waits until every block is settled (current or failed). */

/** The newest result the page was sent for a cell. */
function resultOf<T>(b: Session, name: string): T {
  const m = b.messages.findLast((m): m is CellMessage =>
    m.type === "cell" && m.name === name && m.result !== undefined
  );
  ok(m !== undefined, `no result sent for ${name}`);
  return m.result as T;
}

interface DatabaseJson {
  database: { engine: string; file: string; query: string; fingerprint: string; kept: boolean };
  rows_used: number;
}
interface EngineJson {
  n: number;
  in_engine: boolean;
  in_engine_detail: {
    route: string;
    kappa: number;
    note: string | null;
    computed: Record<string, string>;
    passes: unknown[];
  };
}

/**
 * What overflows: the page sideways, a block past the screen, and inside the database parts
 * (a table's source and query, a fit's engine section, an error) any element past its container.
 */
function overflows(page: Page, blocks: string[]): Promise<string[]> {
  return page.evaluate((blocks: string[]) => {
    const bad: string[] = [];
    const vw = document.documentElement.clientWidth;
    if (document.documentElement.scrollWidth > vw) {
      bad.push(`page scrolls sideways: ${document.documentElement.scrollWidth} > ${vw}`);
    }
    for (const name of blocks) {
      const block = document.querySelector(`[data-block="${name}"]`)!;
      const br = block.getBoundingClientRect();
      if (br.right > vw + 1) bad.push(`${name}: block ends at ${br.right} > ${vw}`);
      const result = block.querySelector(".pl-result");
      // A wide table scrolls in itself (display: block, max-width 100%), so the result never does.
      if (result && result.scrollWidth > result.clientWidth + 1) {
        bad.push(
          `${name}: result scrolls sideways (${result.scrollWidth} > ${result.clientWidth})`,
        );
      }
      const parts = block.querySelectorAll(
        ".plumb-table-source, .plumb-table-query, .plumb-table-line, .plumb-fit-engine, .pl-error",
      );
      for (const part of parts) {
        const pr = part.getBoundingClientRect();
        if (part.scrollWidth > part.clientWidth + 1) {
          bad.push(
            `${name}: .${part.className} scrolls (${part.scrollWidth} > ${part.clientWidth})`,
          );
        }
        if (pr.right > br.right + 1) bad.push(`${name}: .${part.className} past the block`);
        for (const e of part.querySelectorAll("*")) {
          const r = e.getBoundingClientRect();
          if (r.width > 0 && r.right > pr.right + 1) {
            bad.push(
              `${name}: <${e.tagName.toLowerCase()}> "${
                e.textContent?.slice(0, 30)
              }" past .${part.className}`,
            );
          }
        }
      }
    }
    return bad;
  }, blocks);
}

/** Every width: open the fits' disclosures, check nothing overflows, take a screenshot. */
async function fitsEveryWidth(page: Page, state: string): Promise<void> {
  await page.$$eval(
    ".plumb-fit-engine-detail",
    (ds) => ds.forEach((d) => d.setAttribute("open", "")),
  );
  for (const vp of WIDTHS) {
    await page.setViewport(vp);
    await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => r(null))));
    const bad = await overflows(page, BLOCKS);
    equal(bad.join("\n"), "", `${state} at ${vp.width} px`);
    // Each block alone too, to be read at its size.
    for (const name of BLOCKS) {
      const block = await page.$(`[data-block="${name}"]`);
      await block!.screenshot({
        path: new URL(`database-${state}-${vp.width}-${name}.png`, ARTIFACTS).pathname,
      });
    }
    // The viewport as tall as the page, so the screenshot shows every block.
    const height = await page.evaluate(() => document.documentElement.scrollHeight);
    await page.setViewport({ width: vp.width, height: Math.min(height, 6000) });
    await page.screenshot({
      path: new URL(`database-${state}-${vp.width}.png`, ARTIFACTS).pathname,
    });
  }
}

/** Scrolls a block into view and waits until its first `selector` reads `text`. */
async function shows(page: Page, block: string, selector: string, text: string): Promise<void> {
  await page.$eval(`[data-block="${block}"]`, (e) => e.scrollIntoView());
  await page.waitForFunction(
    (sel: string, want: string) => document.querySelector(sel)?.textContent === want,
    { timeout: 60_000, polling: 50 },
    `[data-block="${block}"] ${selector}`,
    text,
  );
}

/** The text of the first element matching `selector` in a block. */
function textIn(page: Page, block: string, selector: string): Promise<string> {
  return page.$eval(
    `[data-block="${block}"] ${selector}`,
    (e) => (e.textContent ?? "").replace(/\s+/g, " ").trim(),
  );
}

/** A table block shows its engine, file, query as written and the fingerprint's start. */
async function showsSource(page: Page, b: Session, name: string): Promise<DatabaseJson> {
  const r = resultOf<DatabaseJson>(b, name);
  const source = await textIn(page, name, ".plumb-table-source");
  match(source, /DuckDB/, `${name} names the engine`);
  ok(source.includes(FILE), `${name} names the file: ${source}`);
  const query = await page.$eval(
    `[data-block="${name}"] .plumb-table-query`,
    (e) => e.textContent ?? "",
  );
  equal(query.trim(), r.database.query.trim(), `${name} shows the query as written`);
  ok(
    source.includes(r.database.fingerprint.slice(0, 16)),
    `${name} shows the fingerprint ${r.database.fingerprint}: ${source}`,
  );
  return r;
}

Deno.test({
  name:
    "database tables in the page: source, query, fingerprint, a refused query at its place, fits in the engine, a live edit",
  ignore,
  sanitizeOps: false,
  sanitizeResources: false,
  async fn(t) {
    await withServedBrowser("fade", "dryer.md", async (served, b) => {
      const { page } = b;
      await page.goto(served.url);
      await settled(page);

      await t.step("each table shows its engine, file, query and fingerprint", async () => {
        const one = await showsSource(page, b, "line-one");
        // Batch i is on line 1 when i mod 3 = 0: 1,000 of 1…3000 (exact arithmetic).
        equal(one.rows_used, 1000);
        equal(one.database.kept, false);
        match(await textIn(page, "line-one", ".plumb-table-line"), /^1000 rows · 4 columns/);
        const kept = await showsSource(page, b, "batches");
        equal(kept.database.kept, true);
        match(await textIn(page, "batches", ".plumb-table-source"), /kept in the database/);
      });

      await t.step(
        "the refused query shows its located error; the others have results",
        async () => {
          equal(
            await page.$eval('[data-block="scrap"]', (e) => e.getAttribute("data-state")),
            "failed",
          );
          const error = await textIn(page, "scrap", ".pl-error");
          match(error, /A query must be one SELECT that only reads: a second statement/);
          const lines = Deno.readTextFileSync(served.doc).split("\n");
          const line = lines.indexOf(`query: ${BAD}`) + 1;
          const where = /\(line (\d+), column (\d+)\)/.exec(error);
          ok(where !== null, `the error names its place: ${error}`);
          equal(Number(where[1]), line, "the query's line in the document");
          // Between the first statement's end and the second statement's start.
          const column = Number(where[2]);
          const semicolon = `query: ${BAD}`.indexOf(";") + 1;
          ok(column >= semicolon && column <= semicolon + 2, `column ${column}`);
          for (const name of BLOCKS.filter((n) => n !== "scrap")) {
            equal(
              await page.$eval(`[data-block="${name}"]`, (e) => e.getAttribute("data-state")),
              "current",
              `${name} keeps its result`,
            );
            ok(await page.$(`[data-block="${name}"] .pl-result`), `${name} shows a result`);
          }
        },
      );

      await t.step("the fits on the kept table say where they were computed", async () => {
        const plane = resultOf<EngineJson>(b, "plane");
        equal(plane.in_engine, true);
        equal(plane.in_engine_detail.route, "sums");
        const curve = resultOf<EngineJson>(b, "curve");
        equal(curve.in_engine_detail.route, "qr", `κ ${curve.in_engine_detail.kappa}`);
        equal(resultOf<EngineJson>(b, "line-plane").in_engine, false);
        equal(await page.$('[data-block="line-plane"] .plumb-fit-engine'), null);
        for (const [name, r] of [["plane", plane], ["curve", curve]] as const) {
          const line = await textIn(page, name, ".plumb-fit-engine-line");
          match(line, /^Computed in DuckDB: the rows stayed in the database/);
          // The page's κ is the record's through the one number formatter (the same function).
          ok(line.includes(`κ = ${formatNumber(r.in_engine_detail.kappa, 4)}`), line);
          equal(
            await page.$eval(
              `[data-block="${name}"] [data-route]`,
              (e) => e.getAttribute("data-route"),
            ),
            r.in_engine_detail.route,
          );
          await page.click(`[data-block="${name}"] .plumb-fit-engine-detail summary`);
          const detail = await textIn(page, name, ".plumb-fit-engine-detail");
          match(detail, /In DuckDB ?row counts, column sums, centred cross-products/);
          match(detail, /AIC, AICc and BIC/);
          match(detail, /Durbin–Watson ?\d\.\d+ \(rows in batch's order\)/);
          equal(
            (await page.$$(`[data-block="${name}"] .plumb-fit-engine-passes li`)).length,
            r.in_engine_detail.passes.length,
            "one line per statement",
          );
        }
        match(await textIn(page, "curve", ".plumb-fit-engine-line"), /rows streamed through QR/);
        match(
          await textIn(page, "curve", ".plumb-fit-engine-note"),
          /^Why QR: condition number .* so rows were streamed through QR$/,
        );
        match(
          await textIn(page, "curve", ".plumb-fit-engine-where"),
          /In Plumb, from rows streamed through QR ?the estimates/,
        );
        equal(await page.$('[data-block="plane"] .plumb-fit-engine-note'), null);
        await fitsEveryWidth(page, "first");
      });

      await t.step("a query edited on disk reruns: new rows, fingerprint and fit", async () => {
        await page.setViewport({ width: 1280, height: 900 });
        const before = resultOf<DatabaseJson>(b, "line-one").database.fingerprint;
        Deno.writeTextFileSync(served.doc, doc(NARROWED));
        // A block far off screen draws its newest result only when it comes near: look at each.
        await shows(page, "line-one", ".plumb-table-line", "500 rows · 4 columns · from DuckDB");
        await shows(page, "line-plane", ".plumb-fit-statistics dd", "500");
        await settled(page);
        const after = await showsSource(page, b, "line-one");
        // Batches 3, 6, …, 1500 (exact arithmetic).
        equal(after.rows_used, 500);
        equal(after.database.query, NARROWED);
        ok(after.database.fingerprint !== before, "a new fingerprint");
        ok(
          !(await textIn(page, "line-one", ".plumb-table-source")).includes(before.slice(0, 16)),
          "the old fingerprint is gone from the page",
        );
        equal(resultOf<{ n: number }>(b, "line-plane").n, 500, "the fit's rows follow the table");
        await fitsEveryWidth(page, "edited");
      });
      equal(b.errors.join("\n"), "");
    }, async (dir) => {
      Deno.mkdirSync(join(dir, "measurements"));
      await makeDuckdb(join(dir, FILE), [BATCHES]);
      Deno.writeTextFileSync(join(dir, "dryer.md"), doc(QUERY));
    });
  },
});
