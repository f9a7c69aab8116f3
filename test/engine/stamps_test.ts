/**
 * A database answer's fingerprint in the cache key (`CellKind.stamp`,
 * kernel/session/stamps.ts): a table read by a query reruns, with what reads
 * it, when the database's answer changes, and not otherwise; a live
 * workspace notices the change by itself. Against PostgreSQL (rows inserted
 * by another connection while Plumb reads) and DuckDB.
 */
import { deepEqual, equal, match, ok } from "node:assert/strict";
import { join } from "node:path";
import { registry } from "../../cells/mod.ts";
import { Session } from "../../kernel/session/session.ts";
import { LiveWorkspace } from "../../kernel/server/live_workspace.ts";
import { startCluster } from "./_cluster.ts";
import { makeDuckdb, withoutPostgres } from "./_engine_testing.ts";
import { DuckDBInstance } from "@duckdb/node-api";

const WORKER = new URL("../../cells/worker.ts", import.meta.url);
const ignore = withoutPostgres("stamps");

const fence = (kind: string, name: string, body: string) =>
  "```" + `${kind} ${name}\n${body}\n` + "```\n\n";

/** Invented rows: y = 2 + 3x plus a wobble. */
const rowsSql = (from: number, to: number) =>
  `INSERT INTO readings SELECT i, 2 + 3 * i + sin(i) FROM generate_series(${from}, ${to}) AS i;`;

const DOC = (db: string) =>
  "# Readings\n\n" +
  fence("table", "t", `${db}\nquery: SELECT x, y FROM readings`) +
  fence("fit", "f", "on: t\nmodel: y = a + b*x");

async function withFolder<T>(body: (dir: string) => Promise<T>): Promise<T> {
  const dir = await Deno.makeTempDir({ prefix: "plumb-stamps-" });
  try {
    return await body(dir);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

const resultOf = (r: Awaited<ReturnType<Session["run"]>>, name: string) =>
  r.cells.find((c) => c.name === name)!;

Deno.test({
  name:
    "PostgreSQL: rows added by another connection rerun the table and its fit once the fingerprints are asked again",
  ignore,
  sanitizeResources: false,
  sanitizeOps: false,
  fn: async () => {
    const cluster = await startCluster(0);
    try {
      await cluster.psql(
        "CREATE TABLE readings (x float8, y float8); GRANT SELECT ON readings TO plumb;" +
          rowsSql(1, 100),
        "plumb",
      );
      Deno.env.set("PLUMB_TEST_PG_STAMPS", cluster.url);
      await withFolder(async (dir) => {
        const s = new Session({ registry, workerUrl: WORKER, dir });
        try {
          const doc = DOC("database: { url_from: PLUMB_TEST_PG_STAMPS }");
          const first = await s.run(doc);
          deepEqual(first.ran.toSorted(), ["f", "t"]);
          equal((resultOf(first, "f").result as { n: number }).n, 100);
          // Nothing changed: nothing computes, and the fingerprint asked again is the same.
          equal((await s.run(doc)).ran.length, 0);
          equal(await s.recheckStamps(), false);

          await cluster.psql(rowsSql(101, 120), "plumb");
          // Until asked again, the session keeps the answer it keyed with (no scan per edit).
          equal((await s.run(doc)).ran.length, 0);
          equal(await s.recheckStamps(), true);
          const after = await s.run(doc);
          deepEqual(after.ran.toSorted(), ["f", "t"]);
          equal((resultOf(after, "f").result as { n: number }).n, 120);
          const t = resultOf(after, "t").result as { database: { fingerprint: string } };
          match(t.database.fingerprint, /^120:/);
          equal(await s.recheckStamps(), false);
        } finally {
          s.close();
        }
      });
    } finally {
      Deno.env.delete("PLUMB_TEST_PG_STAMPS");
      await cluster.stop();
    }
  },
});

Deno.test({
  name: "PostgreSQL: a live workspace follows a database that changes under it",
  ignore,
  sanitizeResources: false,
  sanitizeOps: false,
  fn: async () => {
    const cluster = await startCluster(0);
    try {
      await cluster.psql(
        "CREATE TABLE readings (x float8, y float8); GRANT SELECT ON readings TO plumb;" +
          rowsSql(1, 50),
        "plumb",
      );
      Deno.env.set("PLUMB_TEST_PG_LIVE", cluster.url);
      await withFolder(async (dir) => {
        const path = join(dir, "doc.md");
        await Deno.writeTextFile(path, DOC("database: { url_from: PLUMB_TEST_PG_LIVE }"));
        const ws = new LiveWorkspace({
          path,
          registry,
          workerUrl: WORKER,
          send: () => {},
          recheckMs: 150,
        });
        try {
          await ws.request();
          const n = () => (ws.resultOf("f") as { n?: number } | null)?.n;
          equal(n(), 50);
          await cluster.psql(rowsSql(51, 80), "plumb");
          const until = Date.now() + 20_000;
          while (n() !== 80 && Date.now() < until) {
            await new Promise((r) => setTimeout(r, 100));
            await ws.idle();
          }
          equal(n(), 80, "the fit follows the rows added");
        } finally {
          ws.close();
        }
      });
    } finally {
      Deno.env.delete("PLUMB_TEST_PG_LIVE");
      await cluster.stop();
    }
  },
});

Deno.test({
  name:
    "DuckDB: the fingerprint keys the table (the same answer computes nothing again); a query the engine refuses fails at planning, on its line",
  sanitizeResources: false,
  sanitizeOps: false,
  fn: async () => {
    await withFolder(async (dir) => {
      await makeDuckdb(join(dir, "plant.duckdb"), [
        "CREATE TABLE readings (x DOUBLE, y DOUBLE)",
        "INSERT INTO readings SELECT i, 2 + 3 * i + sin(i) FROM range(1, 41) AS r(i)",
      ]);
      const s = new Session({ registry, workerUrl: WORKER, dir });
      try {
        const doc = DOC("database: plant.duckdb") +
          fence("table", "bad", "database: plant.duckdb\nquery: SELECT * FROM nosuch") +
          fence("fit", "g", "on: bad\nmodel: y = a + b*x");
        const first = await s.run(doc);
        deepEqual(first.ran.toSorted(), ["f", "t"]);
        equal((resultOf(first, "f").result as { n: number }).n, 40);
        const bad = resultOf(first, "bad");
        equal(bad.state, "failed");
        match(bad.error!.message, /nosuch/);
        // The heading, two cells of four lines and blank lines: the fence is line 13, its query line 15.
        equal(bad.error!.line, 15);
        equal(resultOf(first, "g").state, "held");
        equal((await s.run(doc)).ran.length, 0);
        equal(await s.recheckStamps(), false);
        ok(s.stamps.count >= 1);
      } finally {
        s.close();
      }
    });
  },
});

Deno.test({
  name: "DuckDB: the fingerprint asked at planning runs under the document's query_time_limit",
  sanitizeResources: false,
  sanitizeOps: false,
  fn: async () => {
    await withFolder(async (dir) => {
      // A view whose every full read takes far longer than the limit: 30,000 × 30,000 rows.
      await makeDuckdb(join(dir, "slow.duckdb"), [
        "CREATE VIEW slow AS SELECT a.range AS x, b.range AS y FROM range(30000) a, range(30000) b",
      ]);
      const s = new Session({ registry, workerUrl: WORKER, dir });
      try {
        const doc = "---\nquery_time_limit: 0.3\n---\n\n" +
          fence("table", "t", "database: slow.duckdb\nquery: SELECT x, y FROM slow");
        const t0 = performance.now();
        const r = await s.run(doc);
        const t = resultOf(r, "t");
        equal(t.state, "failed");
        match(t.error!.message, /ran longer than the time limit/);
        ok(performance.now() - t0 < 20_000, "stopped, not run to its end");
      } finally {
        s.close();
      }
    });
  },
});

Deno.test({
  name:
    "DuckDB: a program appending to the file between runs can write (Plumb lets the file go when idle), and the new rows are noticed",
  sanitizeResources: false,
  sanitizeOps: false,
  fn: async () => {
    await withFolder(async (dir) => {
      const file = join(dir, "plant.duckdb");
      await makeDuckdb(file, [
        "CREATE TABLE readings (x DOUBLE, y DOUBLE)",
        "INSERT INTO readings SELECT i, 2 + 3 * i + sin(i) FROM range(1, 31) AS r(i)",
      ]);
      const s = new Session({ registry, workerUrl: WORKER, dir });
      try {
        const doc = DOC("database: plant.duckdb");
        equal((resultOf(await s.run(doc), "f").result as { n: number }).n, 30);
        // The logger's append: it needs the file's write lock, which Plumb lets go when idle.
        await new Promise((r) => setTimeout(r, 1200));
        await makeDuckdb(file, [
          "INSERT INTO readings SELECT i, 2 + 3 * i + sin(i) FROM range(31, 41) AS r(i)",
        ]);
        equal(await s.recheckStamps(), true);
        const after = await s.run(doc);
        deepEqual(after.ran.toSorted(), ["f", "t"]);
        equal((resultOf(after, "f").result as { n: number }).n, 40);
      } finally {
        s.close();
      }
    });
  },
});

Deno.test({
  name: "DuckDB: a file another program keeps open for writing is said in plain words on the table",
  sanitizeResources: false,
  sanitizeOps: false,
  fn: async () => {
    await withFolder(async (dir) => {
      const file = join(dir, "plant.duckdb");
      await makeDuckdb(file, ["CREATE TABLE readings AS SELECT 1.0 AS x, 2.0 AS y"]);
      const writer = await DuckDBInstance.create(file);
      const s = new Session({ registry, workerUrl: WORKER, dir });
      try {
        const t = resultOf(await s.run(DOC("database: plant.duckdb")), "t");
        equal(t.state, "failed");
        match(t.error!.message, /held by another program that is writing to it/);
      } finally {
        s.close();
        writer.closeSync();
      }
    });
  },
});
