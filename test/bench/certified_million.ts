/**
 * The `certified_million` figure of `deno task bench`: NIST StRD linear sets
 * replicated to about 1,000,000 rows, fitted on the certified path (double
 * QR refined against the data as printed, cells/fit/_precise_linear.ts) and
 * on the double path alone, for digits and time.
 *
 * Replicating a set k times leaves its certified estimates unchanged (the
 * normal equations are multiplied by k); its standard errors become
 * SE·√((n₀ − p)/(k·n₀ − p)). Each set's data lines are repeated as printed
 * into one CSV and read by the table kind (Filip and Wampler4 keep the
 * table's decimal corrections at 2,000,000 numbers; Longley's 7,000,000 are
 * over the table's limit, and the fit recovers them from the doubles,
 * cells/fit/_dd_design.ts `printedLo`). Time is the fit's own work on the table's
 * columns (`buildProblem`, `solveLinear`, `fitStatistics`), each run in a
 * new process as `plumb run` computes a fit (cold code, memory not yet
 * touched), the median of three runs of each path, the paths alternating;
 * and, for comparison, both paths in one warm process (`warm_*`: a
 * long-lived worker, code optimised and memory reused, where the double
 * path is cheapest and the ratio largest).
 *
 * Run alone (prints JSON): deno run --allow-read --allow-run --allow-env test/bench/certified_million.ts
 *
 * @module
 */
import { tableKind } from "../../cells/table/mod.ts";
import { fitKind } from "../../cells/fit/mod.ts";
import type { FitSpec } from "../../cells/fit/mod.ts";
import { buildProblem } from "../../cells/fit/_data.ts";
import { solveLinear } from "../../cells/fit/solve_linear.ts";
import { fitStatistics } from "../../cells/fit/_statistics.ts";
import { DEFAULT_SETTINGS } from "../../kernel/document/mod.ts";
import type { ParseContext, RunContext, Table } from "../../kernel/contract/mod.ts";
import { lre, REFERENCE_DIR, strdCsv } from "../reference/_reference.ts";

/** The sets of the figure and their models (as test/reference/strd_linear_test.ts writes them). */
const SETS: Record<string, string> = {
  Filip: "y = polynomial(x, 10)",
  Wampler4: "y = polynomial(x, 5)",
  Longley: "y = linear(x1, x2, x3, x4, x5, x6)",
};

/** Rows each set is replicated to, about. */
export const ROWS = 1_000_000;
const RUNS = 3;

interface ManifestSet {
  name: string;
  file: string;
  data: { first_line: number; columns: string[]; n_rows: number };
  parameters: { name: string; estimate: number; std_dev: number }[];
}

/** One set's figure. */
export interface CertifiedSet {
  set: string;
  rows: number;
  parameters: number;
  /** Worst LRE of the estimates against the certificate (cap 15). */
  lre_certified: number;
  lre_double: number;
  /** Worst LRE of the standard errors against the certificate scaled to the rows. */
  lre_std_error_certified: number;
  /** Fresh process per fit (as `plumb run`): medians, and their ratio. */
  median_ms_certified: number;
  median_ms_double: number;
  ratio: number;
  /** One warm process (as a long-lived worker): medians, and their ratio. */
  warm_ms_certified: number;
  warm_ms_double: number;
  warm_ratio: number;
}

const settings = { ...DEFAULT_SETTINGS, title: "bench", maxFileBytes: 1 << 30, extra: {} };

function context(name: string, options: Record<string, unknown>): ParseContext {
  return { name, kind: "", options, body: "", settings, warn: () => {} };
}

/** The set's table: its data lines repeated to about {@link ROWS} rows, read by the table kind. */
async function replicatedTable(set: ManifestSet): Promise<Table> {
  const csv = strdCsv(set, await Deno.readTextFile(new URL(`strd/${set.file}`, REFERENCE_DIR)));
  const [head, ...lines] = csv.trimEnd().split("\n");
  const k = Math.round(ROWS / lines.length);
  const text = [head, ...Array.from({ length: k }, () => lines).flat()].join("\n") + "\n";
  const bytes = new TextEncoder().encode(text);
  const ctx: RunContext = {
    name: "data",
    settings,
    inputs: {},
    files: { "data.csv": { path: "data.csv", bytes, sha256: "" } },
    warn: () => {},
    progress: () => {},
  };
  return tableKind.run(tableKind.parse(context("data", { from: "data.csv" })), ctx) as Table;
}

function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

/** One fit of a set on one path, timed from the table to the statistics (the child's work). */
async function fitOnce(set: ManifestSet, refine: boolean) {
  const table = await replicatedTable(set);
  const spec = fitKind.parse(context("fit", { on: "data", model: SETS[set.name] })) as FitSpec;
  const t0 = performance.now();
  const problem = buildProblem("fit", spec, table, () => {});
  const solution = solveLinear(problem, { refine });
  const stats = fitStatistics(problem, solution, {
    confidence: 0.95,
    weighting: "none",
    countVariance: true,
  }, () => {});
  return {
    ms: performance.now() - t0,
    n: problem.n,
    estimates: Array.from(solution.estimates),
    stdErrors: stats.stdErrors,
  };
}

/**
 * Both paths in one process after a warm-up, a garbage collection before
 * each run (a long-lived worker: code optimised, memory reused), medians of
 * {@link RUNS} alternating runs.
 */
async function warm(set: ManifestSet) {
  const table = await replicatedTable(set);
  const spec = fitKind.parse(context("fit", { on: "data", model: SETS[set.name] })) as FitSpec;
  const gc = (globalThis as { gc?: () => void }).gc ?? (() => {});
  const once = (refine: boolean) => {
    gc();
    const t0 = performance.now();
    const problem = buildProblem("fit", spec, table, () => {});
    const solution = solveLinear(problem, { refine });
    fitStatistics(
      problem,
      solution,
      { confidence: 0.95, weighting: "none", countVariance: true },
      () => {},
    );
    return performance.now() - t0;
  };
  once(true), once(false);
  const t = { certified: [] as number[], double: [] as number[] };
  for (let r = 0; r < RUNS; r++) t.double.push(once(false)), t.certified.push(once(true));
  return { certified: median(t.certified), double: median(t.double) };
}

/** Runs {@link fitOnce} in a new process (as `plumb run` computes a fit: cold code, new memory). */
async function child(name: string, path: "certified" | "double") {
  return JSON.parse(await subprocess(["--child", name, path])) as Awaited<
    ReturnType<typeof fitOnce>
  >;
}

async function subprocess(args: string[]): Promise<string> {
  const out = await new Deno.Command(Deno.execPath(), {
    args: [
      "run",
      "--allow-read",
      "--allow-env",
      "--v8-flags=--expose-gc",
      import.meta.filename!,
      ...args,
    ],
    stdout: "piped",
    stderr: "inherit",
  }).output();
  if (!out.success) throw new Error(`certified_million: "${args.join(" ")}" failed`);
  return new TextDecoder().decode(out.stdout);
}

/** Fits one set both ways, {@link RUNS} times each, alternating. */
async function measure(set: ManifestSet): Promise<CertifiedSet> {
  const runs = {
    certified: [] as Awaited<ReturnType<typeof fitOnce>>[],
    double: [] as Awaited<ReturnType<typeof fitOnce>>[],
  };
  for (let r = 0; r < RUNS; r++) {
    for (const path of ["double", "certified"] as const) {
      runs[path].push(await child(set.name, path));
    }
  }
  const last = { certified: runs.certified.at(-1)!, double: runs.double.at(-1)! };
  const n = last.certified.n, p = set.parameters.length;
  const worst = (est: number[]) =>
    Math.min(...set.parameters.map((c, j) => lre(est[j], c.estimate)));
  const seScale = Math.sqrt((set.data.n_rows - p) / (n - p));
  const se = last.certified.stdErrors;
  const ms = (path: "certified" | "double") => median(runs[path].map((r) => r.ms));
  const w = JSON.parse(await subprocess(["--warm", set.name])) as {
    certified: number;
    double: number;
  };
  return {
    set: set.name,
    rows: n,
    parameters: p,
    lre_certified: worst(last.certified.estimates),
    lre_double: worst(last.double.estimates),
    lre_std_error_certified: Math.min(
      ...set.parameters.map((c, j) => lre(se[j] ?? NaN, c.std_dev * seScale)),
    ),
    median_ms_certified: ms("certified"),
    median_ms_double: ms("double"),
    ratio: ms("certified") / ms("double"),
    warm_ms_certified: w.certified,
    warm_ms_double: w.double,
    warm_ratio: w.certified / w.double,
  };
}

/**
 * Measures the figure.
 *
 * @returns Per set digits and times, the worst over the sets and the targets.
 */
export async function certifiedMillion() {
  const all = await manifestSets();
  const sets: CertifiedSet[] = [];
  for (const name of Object.keys(SETS)) sets.push(await measure(all.find((s) => s.name === name)!));
  return {
    sets,
    worst_lre_certified: Math.min(...sets.map((s) => s.lre_certified)),
    worst_lre_double: Math.min(...sets.map((s) => s.lre_double)),
    largest_ratio: Math.max(...sets.map((s) => s.ratio)),
    largest_warm_ratio: Math.max(...sets.map((s) => s.warm_ratio)),
    target_lre: 12,
    target_ratio: 1.5,
    runs: RUNS,
  };
}

async function manifestSets(): Promise<ManifestSet[]> {
  const text = await Deno.readTextFile(new URL("strd/manifest.json", REFERENCE_DIR));
  return (JSON.parse(text) as { sets: ManifestSet[] }).sets;
}

if (import.meta.main) {
  const [flag, name, path] = Deno.args;
  const set = async () => (await manifestSets()).find((s) => s.name === name)!;
  if (flag === "--child") {
    console.log(JSON.stringify(await fitOnce(await set(), path === "certified")));
  } else if (flag === "--warm") console.log(JSON.stringify(await warm(await set())));
  else console.log(JSON.stringify(await certifiedMillion(), null, 2));
}
