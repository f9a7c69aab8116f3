/**
 * kernel/engine against a DuckDB file, asked directly (EngineClient, and the
 * engine process past Plumb's query check): typed and capped rows, the
 * streamed R factor against the same rows in memory, the folder rule, the
 * engine's own refusals, and cancelling a long statement.
 */
import { deepEqual, equal, match, ok } from "node:assert/strict";
import { join } from "node:path";
import { EngineClient } from "../../kernel/engine/mod.ts";
import type { DatabaseRef } from "../../kernel/engine/mod.ts";
import { makeDuckdb } from "./_engine_testing.ts";
import { askEngineProcess, gramError } from "./_engine_direct.ts";
import { makeReadingsDuckdb, readingsInMemory } from "./_readings.ts";

const PLANT: DatabaseRef = { engine: "duckdb", file: "plant.duckdb" };
const ROWS = 30_000;
const SEED = 18;

/** A folder with plant.duckdb: `readings` (the shared formula) and `mixed` (every kind of column). */
async function withPlant(body: (dir: string, client: EngineClient) => Promise<void>) {
  const dir = await Deno.makeTempDir({ prefix: "plumb-engine-" });
  const client = new EngineClient(dir);
  try {
    await makeReadingsDuckdb(join(dir, "plant.duckdb"), ROWS, SEED);
    await makeDuckdb(join(dir, "plant.duckdb"), [
      `CREATE TABLE mixed AS SELECT * FROM (VALUES
        (1, 2.5, 10.25::DECIMAL(10,2), 'a', DATE '2024-03-01', true),
        (2, NULL, NULL, NULL, NULL, NULL),
        (3, -1e300, 0.5::DECIMAL(10,2), 'c''s', DATE '2024-03-03', false)
      ) AS m(n, x, d, label, day, flag)`,
      // A missing and an infinite value among rows the R factor reads.
      "CREATE TABLE gaps AS SELECT * FROM (VALUES (1.0, 2.0), (NULL, 1.0), ('Infinity'::DOUBLE, 1.0), (3.0, 5.0)) AS g(a, b)",
    ]);
    await body(dir, client);
  } finally {
    client.close();
    await Deno.remove(dir, { recursive: true });
  }
}

Deno.test("EngineClient.rows on DuckDB: numeric columns as numbers (null NaN), the rest as text, capped at maxRows", async () => {
  await withPlant(async (_dir, client) => {
    const a = await client.rows(PLANT, "SELECT * FROM mixed ORDER BY n", 10);
    ok(a.ok, JSON.stringify(a));
    equal(a.value.rows, 3);
    equal(a.value.more, false);
    const byName = Object.fromEntries(a.value.columns.map((c) => [c.name, c]));
    deepEqual(
      a.value.columns.map((c) => [c.name, c.type]),
      [["n", "number"], ["x", "number"], ["d", "number"], ["label", "text"], ["day", "text"], [
        "flag",
        "text",
      ]],
    );
    deepEqual([...byName.n.values as Float64Array], [1, 2, 3]);
    deepEqual([...byName.x.values as Float64Array], [2.5, NaN, -1e300]);
    deepEqual([...byName.d.values as Float64Array], [10.25, NaN, 0.5]);
    deepEqual(byName.label.values, ["a", null, "c's"]);
    equal((byName.day.values as (string | null)[])[1], null);
    match(String((byName.day.values as (string | null)[])[0]), /^2024-03-01/);

    const capped = await client.rows(PLANT, "SELECT id, x1 FROM readings ORDER BY id", 5000);
    ok(capped.ok);
    equal(capped.value.rows, 5000);
    equal(capped.value.more, true);
    equal(capped.value.columns[0].values.length, 5000);
    const mem = readingsInMemory(ROWS, SEED);
    // The formula's rows are the same doubles in DuckDB and in Deno (exact arithmetic, _readings.ts).
    deepEqual([...capped.value.columns[1].values as Float64Array], [...mem.x[0].subarray(0, 5000)]);

    const exact = await client.rows(PLANT, "SELECT n FROM mixed", 3);
    ok(exact.ok);
    equal(exact.value.more, false, "exactly maxRows rows is not more");
  });
});

Deno.test("EngineClient.rfactor on DuckDB: RᵀR equals XᵀX of the same rows in memory; rows with a null or non-finite value are skipped and counted", async () => {
  await withPlant(async (_dir, client) => {
    const a = await client.rfactor(PLANT, "SELECT 1.0 AS one, x1, x2, x3, x4, x5, y FROM readings");
    ok(a.ok, JSON.stringify(a));
    equal(a.value.k, 7);
    equal(a.value.rows, ROWS);
    equal(a.value.skipped, 0);
    for (let i = 1; i < 7; i++) for (let j = 0; j < i; j++) equal(a.value.r[i * 7 + j], 0);
    const mem = readingsInMemory(ROWS, SEED);
    const cols = [new Float64Array(ROWS).fill(1), ...mem.x, mem.y];
    // Exact arithmetic of QR: RᵀR = XᵀX (Q orthogonal); rounding leaves ~n·ε relative.
    const worst = gramError(a.value.r, 7, cols);
    ok(worst < 1e-10, `largest relative difference of RᵀR from XᵀX: ${worst}`);

    const g = await client.rfactor(PLANT, "SELECT a, b FROM gaps");
    ok(g.ok, JSON.stringify(g));
    equal(g.value.rows, 2);
    equal(g.value.skipped, 2);
    // Rows (1, 2) and (3, 5): XᵀX = [[10, 17], [17, 29]] (exact arithmetic).
    const gram = gramError(g.value.r, 2, [Float64Array.of(1, 3), Float64Array.of(2, 5)]);
    ok(gram < 1e-14, `gaps: ${gram}`);
  });
});

Deno.test("EngineClient refuses a DuckDB file outside the document's folder, says a missing one, and refuses what the check refuses", async () => {
  await withPlant(async (_dir, client) => {
    const out = await client.rows({ engine: "duckdb", file: "../elsewhere.duckdb" }, "SELECT 1", 1);
    ok(!out.ok);
    equal(out.why, "connect");
    equal(out.message, 'The DuckDB file "../elsewhere.duckdb" is outside the document\'s folder');
    const gone = await client.rows({ engine: "duckdb", file: "gone.duckdb" }, "SELECT 1", 1);
    ok(!gone.ok);
    equal(gone.message, 'The DuckDB file "gone.duckdb" does not exist');
    const csv = await client.rows(PLANT, "SELECT * FROM read_csv('/etc/hostname')", 1);
    ok(!csv.ok);
    equal(csv.why, "refused");
    match(csv.message, /^A query must be one SELECT that only reads: read_csv/);
    const bad = await client.rows(PLANT, "SELECT nosuch FROM readings", 1);
    ok(!bad.ok);
    equal(bad.why, "query");
    match(bad.message, /^The database said: .*nosuch/);
  });
});

Deno.test("the DuckDB engine process itself refuses writes, files and settings when asked past Plumb's check", async () => {
  await withPlant(async (dir) => {
    const { answers } = await askEngineProcess(
      ["--allow-ffi"],
      ["duckdb", join(dir, "plant.duckdb")],
      {},
      [
        { id: 1, op: "rows", sql: "INSERT INTO mixed (n) VALUES (4)", maxRows: 1 },
        { id: 2, op: "rows", sql: "SELECT * FROM read_csv('/etc/hostname')", maxRows: 1 },
        { id: 3, op: "rows", sql: "SET enable_external_access = true", maxRows: 1 },
        { id: 4, op: "rows", sql: "ATTACH ':memory:' AS other", maxRows: 1 },
        { id: 5, op: "rows", sql: "SELECT count(*) AS n FROM mixed", maxRows: 1 },
      ],
    );
    equal(answers.length, 5);
    for (const a of answers.slice(0, 4)) equal(a.ok, false, JSON.stringify(a));
    for (const a of answers.slice(0, 3)) equal(a.why, "refused", a.message);
    match(answers[0].message, /read-only/i);
    match(answers[1].message, /disabled|external/i);
    match(answers[2].message, /lock|configuration|cannot/i);
    equal(answers[4].ok, true, "the process answers on");
  });
});

Deno.test("a stopped run cancels its DuckDB statement; the engine answers the next one", async () => {
  await withPlant(async (_dir, client) => {
    const stop = new AbortController();
    // A cross join of 10¹⁸ pairs: it ends only when cancelled.
    const long = client.rows(
      PLANT,
      "SELECT sum(a.range * b.range) AS s FROM range(1000000000) a, range(1000000000) b",
      1,
      stop.signal,
    );
    setTimeout(() => stop.abort(), 300);
    const a = await long;
    ok(!a.ok);
    equal(a.why, "cancelled");
    const next = await client.rows(PLANT, "SELECT count(*) AS n FROM readings", 1);
    ok(next.ok, JSON.stringify(next));
    deepEqual([...next.value.columns[0].values as Float64Array], [ROWS]);

    // Cancelled before it began: answered without running.
    const early = new AbortController();
    early.abort();
    const b = await client.rfactor(PLANT, "SELECT x1 FROM readings", early.signal);
    ok(!b.ok);
    equal(b.why, "cancelled");
  });
});
