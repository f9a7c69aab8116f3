/**
 * The side-by-side figure of `deno task bench` (issue 16, item 6): Plumb
 * against the usual Python route on the same million-row CSV, each a whole
 * new process timed from spawn to exit (min/median/max of three, the
 * commands taking turns round by round), with peak resident memory
 * (measure.ts):
 *
 * - `plumb_run`: `plumb run` of the five-cell document (documents.ts), the
 *   human summary;
 * - `plumb_run_json`: `plumb run --json > /dev/null` of the same;
 * - `peer`: the pandas + statsmodels script (peer_ols.py: read, fit the ten
 *   predictors, print the summary), under Debian's Python (peer.ts installs
 *   its packages; without them the peer's figures are null and
 *   `peer_skipped` says why, in one line on standard error too);
 * - ingest, whole process minus start-up: the file's MB over (table-only
 *   document − empty document) for Plumb, (read − import) for pandas.
 *
 * Ratios, lower is better: `run_ratio` = plumb_run / peer (target below 1;
 * the issue aims at 0.5), `json_ratio` = plumb_run_json / peer,
 * `json_over_run` = plumb_run_json / plumb_run (target 1.5),
 * `ingest_ratio` = peer's MB/s / Plumb's. Targets (`target_*` beside the
 * value they judge, as test/bench/run.ts reads them) are set at the
 * issue's size only, 1,000,000 rows: peak memory of `plumb run` under
 * 600 MB, ingest 250 MB/s or better.
 *
 * `plumb run` is started as `deno run --allow-read --allow-env=… cells/main.ts
 * run DOC --no-history` with this Deno (no npx, no task runner, no run
 * history: the history has its own figure). The data (generate.ts) is made
 * once into the cache folder and kept; making it is not timed.
 *
 * Runs on its own (prints the figure as JSON); `--root` measures another
 * checkout's `plumb` (for before/after figures) with this one's documents,
 * data and peer:
 *
 * ```sh
 * npx -y deno@2.9.6 run --allow-read --allow-write --allow-run --allow-env test/bench/scale/scale.ts [--rows=100000] [--runs=3] [--root=../other-checkout]
 * ```
 *
 * @module
 */
import { resolve } from "node:path";
import { pathToFileURL } from "node:url";
import { type Spread, spread } from "../startup.ts";
import {
  EMPTY_DOCUMENT,
  fiveCellDocument,
  plumbRunCommand,
  tableOnlyDocument,
} from "./documents.ts";
import { scaleCsv } from "./generate.ts";
import { measure, type Measured } from "./measure.ts";
import { preparePeer } from "./peer.ts";

/** The size. */
export const MILLION = 1_000_000;
/** The quick size. */
export const QUICK_ROWS = 100_000;

/**
 * Timings of one command, its processor time (user + system, median, ms) and
 * its peak memory (MB); the last two null where they cannot be read.
 */
export interface Timed extends Spread {
  cpu_median_ms: number | null;
  peak_mb: number | null;
  peak_mb_max: number | null;
}

/** The figure. */
export interface ScaleFigure {
  rows: number;
  columns: number;
  megabytes: number;
  data: string;
  plumb_run: Timed;
  plumb_run_json: Timed;
  peer: Timed | null;
  peer_versions: string | null;
  peer_skipped?: string;
  ingest: Record<"plumb_table_only" | "plumb_empty", Timed> & {
    peer_read: Timed | null;
    peer_start: Timed | null;
  };
  ingest_mb_per_second: number | null;
  peer_ingest_mb_per_second: number | null;
  ingest_ratio: number | null;
  run_ratio: number | null;
  json_ratio: number | null;
  json_over_run: number;
  peak_mb: number | null;
  json_peak_mb: number | null;
  /** The machine's one-minute load average at the start and at the end: above 1 others shared it. */
  load_average: { start: number | null; end: number | null };
  target_run_ratio?: number;
  target_json_over_run?: number;
  target_peak_mb?: number;
  target_ingest_mb_per_second?: number;
}

/** Options of {@link scaleFigures}. */
export interface ScaleOptions {
  /** Data rows (default a million; {@link QUICK_ROWS} for a quick run). */
  rows?: number;
  /** Counted runs of each command (default 3). */
  runs?: number;
  /** Where progress lines go (default standard error). */
  say?: (line: string) => void;
}

function timed(ms: number[], cpu: (number | null)[], peaks: (number | null)[]): Timed {
  const known = peaks.filter((p): p is number => p !== null).sort((a, b) => a - b);
  const cpuKnown = cpu.filter((c): c is number => c !== null);
  return {
    ...spread(ms),
    cpu_median_ms: cpuKnown.length ? spread(cpuKnown).median_ms : null,
    peak_mb: known.length ? Math.round(known[known.length >> 1]) : null,
    peak_mb_max: known.length ? Math.round(known[known.length - 1]) : null,
  };
}

/** A command run several times, its results kept. */
class Series {
  readonly runs: Measured[] = [];
  constructor(
    readonly label: string,
    readonly command: string[],
    readonly check: (m: Measured) => boolean,
    readonly stdout: "piped" | "null" = "piped",
  ) {}
  async once(cwd: string): Promise<void> {
    const m = await measure(this.command, { cwd, stdout: this.stdout });
    if (m.code !== 0 || !this.check(m)) {
      const said = (m.stderr || m.stdout).trim().split("\n").slice(-3).join(" / ");
      throw new Error(
        `scale: ${this.label} exited with ${m.code}: ${said || "it printed nothing"}`,
      );
    }
    this.runs.push(m);
  }
  figure(): Timed {
    return timed(
      this.runs.map((r) => r.ms),
      this.runs.map((r) => r.cpuMs),
      this.runs.map((r) => r.peakMb),
    );
  }
}

const round = (x: number, digits = 3) => Number(x.toPrecision(digits));

/** The one-minute load average (through `cat`: Deno opens /proc only with every permission). */
async function loadAverage(): Promise<number | null> {
  try {
    const out = await new Deno.Command("cat", { args: ["/proc/loadavg"], stdout: "piped" })
      .output();
    const first = Number(new TextDecoder().decode(out.stdout).split(" ")[0]);
    return Number.isFinite(first) ? first : null;
  } catch {
    return null;
  }
}

/**
 * Measures the side-by-side figure.
 *
 * @param root The root folder of the repository whose `plumb` is measured.
 * @param options Rows, runs and where progress goes.
 * @returns The figure (see the module's documentation).
 * @throws Error when a Plumb run or the peer script fails.
 */
export async function scaleFigures(root: URL, options: ScaleOptions = {}): Promise<ScaleFigure> {
  const rows = options.rows ?? MILLION, runs = options.runs ?? 3;
  const say = options.say ?? ((line: string) => console.error(line));
  say(`scale: the ${rows}-row CSV (made once, kept in the cache folder)`);
  const csv = await scaleCsv(rows);
  const documents = {
    five: [`scale-${rows}.md`, fiveCellDocument(csv.name, rows)],
    table: [`scale-${rows}-table.md`, tableOnlyDocument(csv.name)],
    empty: ["scale-empty.md", EMPTY_DOCUMENT],
  } as const;
  for (const [name, text] of Object.values(documents)) {
    await Deno.writeTextFile(`${csv.dir}/${name}`, text);
  }
  const plumb = (doc: string, ...extra: string[]) => plumbRunCommand(root, doc, ...extra);
  const counted = (n: number) => (m: Measured) => m.stdout.includes(`${n} current, 0 failed`);
  const series = [
    new Series("plumb run", plumb(documents.five[0]), counted(5)),
    new Series("plumb run --json", plumb(documents.five[0], "--json"), () => true, "null"),
    new Series("plumb run (table only)", plumb(documents.table[0]), counted(1)),
    new Series("plumb run (no cell)", plumb(documents.empty[0]), counted(0)),
  ];
  const peer = await preparePeer((line) => say(`scale: ${line}`));
  if ("skipped" in peer) {
    say(`scale: the side-by-side with pandas + statsmodels is skipped: ${peer.skipped}`);
  } else {
    const script = new URL("peer_ols.py", import.meta.url).pathname;
    const py = (...args: string[]) => [peer.python, script, ...args];
    series.push(
      new Series(
        "peer script",
        py("fit", csv.path),
        (m) => m.stdout.includes("OLS Regression Results"),
      ),
      new Series("peer read", py("read", csv.path), (m) => m.stdout.includes(`rows ${rows}`)),
      new Series("peer start", py("start"), (m) => m.stdout.startsWith("pandas")),
    );
  }
  // Uncounted: fills Deno's transpile and code caches and the page cache with the file.
  const loadAtStart = await loadAverage();
  say("scale: warm-up (a run of each small command, the table read once)");
  for (const s of series.slice(2)) await s.once(csv.dir), s.runs.pop();
  for (let r = 1; r <= runs; r++) {
    for (const s of series) {
      say(`scale: round ${r} of ${runs}: ${s.label}`);
      await s.once(csv.dir);
    }
  }
  const [run, json, table, empty, fit, read, start] = series.map((s) => s.figure());
  const mb = csv.bytes / 1e6;
  // Null when the difference is lost in the machine's noise (a small file on a busy machine).
  const rate = (a: Timed, b: Timed) =>
    a.median_ms > b.median_ms ? round(mb / ((a.median_ms - b.median_ms) / 1000)) : null;
  const ingest = rate(table, empty);
  const peerIngest = fit ? rate(read, start) : null;
  const ratio = (a: number, b: number | undefined) => (b ? round(a / b) : null);
  const figure: ScaleFigure = {
    rows,
    columns: 11,
    megabytes: round(mb, 4),
    data: csv.path,
    plumb_run: run,
    plumb_run_json: json,
    peer: fit ?? null,
    peer_versions: "skipped" in peer ? null : peer.versions,
    ...("skipped" in peer ? { peer_skipped: peer.skipped } : {}),
    ingest: {
      plumb_table_only: table,
      plumb_empty: empty,
      peer_read: read ?? null,
      peer_start: start ?? null,
    },
    ingest_mb_per_second: ingest,
    peer_ingest_mb_per_second: peerIngest,
    ingest_ratio: peerIngest === null || ingest === null ? null : round(peerIngest / ingest),
    run_ratio: ratio(run.median_ms, fit?.median_ms),
    json_ratio: ratio(json.median_ms, fit?.median_ms),
    json_over_run: round(json.median_ms / run.median_ms),
    peak_mb: run.peak_mb,
    json_peak_mb: json.peak_mb,
    load_average: { start: loadAtStart, end: await loadAverage() },
  };
  if (rows === MILLION) {
    Object.assign(figure, {
      target_run_ratio: 1,
      target_json_over_run: 1.5,
      target_peak_mb: 600,
      target_ingest_mb_per_second: 250,
    });
  }
  return figure;
}

if (import.meta.main) {
  const arg = (name: string) => Deno.args.find((a) => a.startsWith(`--${name}=`))?.split("=")[1];
  const root = arg("root");
  const here = new URL("../../../", import.meta.url);
  const figure = await scaleFigures(root ? pathToFileURL(resolve(root) + "/") : here, {
    rows: Number(arg("rows") ?? MILLION),
    runs: Number(arg("runs") ?? 3),
  });
  console.log(JSON.stringify(figure, null, 2));
}
