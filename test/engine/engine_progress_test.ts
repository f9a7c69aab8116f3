/**
 * A long DuckDB statement's progress and time limit, asked of kernel/engine
 * directly (EngineClient, the engine in its own process) and through a
 * session (the cell's progress report shows the statement's; the document's
 * `query_time_limit` reaches the engine through the compute worker).
 *
 * The statements' work grows with each row (a list of up to 299 numbers
 * summed), so DuckDB's progress, counted in rows scanned, moves steadily.
 */
import { deepEqual, equal, match, ok } from "node:assert/strict";
import { join } from "node:path";
import { registry } from "../../cells/mod.ts";
import { EngineClient } from "../../kernel/engine/mod.ts";
import type { DatabaseRef, EngineProgress } from "../../kernel/engine/mod.ts";
import { parseDocument, readSettings } from "../../kernel/document/mod.ts";
import { Session } from "../../kernel/session/session.ts";
import type { SessionEvent } from "../../kernel/session/types.ts";
import { engineProgressReport } from "../../kernel/worker/client.ts";
import { makeDuckdb } from "./_engine_testing.ts";

const WORKER = new URL("../../cells/worker.ts", import.meta.url);
const ROWS = 3_000_000;
const DB: DatabaseRef = { engine: "duckdb", file: "long.duckdb" };
/** About a second and a half here (two cores); DuckDB reports progress as it scans. */
const LONG = "SELECT sum(list_sum(range(y % 300))) AS s FROM t";
/** Ten times the work of LONG: far past the limits the tests set. */
const LONGER = "SELECT sum(list_sum(range(y % 3000))) AS s FROM t";

const fence = (kind: string, name: string, body: string) =>
  "```" + `${kind} ${name}\n${body}\n` + "```\n\n";

async function withLong(body: (dir: string) => Promise<void>): Promise<void> {
  const dir = await Deno.makeTempDir({ prefix: "plumb-progress-" });
  try {
    await makeDuckdb(join(dir, "long.duckdb"), [
      `CREATE TABLE t AS SELECT i AS x, (i * 7919) % 1000003 AS y FROM range(${ROWS}) r(i)`,
    ]);
    await body(dir);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

/** LONG's answer by exact arithmetic: Σ over rows of m(m−1)/2 with m = y mod 300 (< 2^53). */
function longAnswer(): number {
  let s = 0;
  for (let i = 0; i < ROWS; i++) {
    const m = ((i * 7919) % 1000003) % 300;
    s += m * (m - 1) / 2;
  }
  return s;
}

/** Shares reported lie in [0, 1] and never fall; there are at least two and they rise. */
function assertRising(seen: EngineProgress[]): void {
  const shares = seen.map((p) => p.fraction).filter((f): f is number => f !== undefined);
  ok(shares.length >= 2, `at least two shares reported: ${JSON.stringify(seen)}`);
  for (const f of shares) ok(f >= 0 && f <= 1, `share ${f} in [0, 1]`);
  for (let i = 1; i < shares.length; i++) ok(shares[i] >= shares[i - 1], `${shares} never fall`);
  ok(shares.at(-1)! > shares[0], `${shares} rise`);
}

Deno.test({
  name: "EngineClient on DuckDB: a long statement reports rising progress; a quick one none",
  sanitizeResources: false,
  sanitizeOps: false,
  fn: async () => {
    await withLong(async (dir) => {
      const client = new EngineClient(dir);
      try {
        const seen: EngineProgress[] = [];
        const a = await client.rows(DB, LONG, 1, { progress: (p) => seen.push(p) });
        ok(a.ok, JSON.stringify(a));
        // Exact arithmetic (integers below 2^53): the answer is untouched by the watching.
        equal(a.value.columns[0].values[0], longAnswer());
        assertRising(seen);

        // A streamed statement says its rows read as well, rising to at most the rows there are.
        const streamed: EngineProgress[] = [];
        const r = await client.rfactor(
          DB,
          "SELECT CAST(y AS DOUBLE) AS y, CAST(list_sum(range(y % 100 + 1)) AS DOUBLE) AS s FROM t",
          { progress: (p) => streamed.push(p) },
        );
        ok(r.ok, JSON.stringify(r));
        equal(r.value.rows, ROWS);
        equal(r.value.skipped, 0);
        const rows = streamed.map((p) => p.rows).filter((n): n is number => n !== undefined);
        ok(rows.length >= 1, `rows read reported: ${JSON.stringify(streamed)}`);
        for (let i = 1; i < rows.length; i++) ok(rows[i] > rows[i - 1]);
        ok(rows.every((n) => n > 0 && n <= ROWS));

        const quick: EngineProgress[] = [];
        const q = await client.rows(DB, "SELECT count(*) AS n FROM t", 1, {
          progress: (p) => quick.push(p),
        });
        ok(q.ok);
        equal(q.value.columns[0].values[0], ROWS);
        deepEqual(quick, [], "a statement under a quarter of a second reports nothing");
      } finally {
        client.close();
      }
    });
  },
});

Deno.test({
  name:
    "EngineClient on DuckDB: a statement past its time limit is stopped with a sentence naming the limit and the setting; the engine answers on",
  sanitizeResources: false,
  sanitizeOps: false,
  fn: async () => {
    await withLong(async (dir) => {
      const client = new EngineClient(dir);
      try {
        const t0 = performance.now();
        const a = await client.rows(DB, LONGER, 1, { timeLimit: 0.5 });
        const ms = performance.now() - t0;
        ok(!a.ok);
        equal(a.why, "query");
        equal(
          a.message,
          "The statement ran longer than the time limit of 0.5 s and was stopped (set query_time_limit in the front matter to raise it, or to none)",
        );
        // Stopped near the limit, not at the end of LONGER's work (about fifteen seconds here).
        ok(ms < 5000, `stopped after ${Math.round(ms)} ms`);
        // A streamed statement too, stopped between its blocks or inside one.
        const streamed = await client.rfactor(
          DB,
          "SELECT CAST(list_sum(range(y % 3000)) AS DOUBLE) AS s FROM t",
          { timeLimit: 0.3 },
        );
        ok(!streamed.ok);
        match(streamed.message, /^The statement ran longer than the time limit of 0\.3 s/);

        // The older form (a signal alone) still cancels; no limit (0) lets a statement finish.
        const stop = new AbortController();
        const c = client.rows(DB, LONGER, 1, stop.signal);
        setTimeout(() => stop.abort(), 300);
        equal((await c).ok ? "ok" : (await c as { why: string }).why, "cancelled");
        const free = await client.rows(DB, LONG, 1, { timeLimit: 0 });
        ok(free.ok, JSON.stringify(free));
        equal(free.value.columns[0].values[0], longAnswer());
      } finally {
        client.close();
      }
    });
  },
});

Deno.test("readSettings() reads query_time_limit: seconds, a unit, none; refuses the rest at its place", () => {
  const read = (v: string) => readSettings(parseDocument(`---\nquery_time_limit: ${v}\n---\n`));
  equal(readSettings(parseDocument("# x\n")).settings.queryTimeLimit, undefined, "absent: default");
  equal(read("90").settings.queryTimeLimit, 90);
  equal(read("0.5").settings.queryTimeLimit, 0.5);
  equal(read("90 s").settings.queryTimeLimit, 90);
  equal(read("30 min").settings.queryTimeLimit, 1800);
  equal(read("1.5 h").settings.queryTimeLimit, 5400);
  equal(read("none").settings.queryTimeLimit, 0);
  equal(read("0").settings.queryTimeLimit, 0);
  const bad = read("soon");
  equal(bad.settings.queryTimeLimit, undefined, "a bad value keeps the default");
  equal(
    bad.errors[0].message,
    'Setting "query_time_limit" must be seconds (a number, or text such as 90 s, 30 min, 2 h), or none: got "soon"',
  );
  equal(bad.errors[0].pos.line, 2);
  equal(
    read("-3").errors[0].message,
    'Setting "query_time_limit" must be seconds (a number, or text such as 90 s, 30 min, 2 h), or none: got -3',
  );
  equal(
    read("1000000").errors[0].message,
    'Setting "query_time_limit" must be at most 604,800 seconds (a week): got 1000000; for no limit write none',
  );
});

Deno.test("engineProgressReport() gives the engine's share with a note, or the rows read with the run's last share", () => {
  deepEqual(engineProgressReport({ fraction: 0.4 }, undefined), {
    fraction: 0.4,
    note: "the database: 40%",
  });
  deepEqual(engineProgressReport({ fraction: 0.999, rows: 1234567 }, 0.2), {
    fraction: 0.999,
    note: "the database: 99% · 1,234,567 rows read",
  });
  // No share from the engine: the bar stays where the run left it (none yet: at 0).
  deepEqual(engineProgressReport({ rows: 50000 }, 0.25), {
    fraction: 0.25,
    note: "the database: 50,000 rows read",
  });
  equal(engineProgressReport({ rows: 50000 }, undefined).fraction, 0);
});

Deno.test({
  name:
    "a session: a table's long statement shows as the cell's progress; query_time_limit stops one past it, on the query",
  sanitizeResources: false,
  sanitizeOps: false,
  fn: async () => {
    await withLong(async (dir) => {
      const events: SessionEvent[] = [];
      const s = new Session({
        registry,
        workerUrl: WORKER,
        dir,
        onEvent: (e) => events.push(e),
      });
      try {
        const doc = "# Long\n\n" + fence("table", "sums", `database: long.duckdb\nquery: ${LONG}`);
        const r = await s.run(doc);
        const cell = r.cells.find((c) => c.name === "sums")!;
        equal(cell.state, "current", JSON.stringify(cell.error));
        const shown = events.filter((e) => e.name === "sums" && e.note !== undefined);
        ok(shown.length >= 2, `progress events: ${JSON.stringify(events)}`);
        for (const e of shown) {
          match(e.note!, /^the database: \d+%$/);
          equal(Number(/(\d+)%/.exec(e.note!)![1]), Math.floor(100 * e.fraction!));
        }
        ok(shown.at(-1)!.fraction! > shown[0].fraction!);

        const limited = "---\nquery_time_limit: 0.5\n---\n\n# Long\n\n" +
          fence("table", "sums", `database: long.duckdb\nquery: ${LONG}`);
        const l = await s.run(limited);
        const failed = l.cells.find((c) => c.name === "sums")!;
        equal(failed.state, "failed");
        equal(
          failed.error?.message,
          "The statement ran longer than the time limit of 0.5 s and was stopped (set query_time_limit in the front matter to raise it, or to none)",
        );
        equal(failed.error?.line, 9, "at the query (line 9)");
      } finally {
        s.close();
      }
    });
  },
});
