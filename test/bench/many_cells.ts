/**
 * The `many_cells` figure of `deno task bench` (issue 11, defect 9): a
 * whole `plumb run --json` of a generated 10,000-cell document as a new
 * process, wall time and peak resident memory (the operating system's own
 * count, read by GNU time's `%M`; null where /usr/bin/time is absent).
 * Target: under 10 s and 1 GB.
 *
 * The document: 5,000 pairs of a four-row inline table and a straight-line
 * fit on it, with a prose paragraph and an inline value every 50 pairs:
 * small cells, so the figure measures planning, scheduling, messages and
 * result formatting rather than numerics.
 *
 * Before the scheduler marked only the cells a change concerns (Run looked
 * at every waiting cell after every change and raced every cell on its way):
 * 66.9 s and 2.6 GB here, 99 s and 3.8 GB when the issue was filed.
 *
 * Runs on its own too: `deno run -A test/bench/many_cells.ts [cells]`.
 *
 * @module
 */
import { type Spread, spread } from "./startup.ts";

/** The `many_cells` figure. */
export interface ManyCells extends Spread {
  cells: number;
  /** Peak resident memory of a run's process, in MB (median of the runs); null without GNU time. */
  peak_mb: number | null;
  /** The largest of the runs' peaks, in MB. */
  peak_mb_max: number | null;
  target_ms: number;
  target_peak_mb: number;
}

/**
 * A document of `cells` small cells (half tables, half fits).
 *
 * @param cells How many cells (even).
 * @returns The document's text.
 */
export function manyCellsDocument(cells: number): string {
  const F = "```";
  const parts = ["---\ntitle: Many small cells\n---\n\n# Many small cells\n"];
  for (let i = 0; i < cells / 2; i++) {
    const y = (2 + (i % 7) * 0.1).toFixed(1);
    parts.push(
      `${F}table t${i}\ncolumns: [x, y]\nrows:\n  - [1, ${y}]\n  - [2, 3.9]\n  - [3, 6.2]\n` +
        `  - [4, 7.8]\n${F}\n`,
    );
    parts.push(`${F}fit f${i}\non: t${i}\nmodel: y = a + b*x\n${F}\n`);
    if (i % 50 === 0) parts.push(`Group ${i}: R² is @(f${i}.r2, 3).\n`);
  }
  return parts.join("\n");
}

function hasGnuTime(): boolean {
  try {
    return Deno.statSync("/usr/bin/time").isFile;
  } catch {
    return false;
  }
}

/** One `plumb run --json`: wall ms and peak MB (null without GNU time). */
async function runOnce(root: URL, doc: string, cells: number) {
  const plumb = [
    Deno.execPath(),
    "run",
    "--allow-read",
    "--allow-env=LOG_TOKENS,LOG_STREAM",
    "cells/main.ts",
    "run",
    doc,
    "--json",
  ];
  const timed = hasGnuTime();
  const [cmd, ...args] = timed ? ["/usr/bin/time", "-f", "plumb-peak-kb %M", ...plumb] : plumb;
  const t0 = performance.now();
  const out = await new Deno.Command(cmd, { args, cwd: root, stdout: "piped", stderr: "piped" })
    .output();
  const ms = performance.now() - t0;
  const err = new TextDecoder().decode(out.stderr);
  const report = JSON.parse(new TextDecoder().decode(out.stdout)) as {
    ok: boolean;
    cells: unknown[];
  };
  if (out.code !== 0 || !report.ok || report.cells.length !== cells) {
    throw new Error(`"plumb run" of ${cells} cells exited with ${out.code}: ${err.slice(0, 500)}`);
  }
  const kb = /plumb-peak-kb (\d+)/.exec(err)?.[1];
  return { ms, mb: kb === undefined ? null : Number(kb) / 1024 };
}

/**
 * Times `plumb run --json` of a generated document.
 *
 * @param root The repository's root folder (the working folder).
 * @param cells How many cells.
 * @param runs Counted runs (after a warm-up on a 200-cell document).
 * @returns Wall time (min, median, max) and peak memory.
 * @throws Error when a run fails or its RUN-JSON is not ok.
 */
export async function manyCells(root: URL, cells = 10_000, runs = 3): Promise<ManyCells> {
  const dir = await Deno.makeTempDir({ prefix: "plumb-many-cells-" });
  try {
    const small = `${dir}/small.md`, big = `${dir}/many.md`;
    await Deno.writeTextFile(small, manyCellsDocument(200));
    await Deno.writeTextFile(big, manyCellsDocument(cells));
    await runOnce(root, small, 200); // fills Deno's transpile and code caches
    const times: number[] = [], peaks: number[] = [];
    for (let i = 0; i < runs; i++) {
      const { ms, mb } = await runOnce(root, big, cells);
      times.push(ms);
      if (mb !== null) peaks.push(mb);
    }
    peaks.sort((a, b) => a - b);
    const round = (x: number | undefined) => x === undefined ? null : Math.round(x);
    return {
      cells,
      ...spread(times),
      peak_mb: round(peaks[Math.floor(peaks.length / 2)]),
      peak_mb_max: round(peaks[peaks.length - 1]),
      target_ms: 10_000,
      target_peak_mb: 1024,
    };
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

if (import.meta.main) {
  const cells = Number(Deno.args[0] ?? 10_000);
  console.log(JSON.stringify(await manyCells(new URL("../../", import.meta.url), cells), null, 2));
}
