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
 * `update_latency`); targets p50 ≤ 100 ms and p95 ≤ 250 ms (issue 5). The
 * same document at ten times the rows (`rows` 100,000) has the target
 * p50 ≤ 300 ms (issue 16). Without /usr/bin/chromium it skips with one line
 * and returns null.
 *
 * From the command line: `deno run -A test/e2e/latency_bench.ts [--rows=N]
 * [--reps=N] [--view=charts]`.
 *
 * The page's moment is taken inside the page (a MutationObserver noting
 * `Date.now()` when every block is current with a result computed by a newer
 * run than before, after the charts are drawn: they are drawn before the
 * block's new state is committed), the write's moment in Deno just before
 * the write; both read the same system clock. The bench waits on one promise
 * in the page rather than polling it, so measuring adds no load.
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

/**
 * Updates made before measuring: the server's code is compiled by V8 as it
 * runs, and its optimising tier settles after several updates; the figure is
 * the steady state a reader sees while measurements keep arriving.
 */
export const WARM_UP = 10;

function withTimeout<T>(p: Promise<T>, ms: number): Promise<T> {
  let timer: ReturnType<typeof setTimeout> | undefined;
  const late = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`The page did not update within ${ms} ms`)), ms);
  });
  return Promise.race([p, late]).finally(() => clearTimeout(timer));
}

function quantile(sorted: number[], q: number): number {
  const i = (sorted.length - 1) * q;
  const lo = Math.floor(i), hi = Math.ceil(i);
  return sorted[lo] + (sorted[hi] - sorted[lo]) * (i - lo);
}

/** The `update_latency` figure. */
export interface UpdateLatency {
  /** Where the page was scrolled (see {@link updateLatency}). */
  view: "top" | "charts";
  rows: number;
  cells: number;
  kinds: string[];
  repetitions: number;
  /** Write to the page's next painted frame showing every new result (the figure the targets judge). */
  p50_ms: number;
  p95_ms: number;
  max_ms: number;
  /** Write to the DOM holding every new result (before that frame's layout and paint). */
  dom_p50_ms: number;
  dom_p95_ms: number;
  /** The server's own time for the run (its `run` message), for telling compute from page. */
  server_run_p50_ms: number | null;
  target_p50_ms: number;
  /** None set for the larger table (issue 16 sets a median only). */
  target_p95_ms: number | null;
}

/** The targets by table size: issue 5 at 10,000 rows, issue 16 beyond. */
function targets(rows: number): { p50: number; p95: number | null } {
  return rows <= 10_000 ? { p50: 100, p95: 250 } : { p50: 300, p95: null };
}

/**
 * Measures the update latency.
 *
 * @param reps Measured repetitions (after {@link WARM_UP} warm-up ones).
 * @param view Where the page is scrolled: `top` (the table and first fits in
 *   view, as opened) or `charts` (the check's four residual charts in view:
 *   the page then redraws them on every update).
 * @param rows Rows of the seeded table before the first append (10,000 for
 *   the `update_latency` figure, 100,000 for issue 16's).
 * @returns The figure, or null when Chromium is absent.
 * @throws {Error} When the page does not update within 30 s.
 */
export async function updateLatency(
  reps = 20,
  view: "top" | "charts" = "top",
  rows = 10_000,
): Promise<UpdateLatency | null> {
  try {
    Deno.statSync(CHROMIUM);
  } catch {
    console.log(`skip: update_latency (no ${CHROMIUM})`);
    return null;
  }
  const served = await serve("fade", "bench.md", (dir) => {
    Deno.mkdirSync(`${dir}/data`, { recursive: true });
    Deno.writeTextFileSync(`${dir}/data/series.csv`, seededCsv(rows, 20260105));
    Deno.writeTextFileSync(`${dir}/bench.md`, DOC);
  });
  const trace = Deno.env.get("PLUMB_BENCH_TRACE") !== undefined;
  // The frame tap makes the browser report every live frame over the DevTools
  // protocol: load the measurement should not add, so only when tracing.
  const b = await openBrowser({ tap: trace });
  const times: number[] = [];
  const domTimes: number[] = [];
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
    if (view === "charts") {
      await page.$eval('[data-block="root-check"]', (e) => e.scrollIntoView());
      await new Promise((r) => setTimeout(r, 500));
    }
    const csv = `${served.dir}/data/series.csv`;
    for (let i = 0; i < reps + WARM_UP; i++) {
      await page.evaluate(() => {
        const w = globalThis as unknown as {
          seen: Promise<{ dom: number; painted: number }>;
          observer?: MutationObserver;
        };
        const before = new Map(
          [...document.querySelectorAll("[data-block]")].map((
            e,
          ) => [e, Number(e.getAttribute("data-computed"))]),
        );
        w.observer?.disconnect();
        // Charts off screen or in a closed disclosure may wait to be drawn (data-pending);
        // none shown on screen may (checkVisibility: false inside a closed <details>).
        const onScreen = (e: Element) => {
          if (!e.checkVisibility()) return false;
          const r = e.getBoundingClientRect();
          return r.bottom > 0 && r.top < innerHeight;
        };
        // The attribute test first: it is false for most mutations and costs no layout.
        const done = () =>
          [...before].every(([e, run]) =>
            e.isConnected && e.getAttribute("data-state") === "current" &&
            Number(e.getAttribute("data-computed")) > run
          ) && ![...document.querySelectorAll("[data-pending]")].some(onScreen);
        w.seen = new Promise((resolve) => {
          w.observer = new MutationObserver(() => {
            if (!done()) return;
            w.observer?.disconnect();
            const dom = Date.now();
            // The frame that shows it: its callbacks run before its paint, the task after it.
            requestAnimationFrame(() => setTimeout(() => resolve({ dom, painted: Date.now() })));
          });
          w.observer.observe(document.body, { subtree: true, attributes: true, childList: true });
        });
      });
      const t0 = Date.now();
      await Deno.writeTextFile(
        csv,
        `${rows + i + 1},${(2500 - 9.9 * Math.sqrt(rows + i + 1)).toFixed(2)}\n`,
        {
          append: true,
        },
      );
      // One call that returns when the page saw it (no polling that would load the page).
      const { dom, painted } = await withTimeout(
        page.evaluate(() =>
          (globalThis as unknown as { seen: Promise<{ dom: number; painted: number }> }).seen
        ),
        30_000,
      );
      const seen = painted;
      if (trace) {
        console.log(`dom ${dom - t0} painted ${painted - t0}`);
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
      if (i >= WARM_UP) {
        times.push(seen - t0);
        domTimes.push(dom - t0);
        // The server's own time for the run, as the page shows it (its `run` message).
        const ms = await page.$eval(".pl-page", (e) => Number(e.getAttribute("data-run-ms")));
        if (ms > 0) serverMs.push(ms);
      }
    }
  } finally {
    await b.close();
    await served.close();
  }
  times.sort((x, y) => x - y);
  domTimes.sort((x, y) => x - y);
  serverMs.sort((x, y) => x - y);
  const target = targets(rows);
  return {
    view,
    rows,
    cells: CELLS.length,
    kinds: ["table", "fit ×6", "compare", "check", "chart ×3"],
    repetitions: reps,
    p50_ms: quantile(times, 0.5),
    p95_ms: quantile(times, 0.95),
    max_ms: times[times.length - 1],
    dom_p50_ms: quantile(domTimes, 0.5),
    dom_p95_ms: quantile(domTimes, 0.95),
    server_run_p50_ms: serverMs.length ? quantile(serverMs, 0.5) : null,
    target_p50_ms: target.p50,
    target_p95_ms: target.p95,
  };
}

if (import.meta.main) {
  const arg = (name: string) =>
    Deno.args.find((a) => a.startsWith(`--${name}=`))?.slice(name.length + 3);
  const reps = Number(arg("reps") ?? 20);
  const view = arg("view") === "charts" ? "charts" : "top";
  const rows = Number(arg("rows") ?? 10_000);
  console.log(JSON.stringify(await updateLatency(reps, view, rows), null, 2));
}
