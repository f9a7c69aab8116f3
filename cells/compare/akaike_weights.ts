/**
 * Differences from the best value of a criterion, and Akaike weights.
 *
 * Method (Burnham & Anderson 2002, *Model Selection and Multimodel
 * Inference*, 2nd ed., §2.5 and §2.9): Δᵢ = Cᵢ − min C, and the weight of
 * model i is wᵢ = exp(−Δᵢ/2) / Σⱼ exp(−Δⱼ/2), the relative likelihood of
 * the model normalised over the set. Computing from Δ (never from exp(−C/2))
 * keeps the weights finite whatever the size of C.
 *
 * @module
 */

/** Δ and weights per model, in the input order; null where the criterion is null. */
export interface Ranking {
  delta: (number | null)[];
  /** Null for every model when weights were not asked for. */
  weight: (number | null)[];
  /** Index of the smallest value, or -1 when none exists. */
  best: number;
  /** 1 for the smallest value, 2 for the next…; null where the value is null. */
  rank: (number | null)[];
}

/**
 * Ranks criterion values (smaller is better).
 *
 * @param values One value per model, null where it does not exist.
 * @param withWeights Whether to compute Akaike weights (false for RMSE-type scores).
 * @returns Δ, weights, the best index and ranks; ties keep the input order.
 * @example
 * ```ts
 * import { rankBy } from "./akaike_weights.ts";
 * // Δ = 0 and 2: weights 1/(1 + e⁻¹) and e⁻¹/(1 + e⁻¹) (Burnham & Anderson 2002, §2.9).
 * const r = rankBy([10, 12], true);
 * if (Math.abs(r.weight[0]! - 1 / (1 + Math.exp(-1))) > 1e-15) throw new Error(String(r.weight));
 * ```
 */
export function rankBy(values: readonly (number | null)[], withWeights: boolean): Ranking {
  let best = -1;
  values.forEach((v, i) => {
    if (v !== null && Number.isFinite(v) && (best < 0 || v < values[best]!)) best = i;
  });
  const delta = values.map((
    v,
  ) => (best < 0 || v === null || !Number.isFinite(v) ? null : v - values[best]!));
  const rel = delta.map((d) => (d === null ? 0 : Math.exp(-d / 2)));
  const sum = rel.reduce((a, b) => a + b, 0);
  const weight = delta.map((d, i) => (withWeights && d !== null ? rel[i] / sum : null));
  const order = delta.map((d, i) => ({ d, i })).filter((x) => x.d !== null)
    .sort((x, y) => x.d! - y.d! || x.i - y.i);
  const rank: (number | null)[] = values.map(() => null);
  order.forEach((x, r) => (rank[x.i] = r + 1));
  return { delta, weight, best, rank };
}
