/**
 * Benchmark of the `check` cell's diagnostics at scale (issue 16, item 2) on
 * a seeded 1,000,000 × 10 design: 10 standard-normal predictors, column k
 * scaled by 10^(k/3), y = Σ k·x_k + noise, every value rounded to 10
 * significant digits as a CSV printed with `%.10g` would hold it. The fit is
 * made once; each iteration checks a fresh shallow copy of it, so the
 * per-fit caches (leverage, factor, basis) are computed inside the timing
 * as in a run where the check is the fit's first reader.
 *
 * Run: deno bench cells/check/check_bench.ts
 *
 * Time (wall and processor, the latter steadier on a shared machine) and
 * peak memory of one check (the process's peak resident set,
 * reset through /proc/self/clear_refs just before the check where Linux
 * allows it) are printed by
 *
 *   deno run -A cells/check/check_bench.ts [rows]    (Deno reads /proc/self only with -A)
 */
import { cpuUsage } from "node:process";
import { seededRandom } from "../../kernel/random.ts";
import type { Fit } from "../fit/mod.ts";
import { fitOf } from "../predict/_fixtures_test.ts";
import { diagnose } from "./diagnose.ts";
import type { CheckSpec } from "./spec.ts";

const SPEC: CheckSpec = { fit: "model", varianceTest: "koenker", robust: null, significance: 0.05 };

/** The seeded design and its least-squares fit: `rows` × 10 predictors and an intercept. */
export function benchFit(rows: number, seed = 20261216): Fit {
  const rnd = seededRandom(seed);
  const cols: Record<string, Float64Array> = {};
  const y = new Float64Array(rows);
  for (let k = 1; k <= 10; k++) {
    const x = new Float64Array(rows), s = 10 ** (k / 3);
    for (let i = 0; i < rows; i++) {
      x[i] = Number((s * rnd.normal()).toPrecision(10));
      y[i] += k * x[i];
    }
    cols[`x${k}`] = x;
  }
  for (let i = 0; i < rows; i++) y[i] = Number((y[i] + 10 * rnd.normal()).toPrecision(10));
  cols.y = y;
  const rhs = Array.from({ length: 10 }, (_, k) => `b${k + 1}*x${k + 1}`).join(" + ");
  return fitOf(cols, `y = b0 + ${rhs}`);
}

/** One check of a fresh copy of `fit` (its per-fit caches start empty). */
export function checkOnce(fit: Fit) {
  return diagnose({ ...fit }, SPEC, 0.95);
}

if (import.meta.main) {
  const rows = Number(Deno.args[0] ?? 1_000_000);
  const fit = benchFit(rows);
  const mb = (b: number) => (b / 2 ** 20).toFixed(0);
  const before = Deno.memoryUsage().rss;
  const reset = resetPeak();
  const c0 = cpuUsage(), t0 = performance.now();
  const r = checkOnce(fit);
  const ms = performance.now() - t0, cpu = cpuUsage(c0);
  const peak = peakResident();
  console.log(
    `check of ${rows} × 10: ${ms.toFixed(0)} ms (processor ${
      ((cpu.user + cpu.system) / 1000).toFixed(0)
    } ms); resident before ${mb(before)} MB, ` +
      (reset && peak !== null
        ? `peak during the check ${mb(peak)} MB (+${mb(peak - before)} MB)`
        : "peak not measurable here") +
      `; findings ${r.result.findings.map((f) => f.code).join(", ") || "none"}`,
  );
}

/** Resets the peak resident set size (Linux: "5" to /proc/self/clear_refs); false where it cannot. */
function resetPeak(): boolean {
  try {
    Deno.writeTextFileSync("/proc/self/clear_refs", "5");
    return true;
  } catch {
    return false;
  }
}

/** VmHWM of /proc/self/status in bytes, or null. */
function peakResident(): number | null {
  try {
    const m = /VmHWM:\s+(\d+) kB/.exec(Deno.readTextFileSync("/proc/self/status"));
    return m ? Number(m[1]) * 1024 : null;
  } catch {
    return null;
  }
}

Deno.bench({ name: "check 1,000,000 × 10", n: 3, warmup: 1 }, () => {
  checkOnce(million());
});

let cached: Fit | null = null;
function million(): Fit {
  return cached ??= benchFit(1_000_000);
}
