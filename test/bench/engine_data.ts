/**
 * The data of the in-engine bench (issue 18): 10,000,000 invented rows of
 * five predictors and a response (test/engine/_readings.ts, the formula
 * every engine computes to the same bits), made once and kept in the
 * bench's cache folder:
 *
 * - a DuckDB file, `engine-readings-<rows>-<seed>.duckdb`, table `readings`;
 * - the sharded PostgreSQL engine's three clusters (test/engine/_shards.ts:
 *   a coordinator and two shards, half the rows on each), kept in
 *   `engine-shards-<rows>-<seed>/`, stopped after each bench and started
 *   again over the kept data folders, so a run does not make the rows again.
 *
 * PostgreSQL's server runs as the `postgres` user, which must reach its
 * data folders: when the cache folder sits under a home it cannot enter
 * (root's is mode 700), the clusters are kept in /var/tmp instead.
 *
 * `deno run -A test/bench/engine_data.ts` makes (or finds) both and prints
 * the times, the sizes and the plan of the grouped sums.
 *
 * @module
 */
import { join } from "node:path";
import { DuckDBInstance } from "@duckdb/node-api";
import { makeReadingsDuckdb } from "../engine/_readings.ts";
import { postgresInstalled } from "../engine/_cluster.ts";
import { queryRows, startShardedEngine } from "../engine/_shards.ts";

/** Rows of the bench data. */
export const ENGINE_ROWS = 10_000_000;

/** The seed of the bench data. */
export const ENGINE_SEED = 18;

/** The coordinator's port in the bench (the shards take the next two). */
const BENCH_PORT = 55640;

/** The folder the bench data is kept in: the user's cache folder, else a temporary one. */
async function cacheFolder(): Promise<string> {
  const home = Deno.env.get("HOME");
  const base = Deno.env.get("XDG_CACHE_HOME") ?? (home ? join(home, ".cache") : undefined);
  const dir = base === undefined ? await Deno.makeTempDir() : join(base, "plumb-bench");
  await Deno.mkdir(dir, { recursive: true });
  return dir;
}

/** Rows in `readings` of a DuckDB file, or null when it cannot be read. */
async function duckdbRows(path: string): Promise<number | null> {
  try {
    const instance = await DuckDBInstance.create(path, { access_mode: "READ_ONLY" });
    try {
      const con = await instance.connect();
      const rows = (await con.runAndReadAll("SELECT count(*) FROM readings")).getRows();
      con.closeSync();
      return Number(rows[0][0]);
    } finally {
      instance.closeSync();
    }
  } catch {
    return null;
  }
}

/**
 * The bench's DuckDB file, made when missing or incomplete (under a
 * temporary name, renamed when whole).
 *
 * @returns The file's path.
 */
export async function ensureDuckdb10M(): Promise<string> {
  const path = join(
    await cacheFolder(),
    `engine-readings-${ENGINE_ROWS}-${ENGINE_SEED}.duckdb`,
  );
  if (await duckdbRows(path) === ENGINE_ROWS) return path;
  await Deno.remove(path).catch(() => {});
  const partial = `${path}.partial-${Deno.pid}`;
  try {
    const t0 = performance.now();
    await makeReadingsDuckdb(partial, ENGINE_ROWS, ENGINE_SEED);
    await Deno.rename(partial, path);
    console.error(
      `engine data: ${ENGINE_ROWS} rows into DuckDB in ${seconds(t0)} s, ${await megabytes(
        path,
      )} MB`,
    );
    return path;
  } catch (e) {
    await Deno.remove(partial).catch(() => {});
    await Deno.remove(`${partial}.wal`).catch(() => {});
    throw e;
  }
}

/** Whether the `postgres` user can enter `dir` (every folder above it included). */
async function postgresReaches(dir: string): Promise<boolean> {
  const out = await new Deno.Command("runuser", {
    args: ["-u", "postgres", "--", "test", "-x", dir],
    stdout: "null",
    stderr: "null",
  }).output().catch(() => null);
  return out?.success ?? false;
}

/**
 * The bench's sharded PostgreSQL engine, started over the kept clusters
 * (made first when missing or made from other rows).
 *
 * @returns The coordinator's URL (a role that may only SELECT) and how to stop the three servers.
 * @throws {Error} When PostgreSQL 15 is not installed or a server does not start.
 */
export async function ensureShards10M(): Promise<{ url: string; stop: () => Promise<void> }> {
  if (!postgresInstalled()) {
    throw new Error(
      "The sharded engine needs PostgreSQL 15 (Debian's postgresql package): it is not installed",
    );
  }
  const cache = await cacheFolder();
  const name = `engine-shards-${ENGINE_ROWS}-${ENGINE_SEED}`;
  const keepIn = await postgresReaches(cache) ? join(cache, name) : join("/var/tmp", name);
  const t0 = performance.now();
  const engine = await startShardedEngine({
    basePort: BENCH_PORT,
    rows: ENGINE_ROWS,
    seed: ENGINE_SEED,
    keepIn,
  });
  if (engine.loadMs !== null) {
    console.error(
      `engine data: ${ENGINE_ROWS} rows made on two PostgreSQL shards in ` +
        `${(engine.loadMs / 1000).toFixed(1)} s (${seconds(t0)} s with the servers' start), ` +
        `${await megabytes(...engine.dirs)} MB in ${keepIn}`,
    );
  }
  return { url: engine.url, stop: engine.stop };
}

function seconds(t0: number): string {
  return ((performance.now() - t0) / 1000).toFixed(1);
}

/** Size on disk of files and folders, in MB. */
async function megabytes(...paths: string[]): Promise<string> {
  const out = await new Deno.Command("du", { args: ["-sbc", ...paths], stdout: "piped" }).output();
  const total = new TextDecoder().decode(out.stdout).trim().split("\n").at(-1) ?? "0";
  return (Number(total.split(/\s/)[0]) / 1e6).toFixed(0);
}

if (import.meta.main) {
  let t0 = performance.now();
  const path = await ensureDuckdb10M();
  console.log(`${path}: ${await megabytes(path)} MB, ready in ${seconds(t0)} s`);
  t0 = performance.now();
  const shards = await ensureShards10M();
  console.log(`sharded engine ready in ${seconds(t0)} s`);
  try {
    const sums =
      "SELECT part, count(*), sum(x1), sum(x1*x2), sum(x5*y) FROM readings GROUP BY part";
    const plan = await queryRows(shards.url, `EXPLAIN (VERBOSE) ${sums}`);
    console.log(plan.map((r) => r[0]).join("\n"));
    t0 = performance.now();
    await queryRows(shards.url, sums);
    console.log(`the grouped sums over ${ENGINE_ROWS} rows took ${seconds(t0)} s`);
  } finally {
    await shards.stop();
  }
}
