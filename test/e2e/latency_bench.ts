/**
 * Update latency of the live page, in headless Chromium against the real
 * `plumb serve`: the time from a data file write to the page showing the new
 * results of every cell. The document: a seeded 10,000-row table, 6 fits
 * (all linear in their parameters: line, square root, root + line, log,
 * quadratic and cubic polynomials), a compare of the six, a check of one,
 * and 3 charts (the overview with 10,000 points, so drawn binned, and two
 * residual charts). Each repetition appends one row to the CSV.
 *
 * `deno task bench` calls {@link updateLatency} (test/bench/run.ts, figure
 * `update_latency`); targets p50 ≤ 100 ms and p95 ≤ 250 ms (issue 5).
 * Without /usr/bin/chromium it skips with one line and returns null.
 *
 * The page's moment is taken inside the page (a MutationObserver noting
 * `Date.now()` when every block is current with a result computed by a newer
 * run than before), the write's moment in Deno just before the write; both
 * read the same system clock.
 *
 * @module
 */
import { CHROMIUM, openBrowser, serve } from "./_harness.ts";

const CELLS = [
  "cells",
  "line",
  "root",
  "root-linear",
  "logarithmic",
  "quadratic",
  "cubic",
  "laws",
  "root-check",
  "overview",
  "root-residuals",
  "line-residuals",
];

/** A seeded capacity-fade series (invented data): 2500 − 9.9·√cycle + N(0, 1.5²) by Box–Muller. */
function seededCsv(rows: number, seed: number): string {
  let s = seed >>> 0;
  const uniform = () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0; // LCG, Numerical Recipes constants
    return (s + 0.5) / 2 ** 32;
  };
  const lines = ["cycle,capacity"];
  for (let i = 1; i <= rows; i++) {
    const z = Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
    lines.push(`${i},${(2500 - 9.9 * Math.sqrt(i) + 1.5 * z).toFixed(2)}`);
  }
  return lines.join("\n") + "\n";
}

const fence = (info: string, body: string) => "```" + info + "\n" + body + "\n```\n";

const DOC = [
  "---\ntitle: Update latency bench (invented data)\n---\n\n# Update latency bench\n",
  fence("table cells", "from: data/series.csv\nunits: { cycle: cycles, capacity: mAh }"),
  fence("fit line", "on: cells\nmodel: capacity = q0 + a*cycle"),
  fence("fit root", "on: cells\nmodel: capacity = q0 - a*sqrt(cycle)"),
  fence("fit root-linear", "on: cells\nmodel: capacity = q0 - a*sqrt(cycle) - b*cycle"),
  fence("fit logarithmic", "on: cells\nmodel: capacity = q0 - a*log(cycle)"),
  fence("fit quadratic", "on: cells\nmodel: capacity = polynomial(cycle, 2)"),
  fence("fit cubic", "on: cells\nmodel: capacity = polynomial(cycle, 3)"),
  fence("compare laws", "fits: [line, root, root-linear, logarithmic, quadratic, cubic]\nby: aicc"),
  fence("check root-check", "fit: root"),
  fence(
    "chart overview",
    "on: cells\nx: cycle\ny: capacity\nfits: [line, root, cubic]\nband: root",
  ),
  fence("chart root-residuals", "on: cells\nx: cycle\ny: capacity\nfits: [root]\nresiduals: true"),
  fence("chart line-residuals", "on: cells\nx: cycle\ny: capacity\nfits: [line]\nresiduals: true"),
].join("\n");

function quantile(sorted: number[], q: number): number {
  const i = (sorted.length - 1) * q;
  const lo = Math.floor(i), hi = Math.ceil(i);
  return sorted[lo] + (sorted[hi] - sorted[lo]) * (i - lo);
}

/** The `update_latency` figure. */
export interface UpdateLatency {
  rows: number;
  cells: number;
  kinds: string[];
  repetitions: number;
  p50_ms: number;
  p95_ms: number;
  max_ms: number;
  /** The server's own time for the run (its `run` message), for telling compute from page. */
  server_run_p50_ms: number | null;
  target_p50_ms: number;
  target_p95_ms: number;
}

/**
 * Measures the update latency.
 *
 * @param reps Measured repetitions (after 3 warm-up ones).
 * @returns The figure, or null when Chromium is absent.
 * @throws {Error} When the page does not update within 10 s.
 */
export async function updateLatency(reps = 20): Promise<UpdateLatency | null> {
  try {
    Deno.statSync(CHROMIUM);
  } catch {
    console.log(`skip: update_latency (no ${CHROMIUM})`);
    return null;
  }
  const served = await serve("fade", "bench.md", (dir) => {
    Deno.mkdirSync(`${dir}/data`, { recursive: true });
    Deno.writeTextFileSync(`${dir}/data/series.csv`, seededCsv(10_000, 20260105));
    Deno.writeTextFileSync(`${dir}/bench.md`, DOC);
  });
  const b = await openBrowser();
  const times: number[] = [];
  const serverMs: number[] = [];
  try {
    const { page } = b;
    await page.goto(served.url);
    await page.waitForFunction(
      (n: number) =>
        [...document.querySelectorAll("[data-block]")].filter((e) =>
          e.getAttribute("data-state") === "current"
        ).length === n,
      { timeout: 120_000, polling: 50 },
      CELLS.length,
    );
    const csv = `${served.dir}/data/series.csv`;
    for (let i = 0; i < reps + 3; i++) {
      await page.evaluate(() => {
        const w = globalThis as unknown as { seenAt: number | null; observer?: MutationObserver };
        const before = new Map(
          [...document.querySelectorAll("[data-block]")].map((
            e,
          ) => [e, Number(e.getAttribute("data-computed"))]),
        );
        w.seenAt = null;
        w.observer?.disconnect();
        const done = () =>
          [...before].every(([e, run]) =>
            e.isConnected && e.getAttribute("data-state") === "current" &&
            Number(e.getAttribute("data-computed")) > run
          );
        w.observer = new MutationObserver(() => {
          if (w.seenAt === null && done()) w.seenAt = Date.now();
        });
        w.observer.observe(document.body, { subtree: true, attributes: true, childList: true });
      });
      const t0 = Date.now();
      await Deno.writeTextFile(
        csv,
        `${10_000 + i + 1},${(2500 - 9.9 * Math.sqrt(10_001 + i)).toFixed(2)}\n`,
        {
          append: true,
        },
      );
      await page.waitForFunction(
        () => (globalThis as unknown as { seenAt: number | null }).seenAt !== null,
        {
          timeout: 10_000,
          polling: 10,
        },
      );
      const seen = await page.evaluate(() => (globalThis as unknown as { seenAt: number }).seenAt);
      if (Deno.env.get("PLUMB_BENCH_TRACE")) {
        const after = b.messages.filter((m) => (m as { receivedAt?: number }).receivedAt! >= t0);
        const at = (m: unknown) => (m as { receivedAt: number }).receivedAt - t0;
        console.log(
          `seen ${seen - t0} first ${after.length ? at(after[0]) : "-"} last ${
            after.length ? at(after[after.length - 1]) : "-"
          } n ${after.length}`,
          after.map((m) =>
            m.type === "cell" ? `${m.name}:${m.state}@${at(m)}` : `${m.type}@${at(m)}`
          ).join(" "),
        );
      }
      if (i >= 3) {
        times.push(seen - t0);
        const run = b.messages.findLast((m) => m.type === "run");
        if (run?.type === "run") serverMs.push(run.ms);
      }
    }
  } finally {
    await b.close();
    await served.close();
  }
  times.sort((x, y) => x - y);
  serverMs.sort((x, y) => x - y);
  return {
    rows: 10_000,
    cells: CELLS.length,
    kinds: ["table", "fit ×6", "compare", "check", "chart ×3"],
    repetitions: reps,
    p50_ms: quantile(times, 0.5),
    p95_ms: quantile(times, 0.95),
    max_ms: times[times.length - 1],
    server_run_p50_ms: serverMs.length ? quantile(serverMs, 0.5) : null,
    target_p50_ms: 100,
    target_p95_ms: 250,
  };
}

if (import.meta.main) console.log(JSON.stringify(await updateLatency(), null, 2));
