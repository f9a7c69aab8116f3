/**
 * kernel/engine against PostgreSQL 15 (a throwaway cluster on loopback): a
 * statement past its time limit stopped in the server with the sentence
 * naming the limit and the setting, and a streamed statement's progress as
 * rows read through the cursor (a share only against a count the caller
 * gives; PostgreSQL reports none of its own).
 */
import { equal, match, ok } from "node:assert/strict";
import { EngineClient } from "../../kernel/engine/mod.ts";
import type { DatabaseRef, EngineProgress } from "../../kernel/engine/mod.ts";
import { startCluster } from "./_cluster.ts";
import { withoutPostgres } from "./_engine_testing.ts";

const ignore = withoutPostgres("engine time limit postgres");
const PG: DatabaseRef = { engine: "postgres", urlFrom: "PLUMB_ENGINE_PG_LIMIT" };
const ROWS = 600_000;

Deno.test({
  name: "kernel/engine on PostgreSQL 15: time limit and progress",
  ignore,
  sanitizeResources: false,
  sanitizeOps: false,
  fn: async (t) => {
    const cluster = await startCluster(0);
    const dir = await Deno.makeTempDir({ prefix: "plumb-engine-pg-limit-" });
    const client = new EngineClient(dir);
    Deno.env.set("PLUMB_ENGINE_PG_LIMIT", cluster.url);
    const active = async () =>
      (await cluster.psql(
        "SELECT count(*) FROM pg_stat_activity WHERE application_name = 'plumb' AND state = 'active'",
      )).trim();
    try {
      await t.step(
        "a statement past its limit is stopped in the server, in a sentence",
        async () => {
          const t0 = performance.now();
          const a = await client.rows(
            PG,
            "SELECT count(*) AS n FROM generate_series(1, 100000) a, generate_series(1, 100000) b",
            1,
            { timeLimit: 1 },
          );
          const ms = performance.now() - t0;
          ok(!a.ok);
          equal(a.why, "query");
          equal(
            a.message,
            "The statement ran longer than the time limit of 1 s and was stopped (set query_time_limit in the front matter to raise it, or to none)",
          );
          ok(ms < 6000, `stopped after ${Math.round(ms)} ms`);
          equal(await active(), "0", "no statement of Plumb's still runs in the server");
          // The read-only transaction ended: the connection answers on, under no limit.
          const next = await client.rows(PG, "SELECT 1 + 1 AS two", 1, { timeLimit: 0 });
          ok(next.ok, JSON.stringify(next));
          equal(next.value.columns[0].values[0], 2);
        },
      );

      await t.step(
        "a streamed statement reports rows read, and their share of a known count",
        async () => {
          const sql =
            `SELECT CAST(i AS float8) AS x, sin(i) AS y FROM generate_series(1, ${ROWS}) AS i`;
          const seen: EngineProgress[] = [];
          const r = await client.rfactor(PG, sql, {
            progress: (p) => seen.push(p),
            expectRows: ROWS,
          });
          ok(r.ok, JSON.stringify(r));
          equal(r.value.rows, ROWS);
          ok(seen.length >= 1, `progress reported: ${JSON.stringify(seen)}`);
          for (let i = 0; i < seen.length; i++) {
            const p = seen[i];
            ok(p.rows !== undefined && p.rows > 0 && p.rows <= ROWS, JSON.stringify(p));
            // Exact arithmetic: the share is the rows read over the count given.
            equal(p.fraction, p.rows! / ROWS);
            if (i > 0) ok(p.rows! > seen[i - 1].rows!);
          }
          // Without a count, rows only: PostgreSQL gives no share of its own.
          const bare: EngineProgress[] = [];
          const b = await client.rfactor(PG, sql, { progress: (p) => bare.push(p) });
          ok(b.ok);
          ok(bare.length >= 1 && bare.every((p) => p.fraction === undefined && p.rows! > 0));
        },
      );

      await t.step(
        "a limit counts from the statement's start: a streamed one is stopped too",
        async () => {
          const a = await client.rfactor(
            PG,
            "SELECT CAST(a AS float8) AS x FROM generate_series(1, 5000) a, generate_series(1, 20000) b",
            { timeLimit: 0.5 },
          );
          ok(!a.ok);
          match(
            a.message,
            /^The statement ran longer than the time limit of 0\.5 s and was stopped/,
          );
          equal(await active(), "0");
        },
      );
    } finally {
      client.close();
      await cluster.stop();
      await Deno.remove(dir, { recursive: true });
    }
  },
});
