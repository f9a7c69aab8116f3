/**
 * Tables from PostgreSQL 15 (a throwaway cluster on loopback, run as the
 * `postgres` user) through `plumb run --json`: an in-engine fit against the
 * in-memory fit of the same rows, the server's read-only rule, and every
 * connection fault said on the cell without the secret.
 */
import { equal, match, ok } from "node:assert/strict";
import { join } from "node:path";
import { plumbRunJson } from "../examples/_plumb_run.ts";
import { freePort, startCluster } from "./_cluster.ts";
import { askEngineProcess } from "./_engine_direct.ts";
import { fitDifference, type FitJson, resultOf, withoutPostgres } from "./_engine_testing.ts";

const ignore = withoutPostgres("postgres");
const PASSWORD = "Tr0ub4dor-7-secret";

/** Invented data (the same formula as the DuckDB suite), made by the server. */
const READINGS = `CREATE TABLE readings AS SELECT
  i AS id, (i % 4) AS part,
  sin(i * 0.37) AS x1, cos(i * 0.11) AS x2, sin(i * 0.023) + 0.5 * cos(i * 0.7) AS x3,
  (i % 17) / 17.0 AS x4, cos(i * 1.3) * 2 AS x5,
  3 + 1.5 * sin(i * 0.37) - 2 * cos(i * 0.11) + 0.7 * (sin(i * 0.023) + 0.5 * cos(i * 0.7))
    + 4 * ((i % 17) / 17.0) - 0.25 * cos(i * 1.3) * 2 + 0.3 * sin(i * 7.77) AS y
  FROM generate_series(1, 20000) AS i;
GRANT SELECT ON readings TO plumb;`;

const fence = (kind: string, name: string, body: string) =>
  "```" + `${kind} ${name}\n${body}\n` + "```\n\n";

async function inFolder(doc: string): Promise<{ json: unknown; all: string }> {
  const dir = await Deno.makeTempDir({ prefix: "plumb-pg-doc-" });
  try {
    await Deno.writeTextFile(join(dir, "doc.md"), doc);
    const r = await plumbRunJson(join(dir, "doc.md"), "--no-history");
    return { json: r.json, all: JSON.stringify(r.json) + r.stderr };
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

Deno.test({
  name:
    "PostgreSQL: an in-engine fit equals the in-memory fit to 1e-9; faults are said on the cell, never the password",
  ignore,
  sanitizeResources: false,
  sanitizeOps: false,
  fn: async () => {
    const cluster = await startCluster(0, { password: PASSWORD });
    const down = freePort();
    try {
      await cluster.psql(READINGS, "plumb");
      Deno.env.set("PLUMB_TEST_PG", cluster.url);
      Deno.env.set("PLUMB_TEST_PG_WRONG", cluster.url.replace(PASSWORD, "not-it"));
      Deno.env.set("PLUMB_TEST_PG_DOWN", cluster.url.replace(`:${cluster.port}/`, `:${down}/`));
      Deno.env.delete("PLUMB_TEST_PG_UNSET");
      const q = "SELECT x1, x2, x3, x4, x5, y FROM readings";
      const model = "y = b0 + b1*x1 + b2*x2 + b3*x3 + b4*x4 + b5*x5";
      const pg = "database: { url_from: PLUMB_TEST_PG }";
      const doc = "# PostgreSQL\n\n" +
        fence("table", "mem", `${pg}\nquery: ${q}`) +
        fence("table", "eng", `${pg}\nquery: ${q}\nkeep_rows: database`) +
        fence("fit", "in-memory", `on: mem\nmodel: ${model}`) +
        fence("fit", "in-engine", `on: eng\nmodel: ${model}`) +
        fence(
          "table",
          "wrong",
          "database: { url_from: PLUMB_TEST_PG_WRONG }\nquery: SELECT 1 AS x",
        ) +
        fence("table", "down", "database: { url_from: PLUMB_TEST_PG_DOWN }\nquery: SELECT 1 AS x") +
        fence(
          "table",
          "unset",
          "database: { url_from: PLUMB_TEST_PG_UNSET }\nquery: SELECT 1 AS x",
        ) +
        fence("table", "unknown", `${pg}\nquery: SELECT * FROM nosuch`);
      const { json, all } = await inFolder(doc);
      const mem = resultOf<FitJson>(json, "in-memory");
      const eng = resultOf<FitJson>(json, "in-engine");
      equal(eng.in_engine, true);
      equal(eng.n, 20000);
      // The same estimator by Householder QR in memory; the criterion is 1e-9 relative.
      const worst = fitDifference(eng, mem);
      ok(worst < 1e-9, `largest relative difference ${worst}`);
      const cells = (json as { cells: { name: string; error: { message: string } | null }[] })
        .cells;
      const said = (n: string) => cells.find((c) => c.name === n)!.error?.message ?? "";
      match(said("wrong"), /refused the login for user "plumb"/);
      match(said("down"), new RegExp(`No database server answers at 127\\.0\\.0\\.1:${down}`));
      match(said("unset"), /The environment variable PLUMB_TEST_PG_UNSET is not set/);
      match(said("unknown"), /relation "nosuch" does not exist/);
      ok(!all.includes(PASSWORD), "the password appears nowhere in the output");
      ok(!all.includes("not-it"), "nor the wrong one");
    } finally {
      await cluster.stop();
    }
  },
});

Deno.test({
  name: "PostgreSQL refuses a write itself: the engine's session is read-only past Plumb's check",
  ignore,
  sanitizeResources: false,
  sanitizeOps: false,
  fn: async () => {
    const cluster = await startCluster(0);
    try {
      await cluster.psql("CREATE SEQUENCE s; GRANT ALL ON SEQUENCE s TO plumb;", "plumb");
      const { answers: [out] } = await askEngineProcess(
        ["--allow-env=PLUMB_TEST_PG_RW", `--allow-net=127.0.0.1:${cluster.port}`],
        ["postgres", "PLUMB_TEST_PG_RW"],
        { PLUMB_TEST_PG_RW: cluster.url },
        // A cursor cannot hold an INSERT; a function that writes is the way past the syntax.
        [{ id: 1, op: "rows", sql: "SELECT nextval('s') AS x", maxRows: 1 }],
      );
      equal(out.ok, false);
      match(out.message, /read-only transaction/);
      equal((await cluster.psql("SELECT last_value FROM s", "plumb")).trim(), "1");
      equal((await cluster.psql("SELECT is_called FROM s", "plumb")).trim(), "f", "never advanced");
    } finally {
      await cluster.stop();
    }
  },
});
