/**
 * `calc` in `deno task bench` (issue 17): how long a calc cell takes from
 * the moment the kernel schedules it to its result, through the real path
 * (a Session with the product's kinds and compute worker, the type check
 * and the child process of kernel/sandbox), on invented data.
 *
 * The document: a 40-row CSV → a `table` → a straight-line `fit` → a `calc`
 * that reads both (the x where the line crosses a threshold, and a count).
 * Each repetition rewrites one value of the CSV (the shape stays, so the
 * check is kept by its module's digest), tells the session's file store and
 * runs the document: the table, the fit and the calc rerun.
 *
 * ```
 *  write CSV ─▶ session.run ─▶ table ─▶ fit ─▶ calc: "computing" ─────────▶ settled
 *                                              │◀──────── round trip ────────▶│
 *                                              worker: inputs, check (kept), │
 *                                              child process (spare): run ───┘
 * ```
 *
 * - `calc_round_trip`: the calc's "computing" event (its inputs answered,
 *   its turn in the worker) to its settled report, with the code already
 *   checked; p50 and max over the repetitions after two warm-ups; target
 *   p50 under 150 ms. Beside it, per repetition, the worker's time for the
 *   cell (`CellReport.ms`) and the child's (`run_ms`, start of the job to
 *   the child's exit), as p50, to show where the time goes.
 * - `calc_first_check`: the same round trip for code the checker has not
 *   seen (a new comment line each time: a new digest), and the whole type
 *   check alone (`check_ms`: the round trip less the warm p50); no target.
 *
 * Call: `const calc = await step("calc: …", calcFigures)`, then spread
 * `...calc` into the report's figures. On its own:
 * `deno run -A test/bench/calc.ts [--reps=N]`.
 *
 * @module
 */
import { registry } from "../../cells/mod.ts";
import { Session, type SessionEvent } from "../../kernel/session/session.ts";
import { seededRandom } from "../../kernel/random.ts";
import { spread } from "./startup.ts";

const WORKER = new URL("../../cells/worker.ts", import.meta.url);
/** Rows of the invented data. */
const ROWS = 40;

/** The CSV: y = 2.5 + 0.8·x plus seeded noise, x = 1…40; `nudge` moves one value. */
function csv(nudge: number): string {
  const rnd = seededRandom(20261217);
  const lines = ["x,y"];
  for (let x = 1; x <= ROWS; x++) {
    const y = 2.5 + 0.8 * x + 0.3 * rnd.normal() + (x === 17 ? nudge : 0);
    lines.push(`${x},${y.toFixed(4)}`);
  }
  return lines.join("\n") + "\n";
}

function block(kind: string, name: string, body: string): string {
  return "```" + `${kind} ${name}\n${body}\n` + "```\n\n";
}

/** The document; `mark` goes into the calc's code as a comment (a new module to check). */
function documentText(mark?: string): string {
  return "# calc round trip (bench)\n\n" +
    block("table", "pts", "from: points.csv") +
    block("fit", "line", "on: pts\nmodel: y = a + b*x") +
    block(
      "calc",
      "crossing",
      "reads: line, pts\n---\n" + (mark === undefined ? "" : `// ${mark}\n`) +
        "const { a, b } = line.estimates;\n" +
        "const above = pts.columns.y.filter((v) => v > 20).length;\n" +
        "return { x: (20 - a) / b, above, r2: line.r2 };",
    );
}

/** One timed run: the calc's round trip, the worker's time for it and the child's. */
interface Timing {
  roundTrip: number;
  workerMs: number;
  childMs: number;
}

/** Runs the document once and times its calc cell from its "computing" event to its report. */
async function timedRun(
  session: Session,
  events: { onEvent: (e: SessionEvent) => void },
  source: string,
): Promise<Timing> {
  let start = NaN, end = NaN;
  events.onEvent = (e) => {
    if (e.name !== "crossing") return;
    if (e.state === "computing" && Number.isNaN(start)) start = performance.now();
    if (e.report) end = performance.now();
  };
  const report = await session.run(source);
  const c = report.cells.find((x) => x.name === "crossing")!;
  if (c.state !== "current") {
    throw new Error(`The bench's calc cell is ${c.state}: ${c.error?.message ?? ""}`);
  }
  if (!report.ran.includes("crossing")) throw new Error("The bench's calc cell did not rerun");
  return {
    roundTrip: end - start,
    workerMs: c.ms,
    childMs: (c.result as { run_ms: number }).run_ms,
  };
}

function median(xs: number[]): number {
  return spread(xs).median_ms;
}

/** Idle time before each paced repetition (ms): the spare child is up, as between edits. */
const PAUSE_MS = 500;

/** Round trips as the figure reports them: p50, min, max, and the worker's and child's p50. */
function roundTrips(times: Timing[]) {
  const round = spread(times.map((t) => t.roundTrip));
  return {
    runs: round.runs,
    p50_ms: round.median_ms,
    min_ms: round.min_ms,
    max_ms: round.max_ms,
    worker_ms_p50: median(times.map((t) => t.workerMs)),
    child_ms_p50: median(times.map((t) => t.childMs)),
  };
}

/**
 * The calc figures.
 *
 * @param reps Counted repetitions of each warm round trip (after two warm-ups).
 * @param checks Counted first checks.
 * @returns `calc_round_trip` (paced, with the target; `back_to_back` beside it) and
 *   `calc_first_check`.
 * @throws Error when the calc cell does not come out current or does not rerun.
 */
export async function calcFigures(reps = 20, checks = 3): Promise<Record<string, unknown>> {
  const dir = await Deno.makeTempDir({ prefix: "plumb-bench-calc-" });
  const events = { onEvent: (_e: SessionEvent) => {} };
  const session = new Session({
    registry,
    workerUrl: WORKER,
    dir,
    page: true, // as the live workspace runs it
    onEvent: (e) => events.onEvent(e),
  });
  const path = `${dir}/points.csv`;
  let nudge = 0;
  const nextData = async () => {
    await Deno.writeTextFile(path, csv(++nudge * 1e-3));
    session.files.forget(path);
  };
  const repeat = async (source: string, pause: number) => {
    const times: Timing[] = [];
    for (let i = 0; i < reps + 2; i++) {
      if (pause > 0) await new Promise((r) => setTimeout(r, pause));
      await nextData();
      const t = await timedRun(session, events, source);
      if (i >= 2) times.push(t);
    }
    return times;
  };
  try {
    // Each first run checks code no checker has seen: a new digest, also for Deno's own
    // cache of checks on disk, which outlives this process.
    const marks = Array.from({ length: checks }, () => `check ${crypto.randomUUID()}`);
    const firsts: Timing[] = [];
    for (const mark of marks) {
      await new Promise((r) => setTimeout(r, PAUSE_MS));
      await nextData();
      firsts.push(await timedRun(session, events, documentText(mark)));
    }
    const source = documentText(marks.at(-1)); // the last one checked: kept
    const paced = roundTrips(await repeat(source, PAUSE_MS));
    const backToBack = roundTrips(await repeat(source, 0));
    const first = spread(firsts.map((t) => t.roundTrip));
    return {
      calc_round_trip: {
        document: `${ROWS}-row CSV → table → linear fit → calc reading both; data changed`,
        pause_ms: PAUSE_MS,
        ...paced,
        target_ms: 150,
        back_to_back: backToBack,
      },
      calc_first_check: {
        runs: first.runs,
        round_trip_ms: first,
        check_ms_median: Math.round((first.median_ms - paced.p50_ms) * 10) / 10,
        first_in_process_ms: Math.round(firsts[0].roundTrip * 10) / 10,
      },
    };
  } finally {
    session.close();
    await Deno.remove(dir, { recursive: true });
  }
}

if (import.meta.main) {
  const reps = Number(Deno.args.find((a) => a.startsWith("--reps="))?.slice(7) ?? 20);
  console.log(JSON.stringify(await calcFigures(reps), null, 2));
}
