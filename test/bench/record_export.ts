/**
 * The `record_export` figure of `deno task bench`: `plumb export` as a new
 * process (as a user runs it), wall time (min/median/max of three after a
 * warm-up) and the record's size, for the demo (targets under 1 s and
 * 1 MB) and for a document over a 1,000,000-row table (target under 3 MB:
 * charts drawn binned, per-row fields left out of the page copies).
 *
 * Run alone (prints JSON): deno run -A test/bench/record_export.ts
 *
 * @module
 */
import { makeNumericCsv } from "../../kernel/csv/mod.ts";
import { type Spread, spread } from "./startup.ts";

/** One document's export. */
export interface ExportFigure extends Spread {
  /** The record's size in bytes. */
  bytes: number;
  target_ms?: number;
  target_bytes: number;
}

/** The figure: the demo and the million-row document. */
export interface RecordExport {
  demo: ExportFigure;
  million_rows: ExportFigure;
}

const FENCE = "```";

/** A document over a 1,000,000-row table of invented numbers: a fit, its check, a chart. */
function millionDocument(): string {
  return [
    "---\ntitle: A million rows\n---\n",
    "Invented numbers (seeded), to measure the record of a large table.\n",
    `${FENCE}table big\nfrom: big.csv\n${FENCE}\n`,
    `${FENCE}fit line\non: big\nmodel: c1 = a + b*c0\n${FENCE}\n`,
    `${FENCE}check line-check\nfit: line\n${FENCE}\n`,
    `${FENCE}chart cloud\non: big\nx: c0\ny: c1\nfits: [line]\n${FENCE}\n`,
    "The slope is @(line.parameters[1].estimate, 3).\n",
  ].join("\n");
}

async function exportOnce(root: URL, doc: string, out: string): Promise<number> {
  const t0 = performance.now();
  const r = await new Deno.Command(Deno.execPath(), {
    args: [
      "run",
      "--allow-read",
      `--allow-write=${out.slice(0, out.lastIndexOf("/"))}`,
      "--allow-env=LOG_TOKENS,LOG_STREAM,SOURCE_DATE_EPOCH,INIT_CWD",
      // The demo's calc cell runs in a child of this Deno (kernel/sandbox), as `deno task plumb` allows.
      `--allow-run=${Deno.execPath()}`,
      "cells/main.ts",
      "export",
      doc,
      "-o",
      out,
    ],
    cwd: root,
    stdout: "piped",
    stderr: "piped",
  }).output();
  const ms = performance.now() - t0;
  if (r.code !== 0) {
    throw new Error(`plumb export ${doc}: exit ${r.code}: ${new TextDecoder().decode(r.stderr)}`);
  }
  return ms;
}

async function figure(
  root: URL,
  doc: string,
  out: string,
  targets: { ms?: number; bytes: number },
  runs: number,
): Promise<ExportFigure> {
  await exportOnce(root, doc, out); // fills Deno's caches
  const times: number[] = [];
  for (let i = 0; i < runs; i++) times.push(await exportOnce(root, doc, out));
  return {
    ...spread(times),
    bytes: (await Deno.stat(out)).size,
    ...(targets.ms === undefined ? {} : { target_ms: targets.ms }),
    target_bytes: targets.bytes,
  };
}

/**
 * Measures `plumb export` of the demo and of a million-row document.
 *
 * @param root The repository's root folder.
 * @param runs Counted runs of each.
 * @returns The figures.
 */
export async function recordExport(root: URL, runs = 3): Promise<RecordExport> {
  const dir = await Deno.makeTempDir({ prefix: "plumb-record-bench-" });
  try {
    const demo = new URL("examples/fade/fade.md", root).pathname;
    const demoFigure = await figure(root, demo, `${dir}/demo.html`, {
      ms: 1000,
      bytes: 1 << 20,
    }, runs);
    await Deno.writeFile(`${dir}/big.csv`, makeNumericCsv(1_000_000, 2, 7));
    await Deno.writeTextFile(`${dir}/million.md`, millionDocument());
    const million = await figure(root, `${dir}/million.md`, `${dir}/million.html`, {
      bytes: 3 << 20,
    }, Math.min(runs, 2));
    return { demo: demoFigure, million_rows: million };
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

if (import.meta.main) {
  console.log(JSON.stringify(await recordExport(new URL("../../", import.meta.url)), null, 2));
}
