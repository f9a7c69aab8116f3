/**
 * Bench of issue 18: a linear fit of 10,000,000 rows × 5 predictors whose
 * sums the database computes, in DuckDB and on the sharded PostgreSQL
 * engine (test/engine/_shards.ts), through `plumb run` as a user runs it.
 * Figures: wall time, and the peak resident size of Plumb's own processes
 * (the engine processes and the servers excluded: their memory is the
 * database's), at 1,000,000 and 10,000,000 rows, to show it does not grow
 * with the row count.
 *
 * The data are made once and kept (test/bench/engine_data.ts).
 *
 * @module
 */
import { dirname, join } from "node:path";
import { ensureDuckdb10M, ensureShards10M } from "./engine_data.ts";

const MAIN = new URL("../../cells/main.ts", import.meta.url).pathname;
const MODEL = "y = b0 + b1*x1 + b2*x2 + b3*x3 + b4*x4 + b5*x5";

/** One in-engine fit figure. */
export interface EngineFit {
  engine: "duckdb" | "postgres-sharded";
  rows: number;
  wall_s: number;
  /** Peak resident size of Plumb's processes (MB), sampled every 20 ms. */
  plumb_peak_mb: number;
  route: string;
  kappa: number;
}

/** Resident size (kB) and command line of the process tree under `pid`, engines left out. */
async function plumbRss(pid: number): Promise<number> {
  let total = 0;
  const visit = async (p: number) => {
    let cmd = "";
    try {
      cmd = await Deno.readTextFile(`/proc/${p}/cmdline`);
    } catch {
      return;
    }
    if (!cmd.includes("_engine_child") && !cmd.includes("postgres")) {
      const status = await Deno.readTextFile(`/proc/${p}/status`).catch(() => "");
      const rss = /VmRSS:\s+(\d+)/.exec(status);
      if (rss) total += Number(rss[1]);
    }
    const kids = await Deno.readTextFile(`/proc/${p}/task/${p}/children`).catch(() => "");
    for (const k of kids.trim().split(/\s+/).filter(Boolean)) await visit(Number(k));
  };
  await visit(pid);
  return total;
}

async function runFit(
  doc: string,
  env: Record<string, string>,
): Promise<
  {
    wall_s: number;
    peak_mb: number;
    fit: { in_engine_detail: { route: string; kappa: number }; n: number };
  }
> {
  const t0 = performance.now();
  const child = new Deno.Command(Deno.execPath(), {
    args: [
      "run",
      "--allow-read",
      "--allow-env=LOG_TOKENS,LOG_STREAM",
      `--allow-run=${Deno.execPath()}`,
      MAIN,
      "run",
      doc,
      "--json",
      "--no-history",
    ],
    env,
    stdout: "piped",
    stderr: "piped",
  }).spawn();
  let peak = 0;
  let done = false;
  const sampling = (async () => {
    while (!done) {
      peak = Math.max(peak, await plumbRss(child.pid));
      await new Promise((r) => setTimeout(r, 20));
    }
  })();
  const out = await child.output();
  done = true;
  await sampling;
  const wall_s = (performance.now() - t0) / 1000;
  const json = JSON.parse(new TextDecoder().decode(out.stdout));
  const cell = json.cells.find((c: { name: string }) => c.name === "fit");
  if (!cell?.result) {
    throw new Error(`the bench fit failed: ${JSON.stringify(cell?.error ?? json).slice(0, 400)}`);
  }
  return { wall_s, peak_mb: peak / 1024, fit: cell.result };
}

function doc(table: string): string {
  return "# Bench: a fit in the database\n\n```table readings\n" + table +
    "\nkeep_rows: database\n```\n\n```fit fit\non: readings\nmodel: " + MODEL + "\n```\n";
}

/** One engine's figure: both sizes, and how much Plumb's peak grew from one to the other. */
export interface EngineFigure {
  at_1e6: EngineFit;
  at_1e7: EngineFit;
  /** Peak at 10,000,000 rows less the peak at 1,000,000 (MB). */
  peak_growth_mb: number;
  /** The rule: Plumb's memory must not grow with the row count (32 MB for noise). */
  target_peak_growth_mb: number;
}

function figureOf(list: EngineFit[]): EngineFigure {
  const [a, b] = list;
  return {
    at_1e6: a,
    at_1e7: b,
    peak_growth_mb: b.plumb_peak_mb - a.plumb_peak_mb,
    target_peak_growth_mb: 32,
  };
}

/**
 * The in-engine fit figures.
 *
 * @returns DuckDB and sharded PostgreSQL at 1,000,000 and 10,000,000 rows.
 */
export async function engineFigures(): Promise<
  { in_engine_fit_duckdb: EngineFigure; in_engine_fit_sharded_postgres: EngineFigure }
> {
  const figures: EngineFit[] = [];
  const duck = await ensureDuckdb10M();
  const folder = dirname(duck);
  const file = duck.slice(folder.length + 1);
  for (const rows of [1_000_000, 10_000_000]) {
    const path = join(folder, `engine-bench-${rows}.md`);
    const query = `SELECT x1, x2, x3, x4, x5, y FROM readings WHERE id <= ${rows}`;
    await Deno.writeTextFile(path, doc(`database: ${file}\nquery: ${query}`));
    const r = await runFit(path, {});
    figures.push({
      engine: "duckdb",
      rows: r.fit.n,
      wall_s: +r.wall_s.toFixed(2),
      plumb_peak_mb: +r.peak_mb.toFixed(0),
      route: r.fit.in_engine_detail.route,
      kappa: +r.fit.in_engine_detail.kappa.toPrecision(3),
    });
  }
  const shards = await ensureShards10M();
  try {
    for (const rows of [1_000_000, 10_000_000]) {
      const path = join(folder, `engine-bench-pg-${rows}.md`);
      const query = `SELECT part, x1, x2, x3, x4, x5, y FROM readings WHERE id <= ${rows}`;
      await Deno.writeTextFile(
        path,
        doc(
          `database: { url_from: PLUMB_BENCH_PG }\nquery: ${query}\npartition_by: part`,
        ),
      );
      const r = await runFit(path, { PLUMB_BENCH_PG: shards.url });
      figures.push({
        engine: "postgres-sharded",
        rows: r.fit.n,
        wall_s: +r.wall_s.toFixed(2),
        plumb_peak_mb: +r.peak_mb.toFixed(0),
        route: r.fit.in_engine_detail.route,
        kappa: +r.fit.in_engine_detail.kappa.toPrecision(3),
      });
    }
  } finally {
    await shards.stop();
  }
  return {
    in_engine_fit_duckdb: figureOf(figures.slice(0, 2)),
    in_engine_fit_sharded_postgres: figureOf(figures.slice(2, 4)),
  };
}

/**
 * The figures from a process of their own with every permission: reading
 * another process's /proc entries needs them all in Deno, which the bench
 * task does not have (it may start this Deno).
 *
 * @returns What {@link engineFigures} gives.
 */
export async function engineFiguresApart(): ReturnType<typeof engineFigures> {
  const out = await new Deno.Command(Deno.execPath(), {
    args: ["run", "-A", new URL(import.meta.url).pathname, "--json"],
    stdout: "piped",
    stderr: "inherit",
  }).output();
  if (!out.success) throw new Error("the engine bench's process failed");
  return JSON.parse(new TextDecoder().decode(out.stdout));
}

if (import.meta.main) {
  console.log(JSON.stringify(await engineFigures(), null, 2));
}
