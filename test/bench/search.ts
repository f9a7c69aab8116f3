/**
 * `search` in `deno task bench`: how long a search cell's computation takes
 * (issue 16's targets), in this process, on seeded invented data.
 *
 * - `search_15`: 15 candidates (32,768 subsets) at n = 5,000, by BIC;
 *   target under 1 s (median of five after one warm-up run).
 * - `search_25`: 25 candidates (33,554,432 subsets) at n = 5,000, by BIC;
 *   target under 30 s (median of three).
 * - `search_15_loo`: the 15-candidate search by leave-one-out error (no
 *   target; PRESS needs a fit per subset examined).
 *
 * Data: candidate k standard normal times 10^(k/3) (the units of issue 16's
 * benchmark generator), the response a combination of the first ten plus
 * standard-normal noise, every value rounded to 10 significant digits as if
 * printed with %.10g. What is timed is the kind's parse, run and summary on
 * the table (the table's own reading is the csv_ingest figure's).
 *
 * Call: `const search = await step("search: 15 and 25 candidates at n = 5,000",
 * searchFigures)`, then spread `...search` into the report's figures.
 *
 * @module
 */
import { seededRandom } from "../../kernel/random.ts";
import type { Table } from "../../kernel/contract/mod.ts";
import { DEFAULT_SETTINGS } from "../../kernel/document/mod.ts";
import { searchKind } from "../../cells/search/mod.ts";

/** Rows of every benchmark search. */
const ROWS = 5000;

/** A seeded table of `c` candidates x0…x(c−1) and a response y. */
function benchTable(c: number, seed: number): Table {
  const rnd = seededRandom(seed);
  const print = (v: number) => Number(v.toPrecision(10));
  const x = Array.from({ length: c }, (_, k) => {
    const scale = 10 ** (k / 3);
    return Float64Array.from({ length: ROWS }, () => print(rnd.normal() * scale));
  });
  const y = Float64Array.from({ length: ROWS }, (_, i) => {
    let s = 12;
    for (let k = 0; k < Math.min(10, c); k++) s += ((k % 3) - 1 + 0.5) * x[k][i] / 10 ** (k / 3);
    return print(s + rnd.normal());
  });
  const column = (name: string, values: Float64Array) => ({
    name,
    type: "number" as const,
    unit: null,
    values,
    lo: null,
    missing: 0,
  });
  return {
    type: "Table",
    columns: [...x.map((v, k) => column(`x${k}`, v)), column("y", y)],
    rows: Int32Array.from({ length: ROWS }, (_, i) => i + 1),
    rowsRead: ROWS,
    excluded: [],
    sha256: null,
    source: null,
  };
}

/** One timed search: parse, run and summary, in ms, and the subsets it ranked. */
async function timeSearch(table: Table, by: string): Promise<{ ms: number; subsets: number }> {
  const settings = { ...DEFAULT_SETTINGS, extra: {} };
  const t0 = performance.now();
  const spec = searchKind.parse({
    name: "bench",
    kind: "search",
    body: "",
    options: { on: "t", response: "y", by },
    settings,
    warn() {},
  });
  const out = await searchKind.run(spec, {
    name: "bench",
    settings,
    inputs: { t: table },
    files: {},
    warn() {},
    progress() {},
  });
  const result = searchKind.summary(out, spec);
  return { ms: performance.now() - t0, subsets: result.subsets_evaluated };
}

async function figure(c: number, by: string, runs: number, target: number | null) {
  const table = benchTable(c, 20261216 + c);
  if (c <= 20) await timeSearch(table, by); // warm-up
  const times: number[] = [];
  let subsets = 0;
  for (let i = 0; i < runs; i++) {
    const t = await timeSearch(table, by);
    times.push(t.ms);
    subsets = t.subsets;
  }
  times.sort((a, b) => a - b);
  return {
    candidates: c,
    rows: ROWS,
    by,
    subsets,
    runs,
    min_ms: times[0],
    median_ms: times[Math.floor(runs / 2)],
    max_ms: times[runs - 1],
    ...(target === null ? {} : { target_ms: target }),
  };
}

/**
 * The search figures.
 *
 * @returns `search_15`, `search_25` and `search_15_loo`, each with its times.
 */
export async function searchFigures(): Promise<Record<string, unknown>> {
  return {
    search_15: await figure(15, "bic", 5, 1000),
    search_15_loo: await figure(15, "loo", 3, null),
    search_25: await figure(25, "bic", 3, 30000),
  };
}

if (import.meta.main) console.log(JSON.stringify(await searchFigures(), null, 2));
