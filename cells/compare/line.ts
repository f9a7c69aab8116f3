/**
 * The one human line of a compare result, for the CLI summary.
 *
 * @module
 */
import type { CompareResult } from "./result.ts";
import { formatNumber } from "../shared/format.ts";

/**
 * `root preferred by AICc (weight 0.93) over power (Δ 5.2)`.
 *
 * @param r The compare result.
 * @returns The line.
 * @example
 * ```ts
 * import { compareLine } from "./line.ts";
 * import type { CompareResult } from "./result.ts";
 * const row = (fit: string, rank: number, delta: number, weight: number) =>
 *   ({ fit, rank, delta, weight, loo_rmse: null });
 * const r = { by: "aicc", criterion: "AICc", preferred: "root",
 *   rows: [row("power", 2, 5.2, 0.07), row("root", 1, 0, 0.93)],
 *   verdict: '"root" is preferred by AICc' } as unknown as CompareResult;
 * if (compareLine(r) !== "root preferred by AICc (weight 0.93) over power (Δ 5.2)") throw new Error(compareLine(r));
 * ```
 */
export function compareLine(r: CompareResult): string {
  if (r.preferred === null) return `no fit ranked by ${r.criterion}`;
  const best = r.rows.find((x) => x.fit === r.preferred)!;
  const next = r.rows.find((x) => x.rank === 2);
  if (r.by === "loo") {
    const head = `${best.fit} preferred by ${r.criterion} (${formatNumber(best.loo_rmse, 3)})`;
    return next ? `${head} over ${next.fit} (${formatNumber(next.loo_rmse, 3)})` : head;
  }
  // The verdict decides the words (one source of truth with the page's ledger).
  if (next && r.verdict?.startsWith("No clear winner")) {
    return `no clear winner by ${r.criterion}: ${best.fit} ahead (weight ${
      formatNumber(best.weight, 2)
    }), ${next.fit} within Δ ${formatNumber(next.delta, 2)}`;
  }
  const head = `${best.fit} preferred by ${r.criterion} (weight ${formatNumber(best.weight, 2)})`;
  return next ? `${head} over ${next.fit} (Δ ${formatNumber(next.delta, 2)})` : head;
}
