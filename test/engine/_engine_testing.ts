/**
 * Helpers of the engine suites: a DuckDB file made with DuckDB's own
 * library, the skip-or-fail rule for PostgreSQL, and fits of one document
 * read back by name.
 *
 * @module
 */
import { DuckDBInstance } from "@duckdb/node-api";
import { printOnce } from "../_once.ts";
import { postgresInstalled } from "./_cluster.ts";

/**
 * Creates a DuckDB file and runs `statements` in it.
 *
 * @param path The file.
 * @param statements SQL run in order.
 */
export async function makeDuckdb(path: string, statements: string[]): Promise<void> {
  const instance = await DuckDBInstance.create(path);
  const con = await instance.connect();
  for (const s of statements) await con.run(s);
  con.closeSync();
  instance.closeSync();
}

/**
 * Whether the PostgreSQL suites are ignored: PostgreSQL 15 not installed
 * here. With PLUMB_REQUIRE_POSTGRES=1 (CI) they fail instead.
 *
 * @param suite The suite, for the message.
 * @returns `ignore` for Deno.test.
 */
export function withoutPostgres(suite: string): boolean {
  if (postgresInstalled()) return false;
  if (Deno.env.get("PLUMB_REQUIRE_POSTGRES") === "1") {
    throw new Error(
      `PostgreSQL 15 is not installed and PLUMB_REQUIRE_POSTGRES=1: suite "${suite}" cannot run`,
    );
  }
  printOnce(
    "postgres",
    "PostgreSQL suites skipped: install Debian's postgresql package (15) to run them",
  );
  return true;
}

/** One fit's RUN-JSON result, as the tests read it. */
export interface FitJson {
  in_engine: boolean;
  in_engine_detail?: { route: string; kappa: number; rows_left_out: number };
  n: number;
  rss: number;
  r2: number;
  aic: number;
  aicc: number;
  bic: number;
  sigma: number;
  parameters: { name: string; estimate: number; std_error: number }[];
}

/** The named cell's result from RUN-JSON, failing with its error when it has none. */
export function resultOf<T>(json: unknown, name: string): T {
  const cells = (json as { cells: { name: string; result: unknown; error: unknown }[] }).cells;
  const c = cells.find((c) => c.name === name);
  if (c === undefined) throw new Error(`no cell ${name}`);
  if (c.result === null) throw new Error(`${name}: ${JSON.stringify(c.error)}`);
  return c.result as T;
}

/**
 * The largest relative difference between two fits' estimates, standard
 * errors, RSS, R², AIC, AICc and BIC.
 */
export function fitDifference(a: FitJson, b: FitJson): number {
  const rel = (x: number, y: number) => Math.abs(x - y) / Math.max(Math.abs(y), 1e-300);
  let worst = 0;
  a.parameters.forEach((p, i) => {
    worst = Math.max(worst, rel(p.estimate, b.parameters[i].estimate));
    worst = Math.max(worst, rel(p.std_error, b.parameters[i].std_error));
  });
  for (const k of ["rss", "r2", "aic", "aicc", "bic", "sigma"] as const) {
    worst = Math.max(worst, rel(a[k], b[k]));
  }
  return worst;
}
