/**
 * `history` in `deno task bench`: what the run history costs a run.
 *
 * - `demo`: a whole `plumb run` of the demo as a new process, min/median/max
 *   of five: in a process allowed to write the folder, with the history (a
 *   record appended each time: the data file gains a row between runs) and
 *   with `--no-history`; target: the history adds under 150 ms to the median
 *   (our own bound: about what a person notices, common practice, no
 *   source). And through `deno task plumb`, which may not write and relaunches
 *   itself allowed to write the history file only: `relaunch_ms`, the price
 *   of that least privilege (one more Deno start).
 * - `large`: a document over a 20,000-row table (the most rows whose every
 *   row the table's record fingerprints) with a history of 100 records:
 *   recording one more run and making the report (read, append with fsync,
 *   trim, compare, trends), median of five, in process; the history file's
 *   size. Target under 1 s.
 *
 * @module
 */
import { join } from "node:path";
import { registry } from "../../cells/mod.ts";
import { Session } from "../../kernel/session/session.ts";
import { sha256Hex } from "../../kernel/hash.ts";
import { historyPath, recordRun } from "../../kernel/history/mod.ts";
import { copyDir } from "../_copy_dir.ts";

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
const spread = (xs: number[]) => ({
  min: Math.min(...xs),
  median: median(xs),
  max: Math.max(...xs),
});

async function timedRun(
  root: URL,
  dir: string,
  extra: string[],
  direct = false,
): Promise<number> {
  const config = new URL("deno.json", root).pathname;
  // `direct`: a process already allowed to write the folder (no relaunch).
  const args = direct
    ? [
      "run",
      `--config=${config}`,
      "--allow-read",
      `--allow-write=${dir}`,
      "--allow-env=LOG_TOKENS,LOG_STREAM,INIT_CWD",
      `--allow-run=${Deno.execPath()}`, // the demo's calc cell, as `deno task plumb` allows
      new URL("cells/main.ts", root).pathname,
      "run",
      "fade.md",
      ...extra,
    ]
    : ["task", "-q", "--config", config, "plumb", "run", "fade.md", ...extra];
  const t0 = performance.now();
  const out = await new Deno.Command(Deno.execPath(), {
    args,
    cwd: dir,
    env: { INIT_CWD: dir, NO_COLOR: "1" },
    stdout: "null",
    stderr: "piped",
  }).output();
  if (out.code !== 0) throw new Error(new TextDecoder().decode(out.stderr));
  return performance.now() - t0;
}

/** The demo run as a new process: with the history (relaunched or allowed to write) and without. */
async function demo(root: URL) {
  const dir = await Deno.makeTempDir({ prefix: "plumb-bench-history-" });
  try {
    copyDir(new URL("examples/fade", root).pathname, dir);
    const csv = join(dir, "data/batch7.csv");
    await timedRun(root, dir, []); // warm the module cache; the first record
    const relaunched: number[] = [], direct: number[] = [], without: number[] = [];
    for (let i = 0; i < 5; i++) {
      await Deno.writeTextFile(csv, `${601 + i},2269.${i},25.0\n`, { append: true });
      relaunched.push(await timedRun(root, dir, []));
      await Deno.writeTextFile(csv, `${701 + i},2260.${i},25.0\n`, { append: true });
      direct.push(await timedRun(root, dir, [], true));
      without.push(await timedRun(root, dir, ["--no-history"], true));
    }
    const a = spread(relaunched), d = spread(direct), b = spread(without);
    return {
      task_with_history: a,
      direct_with_history: d,
      direct_without_history: b,
      added_ms: d.median - b.median,
      target_added_ms: 150,
      relaunch_ms: a.median - d.median,
    };
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

/** 100 records of a 20,000-row table's document, then one more, timed in process. */
async function large() {
  const dir = await Deno.makeTempDir({ prefix: "plumb-bench-history-" });
  try {
    const rows = ["x,y"];
    for (let i = 0; i < 20_000; i++) rows.push(`${i},${(3 + 0.5 * i + Math.sin(i)).toFixed(4)}`);
    await Deno.writeTextFile(join(dir, "d.csv"), rows.join("\n") + "\n");
    const doc = join(dir, "d.md");
    const source = "# Bench\n\nInvented data.\n\n```table t\nfrom: d.csv\n```\n\n" +
      "```fit f\non: t\nmodel: y = a + b*x\n```\n\n```check c\nfit: f\n```\n";
    await Deno.writeTextFile(doc, source);
    const session = new Session({
      registry,
      workerUrl: new URL("../../cells/worker.ts", import.meta.url),
      dir,
      history: true,
    });
    try {
      const report = await session.run(source);
      const documentSha256 = await sha256Hex(new TextEncoder().encode(source));
      const inputs = new Map(report.cells.map((c) => [c.name, c.inputs ?? []]));
      const one = async (i: number) => {
        // Another data revision each time: the same results under another file hash.
        const files = report.files.map((f) => ({ ...f, sha256: `${i}`.padStart(64, "0") }));
        const t0 = performance.now();
        await recordRun({
          document: doc,
          documentSha256,
          report: { ...report, files },
          registry,
          inputsOf: (c) => inputs.get(c) ?? [],
        });
        return performance.now() - t0;
      };
      for (let i = 0; i < 100; i++) await one(i);
      const times: number[] = [];
      for (let i = 100; i < 105; i++) times.push(await one(i));
      return {
        rows: 20_000,
        records: 100,
        record_and_report_ms: spread(times),
        target_record_and_report_ms: 1000,
        file_bytes: (await Deno.stat(historyPath(doc))).size,
      };
    } finally {
      session.close();
    }
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

/**
 * The history's figures.
 *
 * @param root The repository's folder.
 * @returns `{ demo, large }`.
 */
export async function historyFigures(root: URL) {
  return { demo: await demo(root), large: await large() };
}

if (import.meta.main) {
  console.log(JSON.stringify(await historyFigures(new URL("../../", import.meta.url)), null, 2));
}
