/**
 * Intervals beyond Wald in `deno task bench` (issue 19's targets), in this
 * process, on seeded invented data: y = a·exp(−b·x) + c, n = 100 (the
 * nonlinear benchmark problem of kernel/optim/lm_bench.ts).
 *
 * - `profile_exp3_n100`: profile-likelihood intervals of the three
 *   parameters (both sides of each: bracketing and root finding, each step a
 *   constrained fit); target under 100 ms (median of seven after a warm-up).
 * - `bootstrap_2000_exp3_n100`: 2,000 residual-bootstrap refits, with the
 *   jackknife BCa needs (n more refits) and the intervals; target under 2 s
 *   (median of three).
 *
 * What is timed is the interval step the fit cell runs after its fit
 * (`Fit.intervals.ms`), read off the kind's own run.
 *
 * @module
 */
import { seededRandom } from "../../kernel/random.ts";
import type { Table } from "../../kernel/contract/mod.ts";
import { DEFAULT_SETTINGS } from "../../kernel/document/mod.ts";
import { fitKind } from "../../cells/fit/mod.ts";
import type { Fit } from "../../cells/fit/fit.ts";

const N = 100;

function benchTable(seed: number): Table {
  const rnd = seededRandom(seed);
  const x = Float64Array.from({ length: N }, (_, i) => (i * 5) / (N - 1));
  const y = x.map((v) =>
    Number((2.5 * Math.exp(-1.3 * v) + 0.5 + 0.02 * rnd.normal()).toPrecision(10))
  );
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
    columns: [column("x", x), column("y", y)],
    rows: Int32Array.from({ length: N }, (_, i) => i + 1),
    rowsRead: N,
    excluded: [],
    sha256: null,
    source: null,
  };
}

async function timed(options: Record<string, unknown>, which: "profile" | "bootstrap") {
  const settings = { ...DEFAULT_SETTINGS, extra: {} };
  const spec = fitKind.parse({
    name: "bench",
    kind: "fit",
    body: "",
    options: { on: "t", model: "y = a*exp(-b*x) + c", start: { a: 2, b: 1, c: 0 }, ...options },
    settings,
    warn() {},
  });
  const out = await fitKind.run(spec, {
    name: "bench",
    settings,
    inputs: { t: benchTable(20261205) },
    files: {},
    warn() {},
    progress() {},
  }) as Fit;
  return out.intervals!.ms[which]!;
}

async function figure(
  options: Record<string, unknown>,
  which: "profile" | "bootstrap",
  runs: number,
  target: number,
) {
  await timed(options, which);
  const times: number[] = [];
  for (let i = 0; i < runs; i++) times.push(await timed(options, which));
  times.sort((a, b) => a - b);
  return {
    rows: N,
    parameters: 3,
    runs,
    min_ms: times[0],
    median_ms: times[Math.floor(runs / 2)],
    max_ms: times[runs - 1],
    target_ms: target,
  };
}

/**
 * The interval figures.
 *
 * @returns `profile_exp3_n100` and `bootstrap_2000_exp3_n100`.
 */
export async function intervalFigures(): Promise<Record<string, unknown>> {
  return {
    profile_exp3_n100: await figure({ intervals: ["profile"] }, "profile", 7, 100),
    bootstrap_2000_exp3_n100: {
      ...await figure(
        { intervals: ["wald"], bootstrap: { resamples: 2000 } },
        "bootstrap",
        3,
        2000,
      ),
      resamples: 2000,
      resample: "residuals",
    },
  };
}

if (import.meta.main) console.log(JSON.stringify(await intervalFigures(), null, 2));
