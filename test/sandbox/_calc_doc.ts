/**
 * Documents of hostile calc cells for the sandbox suites: a small table, a
 * fit of it and a well-behaved calc cell beside the hostile ones, run through
 * a `Session` with the product's kinds and worker, and the checks every
 * hostile cell must pass (it failed, it says why in plain words, the others
 * kept their results).
 *
 * ```
 *   pts ──▶ line ──▶ fine          the base: must stay current, with these values
 *    └──────────────▶ <hostile>…   each must fail with its sentence
 * ```
 *
 * @module
 */
import { equal, match, ok } from "node:assert/strict";
import { registry } from "../../cells/mod.ts";
import { Session } from "../../kernel/session/session.ts";
import type { CellReport, RunReport } from "../../kernel/session/types.ts";

export const WORKER = new URL("../../cells/worker.ts", import.meta.url);

/** A fenced cell. */
export function cell(kind: string, name: string, body: string): string {
  return "```" + `${kind} ${name}\n${body}\n` + "```\n\n";
}

/** A calc cell: header lines (reads, time, memory), then the code. */
export function calc(name: string, code: string, header = ""): string {
  return cell(
    "calc",
    name,
    `${header}${header === "" || header.endsWith("\n") ? "" : "\n"}---\n${code}`,
  );
}

/** A hostile cell and the sentence it must fail with. */
export interface Hostile {
  name: string;
  code: string;
  header?: string;
  /** What the cell's error must say. */
  says: RegExp;
}

/** The sentences the suites expect (run.ts puts "This cell" before the sandbox's words). */
export const SAYS = {
  net: /^This cell tried to reach the network; calc cells have no network$/,
  exit: /^This cell tried to end its process; calc cells return a value instead$/,
  stopped: /^This cell stopped after 2 s$/,
  memory: /^This cell used more than 64 MB$/,
};

/** An endless loop under a 2 s limit. */
export const loop = (name: string): Hostile => ({
  name,
  code: "for (;;) {}",
  header: "time: 2 s",
  says: SAYS.stopped,
});

/** Array buffers (outside the V8 heap) without end under a 64 MB limit. */
export const bufferBomb = (name: string): Hostile => ({
  name,
  code: "const a: Uint8Array[] = [];\nfor (;;) a.push(new Uint8Array(2 ** 24).fill(1));",
  header: "memory: 64 MB",
  says: SAYS.memory,
});

/** Deno.exit. */
export const denoExit = (name: string): Hostile => ({
  name,
  code: "Deno.exit(3);\nreturn 1;",
  says: SAYS.exit,
});

// Invented data for these tests: y = 1 + 2x exactly at x = 1..5.
export const BASE = cell(
  "table",
  "pts",
  "columns: [x, y]\nrows: [[1, 3], [2, 5], [3, 7], [4, 9], [5, 11]]\nunits: { y: mV }",
) + cell("fit", "line", "on: pts\nmodel: y = a + b*x") +
  calc(
    "fine",
    "return { b: line.estimates.b, sum: pts.columns.y.reduce((s, v) => s + v, 0) };",
    "reads: pts, line",
  );

/** The document: the base, then each hostile cell. */
export function documentOf(hostile: readonly Hostile[]): string {
  return BASE + hostile.map((h) => calc(h.name, h.code, h.header ?? "time: 5 s")).join("");
}

/**
 * Runs a document in a fresh session (two workers, so two cells' type checks
 * overlap) over a temporary folder.
 *
 * @param source The document.
 * @param then More runs of the same session, given the first report.
 * @returns The first run's report.
 */
export async function runDocument(
  source: string,
  then?: (s: Session, first: RunReport) => Promise<void>,
): Promise<RunReport> {
  const dir = await Deno.makeTempDir({ prefix: "plumb-sandbox-" });
  const s = new Session({ registry, workerUrl: WORKER, dir, workers: 2 });
  try {
    const r = await s.run(source);
    await then?.(s, r);
    return r;
  } finally {
    s.close();
    await Deno.remove(dir, { recursive: true });
  }
}

/** The cell of that name in a report. */
export function cellOf(r: RunReport, name: string): CellReport {
  const c = r.cells.find((x) => x.name === name);
  ok(c, `no cell "${name}"`);
  return c;
}

/** Words that mean the message leaks the runtime: a stack frame, a module URL, a V8 or Deno phrase. */
const INTERNAL =
  /\bat (file|data|ext):|data:application|\$deno\$|_child\.js|plumb-sandbox|Uncaught|NotCapable|run again with|--allow-|\n/;

/**
 * Asserts each hostile cell failed saying what it must, in plain words, and
 * the base kept its results.
 *
 * @param r The run's report.
 * @param hostile The hostile cells.
 */
export function assertRefused(r: RunReport, hostile: readonly Hostile[]): void {
  for (const h of hostile) {
    const c = cellOf(r, h.name);
    equal(c.state, "failed", `${h.name} should fail; it gave ${JSON.stringify(c.result)}`);
    const said = c.error?.message ?? "";
    match(said, h.says, `${h.name}: ${said}`);
    ok(!INTERNAL.test(said), `${h.name} leaks the runtime's words: ${said}`);
  }
  assertBaseIntact(r);
}

/** Asserts the table, the fit and the well-behaved calc are current with their exact values. */
export function assertBaseIntact(r: RunReport): void {
  for (const name of ["pts", "line", "fine"]) {
    const c = cellOf(r, name);
    equal(c.state, "current", `${name}: ${c.error?.message}`);
  }
  const fine = cellOf(r, "fine").result as { value: { b: number; sum: number } };
  // Exact arithmetic: the line through the five points has slope 2; Σy = 3+5+7+9+11 = 35.
  ok(Math.abs(fine.value.b - 2) < 1e-12, `slope ${fine.value.b}`);
  equal(fine.value.sum, 35);
}
