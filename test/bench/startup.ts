/**
 * Start-up figures of `deno task bench` (issue 9): how long the product
 * takes before it computes anything.
 *
 * - `worker_startup`: from `new Worker(cells/worker.ts, { type: "module",
 *   deno: { permissions: "none" } })` to the worker's first answers, in this
 *   process. Two messages are posted at once on creation: an `export` of a
 *   key the worker does not hold (answered by the message loop as soon as
 *   the entry's module graph is loaded and evaluated: `ready`), then a run of
 *   a three-row inline table (`first_run`: the first computation's answer).
 *   Target: ready under 100 ms.
 * - `plumb_run_cold`: a whole `plumb run examples/fade/fade.md --json`
 *   process, started with `Deno.execPath()` (no npx, no task runner) and
 *   timed from spawn to exit; the output must be RUN-JSON with `ok` true.
 *   Target under 500 ms.
 *
 * Each is timed over several runs after one uncounted warm-up (which fills
 * Deno's transpile and code caches, as any run after the first finds them)
 * and reported as min, median and max.
 *
 * `deno task bench --startup` measures only these two. The module also runs
 * on its own against another checkout of the repository with the same
 * method, for before/after figures:
 *
 * ```sh
 * deno run -A test/bench/startup.ts --root=../other-checkout --cli=kernel/cli/main.ts
 * ```
 *
 * It imports nothing from the repository statically: the tree measured is
 * the one named by `root` (its `cells/worker.ts`, `cells/mod.ts` for the
 * table's spec, `kernel/document/read_settings.ts` for the settings).
 *
 * @module
 */
import { pathToFileURL } from "node:url";

/** Min, median and max of repeated timings, in milliseconds. */
export interface Spread {
  runs: number;
  min_ms: number;
  median_ms: number;
  max_ms: number;
}

/** The `worker_startup` figure. */
export interface WorkerStartup {
  entry: string;
  /** Creation → the answer to an `export` (the message loop is running). */
  ready: Spread;
  /** Creation → the answer to a three-row inline table run posted with it. */
  first_run: Spread;
  target_ms: number;
}

/** The `plumb_run_cold` figure. */
export interface ColdRun extends Spread {
  command: string;
  cells: number;
  target_ms: number;
}

/** Summarises timings (ms) as min, median and max. */
export function spread(times: readonly number[]): Spread {
  const t = [...times].sort((a, b) => a - b);
  const mid = t.length >> 1;
  const median = t.length % 2 === 1 ? t[mid] : (t[mid - 1] + t[mid]) / 2;
  const round = (x: number) => Math.round(x * 10) / 10;
  return {
    runs: t.length,
    min_ms: round(t[0]),
    median_ms: round(median),
    max_ms: round(t[t.length - 1]),
  };
}

const TABLE_OPTIONS = { columns: ["x", "y"], rows: [[1, 2.1], [2, 3.9], [3, 6.2]] };

/** The run request of a three-row inline table, its spec parsed by the tree's own table kind. */
async function tableRunRequest(root: URL): Promise<Record<string, unknown>> {
  const { registry } = await import(new URL("cells/mod.ts", root).href);
  const { DEFAULT_SETTINGS } = await import(
    new URL("kernel/document/read_settings.ts", root).href
  );
  const settings = { ...DEFAULT_SETTINGS };
  const spec = registry.get("table").parse({
    name: "t",
    kind: "table",
    body: "",
    options: TABLE_OPTIONS,
    settings,
    warn: () => {},
  });
  const key = "bench-startup-table";
  return { op: "run", id: 2, key, kind: "table", name: "t", spec, settings, inputs: {}, files: {} };
}

/** One worker from creation to its two answers; terminated after. */
function startOnce(
  entry: URL,
  runRequest: Record<string, unknown>,
): Promise<{ ready: number; firstRun: number }> {
  return new Promise((resolve, reject) => {
    const t0 = performance.now();
    // The cast: with the DOM library loaded, WorkerOptions lacks Deno's `deno` field.
    const options = { type: "module", deno: { permissions: "none" } } as WorkerOptions;
    const w = new Worker(entry, options);
    let ready = NaN;
    w.onmessage = (e: MessageEvent<{ op: string; ok?: boolean; error?: unknown }>) => {
      const m = e.data;
      if (m.op === "output") ready = performance.now() - t0;
      if (m.op !== "done") return;
      const firstRun = performance.now() - t0;
      w.terminate();
      if (!m.ok) reject(new Error(`The table run failed: ${JSON.stringify(m.error)}`));
      else resolve({ ready, firstRun });
    };
    w.onerror = (e) => {
      e.preventDefault();
      w.terminate();
      reject(new Error(`The compute worker stopped: ${e.message}`));
    };
    w.postMessage({ op: "export", id: 1, key: "bench-startup-absent" });
    w.postMessage(runRequest);
  });
}

/**
 * Times the compute worker's start-up.
 *
 * @param root The repository's root folder (a URL ending in `/`).
 * @param runs Counted runs (after one warm-up).
 * @returns Ready and first-run times as min, median and max.
 * @throws Error when the worker stops or the table run fails.
 */
export async function workerStartup(root: URL, runs = 10): Promise<WorkerStartup> {
  const entry = new URL("cells/worker.ts", root);
  const request = await tableRunRequest(root);
  await startOnce(entry, request); // warm-up
  const ready: number[] = [], firstRun: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t = await startOnce(entry, request);
    ready.push(t.ready);
    firstRun.push(t.firstRun);
  }
  return {
    entry: "cells/worker.ts",
    ready: spread(ready),
    first_run: spread(firstRun),
    target_ms: 100,
  };
}

/**
 * Times whole `plumb run <demo> --json` processes, spawn to exit.
 *
 * @param root The repository's root folder (a URL ending in `/`); the working folder.
 * @param cli The command line's entry module, relative to `root`.
 * @param runs Counted runs (after one warm-up).
 * @returns The wall times as min, median and max, and the demo's cell count.
 * @throws Error when a run exits with an error or its RUN-JSON is not ok.
 */
export async function coldRun(root: URL, cli = "cells/main.ts", runs = 7): Promise<ColdRun> {
  const args = [
    "run",
    "--allow-read",
    "--allow-env=LOG_TOKENS,LOG_STREAM",
    `--allow-run=${Deno.execPath()}`,
    cli,
    "run",
    "examples/fade/fade.md",
    "--json",
  ];
  const command = new Deno.Command(Deno.execPath(), {
    args,
    cwd: root,
    stdout: "piped",
    stderr: "piped",
  });
  const once = async () => {
    const t0 = performance.now();
    const out = await command.output();
    const ms = performance.now() - t0;
    const text = new TextDecoder().decode(out.stdout);
    let report: { ok?: boolean; cells?: unknown[] } = {};
    try {
      report = JSON.parse(text);
    } catch { /* reported below */ }
    if (out.code !== 0 || report.ok !== true) {
      const err = new TextDecoder().decode(out.stderr).slice(0, 500);
      throw new Error(`"plumb run" exited with ${out.code}, ok ${report.ok}: ${err}`);
    }
    return { ms, cells: report.cells?.length ?? 0 };
  };
  const { cells } = await once(); // warm-up
  const times: number[] = [];
  for (let i = 0; i < runs; i++) times.push((await once()).ms);
  return { command: `deno ${args.join(" ")}`, cells, ...spread(times), target_ms: 500 };
}

/**
 * Both start-up figures, worker first.
 *
 * @param root The repository's root folder (a URL ending in `/`).
 * @param cli The command line's entry module, relative to `root`.
 * @returns The `worker_startup` and `plumb_run_cold` figures.
 */
export async function startupFigures(
  root: URL,
  cli = "cells/main.ts",
): Promise<{ worker_startup: WorkerStartup; plumb_run_cold: ColdRun }> {
  const worker_startup = await workerStartup(root);
  const plumb_run_cold = await coldRun(root, cli);
  return { worker_startup, plumb_run_cold };
}

if (import.meta.main) {
  const flag = (name: string) =>
    Deno.args.find((a) => a.startsWith(`--${name}=`))?.slice(name.length + 3);
  const dir = flag("root");
  const root = dir === undefined
    ? new URL("../../", import.meta.url)
    : pathToFileURL(Deno.realPathSync(dir) + "/");
  console.log(JSON.stringify(await startupFigures(root, flag("cli")), null, 2));
}
