/**
 * Where an in-engine fit's time goes on the sharded PostgreSQL engine
 * (test/engine/_shards.ts): each pass's statement timed on the coordinator,
 * the same statement on one PostgreSQL holding every row (the scan without
 * the shards), and the plan of each on the coordinator (whether its sums are
 * computed on the shards: "Aggregate on", or the rows travel: "Partial
 * Aggregate" or a Foreign Scan whose remote SQL has no sum). Also the
 * table's fingerprint, which Plumb asks for before the fit.
 *
 * ```
 * deno run -A test/bench/engine_passes.ts [--rows=1000000] [--runs=3] [--explain]
 *   [--keep=/var/tmp/plumb-engine-passes] [--port=55680]
 * ```
 *
 * The clusters (a coordinator, two shards and a single server) are kept in
 * `--keep` and reused; the model is test/bench/engine.ts's, 5 predictors.
 *
 * @module
 */
import { join } from "node:path";
import { parseModel } from "../../kernel/expr/mod.ts";
import type { SqlColumns } from "../../kernel/expr/to_sql.ts";
import { fitInEngine } from "../../cells/fit/_in_engine.ts";
import { PgTestEngine } from "../../cells/fit/_in_engine_testing.ts";
import { fingerprintSql } from "../../cells/table/_read_database.ts";
import { type Cluster, startCluster } from "../engine/_cluster.ts";
import { queryRows, startShardedEngine } from "../engine/_shards.ts";
import { readingsSelect } from "../engine/_readings.ts";

const arg = (name: string, fallback: string) =>
  Deno.args.find((a) => a.startsWith(`--${name}=`))?.slice(name.length + 3) ?? fallback;
const ROWS = Number(arg("rows", "1000000"));
const RUNS = Number(arg("runs", "3"));
const KEEP = arg("keep", "/var/tmp/plumb-engine-passes");
const PORT = Number(arg("port", "55680"));
const EXPLAIN = Deno.args.includes("--explain");
const DUMP = arg("dump", "");
const SINGLE = !Deno.args.includes("--no-single");
const SEED = 18;

const NAMES = ["part", "x1", "x2", "x3", "x4", "x5", "y"];
const QUERY = `SELECT ${NAMES.join(", ")} FROM readings`;
const MODEL = "y = b0 + b1*x1 + b2*x2 + b3*x3 + b4*x4 + b5*x5";

/** The single server: one table `readings` of every row, kept in `dir`. */
async function single(dir: string): Promise<Cluster> {
  await Deno.mkdir(dir, { recursive: true });
  const c = await startCluster(PORT + 3, { dir });
  const have = await c.psql("SELECT count(*) FROM readings", "plumb").catch(() => "");
  if (Number(have) !== ROWS) {
    await c.psql(
      `DROP TABLE IF EXISTS readings;\n` +
        `CREATE TABLE readings AS ${
          readingsSelect("postgres", { lo: 1, hi: ROWS, rows: ROWS }, SEED)
        };\n` +
        `GRANT SELECT ON readings TO plumb;\nVACUUM (FREEZE, ANALYZE) readings;\nCHECKPOINT;\n`,
      "plumb",
    );
  }
  return c;
}

/** A fit's statements and their times on `url`. */
async function passes(url: string): Promise<{ name: string; ms: number; sql: string }[]> {
  const columns: SqlColumns = new Map(NAMES.map((c) => [c, "number" as const]));
  const got = await fitInEngine(
    {
      name: "bench",
      model: parseModel(MODEL, NAMES),
      query: QUERY,
      columns,
      partitionBy: "part",
      confidence: 0.95,
      countVariance: true,
      warn: () => {},
    },
    new PgTestEngine(url),
    { engine: "postgres", urlFrom: "PLUMB_BENCH" },
  );
  if (!got.ok) throw new Error(got.why);
  return got.fit.passes;
}

async function timed(url: string, sql: string): Promise<number> {
  const t0 = performance.now();
  await queryRows(url, sql);
  return performance.now() - t0;
}

/** Where the plan computes the sums: on the shards, or on the coordinator from rows. */
function where(plan: string): string {
  const pushed = (plan.match(/Relations: Aggregate on/g) ?? []).length;
  const partial = plan.includes("Partial Aggregate");
  const rows = (plan.match(/Remote SQL: SELECT (?!.*sum\()/g) ?? []).length;
  return `pushed ${pushed}/2${partial ? ", partial aggregate on the coordinator" : ""}${
    rows > 0 ? `, ${rows} scans fetch rows` : ""
  }`;
}

const shards = await startShardedEngine({
  basePort: PORT,
  rows: ROWS,
  seed: SEED,
  keepIn: join(KEEP, `shards-${ROWS}`),
});
const one = await single(join(KEEP, `single-${ROWS}`));
try {
  const fp = fingerprintSql(
    "postgres",
    QUERY,
    NAMES.map((name) => ({ name, type: "number" as const })),
    "part",
  );
  console.log(`load average ${(await Deno.readTextFile("/proc/loadavg")).split(" ")[0]}`);
  for (let run = 0; run < RUNS; run++) {
    const list = await passes(shards.url);
    const fpShards = await timed(shards.url, fp);
    const fpSingle = SINGLE ? await timed(one.url, fp) : NaN;
    const lines = [
      `run ${run + 1}: fingerprint ${fpShards.toFixed(0)} ms (single ${fpSingle.toFixed(0)} ms)`,
    ];
    for (const p of list) {
      const alone = SINGLE ? await timed(one.url, p.sql) : NaN;
      lines.push(`  ${p.name}: ${p.ms.toFixed(0)} ms on the shards, ${alone.toFixed(0)} ms single`);
    }
    if (DUMP !== "" && run === 0) {
      await Deno.mkdir(DUMP, { recursive: true });
      for (const [i, p] of [{ sql: fp }, ...list].entries()) {
        await Deno.writeTextFile(join(DUMP, `${i}.sql`), p.sql + ";\n");
      }
    }
    const total = list.reduce((s, p) => s + p.ms, 0);
    lines.push(`  passes in all: ${total.toFixed(0)} ms`);
    console.log(lines.join("\n"));
    if (EXPLAIN && run === 0) {
      for (const p of [{ name: "fingerprint", sql: fp, ms: 0 }, ...list]) {
        const plan = await shards.explain(`DECLARE plumb_c NO SCROLL CURSOR FOR ${p.sql}`);
        console.log(`--- ${p.name}: ${where(plan)}\n${plan}\n`);
      }
    }
  }
  console.log(`load average ${(await Deno.readTextFile("/proc/loadavg")).split(" ")[0]}`);
} finally {
  await shards.stop();
  await one.stop();
}
