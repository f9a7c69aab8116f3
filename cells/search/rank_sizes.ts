/**
 * From the subsets the tree kept to the ranked lists a search reports: each
 * kept subset fitted properly (`exact_fit.ts`), ranked by its criterion per
 * size, and the best overall.
 *
 * AIC, AICc, BIC and adjusted R² are monotone in RSS within a size, so the
 * tree's `keep` smallest RSS per size are the size's best; fitting them only
 * settles their exact values and the order of near ties.
 *
 * Leave-one-out error is not monotone in RSS: PRESS = Σ(eᵢ/(1 − hᵢ))² needs
 * the leverages, which the cross-products do not give. But PRESS ≥ RSS (each
 * 1/(1 − hᵢ)² ≥ 1), so the tree keeps a larger pool per size
 * ({@link LOO_POOL}, smallest RSS first) and the pool is fitted in that order
 * until the next RSS is at least the `keep`-th smallest PRESS found: no
 * subset left can then enter, and the size's list is exact. When the pool
 * runs out first, the list is exact among the pool's subsets and the size
 * says so (`exact: false`, and a warning); the RSS of the pool's last
 * subset still bounds the PRESS of every subset of that size left out
 * (`bound`), which usually proves the overall list exact even then
 * ({@link overallExact}).
 *
 * @module
 */
import { better, criterionOf, type FitBasis, fitSubset, type SubsetFit } from "./exact_fit.ts";
import type { TreeResult } from "./subset_tree.ts";
import type { SearchCriterion } from "./spec.ts";

/** Subsets per size the tree keeps for a ranking by leave-one-out error. */
export const LOO_POOL = 50;

/** Relative margin for the rounding of an RSS read off the swept cross-products. */
const MARGIN = 1e-9;

/** One size's ranking. */
export interface SizeRanking {
  /** Candidates chosen. */
  size: number;
  /** Subsets of this size. */
  subsets: number;
  /** Of which aliased. */
  aliased: number;
  /** The best, in order. */
  best: SubsetFit[];
  /** False when a leave-one-out list is exact only among the pool (see the module notes). */
  exact: boolean;
  /**
   * A lower bound of the PRESS of every subset of this size not fitted
   * (Infinity when all were, or for the criteria other than loo, where none can enter).
   */
  bound: number;
}

/**
 * Ranks every size's kept subsets.
 *
 * @param tree What the tree walk kept.
 * @param basis The columns and conventions of the fits.
 * @param by The criterion.
 * @param keep Models per size.
 * @param progress Told the share of the sizes done.
 * @returns One ranking per size that has a model, smallest size first.
 */
export function rankSizes(
  tree: TreeResult,
  basis: FitBasis,
  by: SearchCriterion,
  keep: number,
  progress: (fraction: number) => void,
): SizeRanking[] {
  const out: SizeRanking[] = [];
  tree.kept.forEach((pool, size) => {
    progress(size / tree.kept.length);
    if (tree.subsets[size] === 0) return;
    const ranked = by === "loo"
      ? looRanking(pool, basis, keep, tree.subsets[size] - tree.aliased[size])
      : {
        best: pool.slice(0, keep).map((s) => fitSubset(basis, s.mask)),
        exact: true,
        bound: Infinity,
      };
    const best = ranked.best.filter((f) => !f.aliased).sort(better(by)).slice(0, keep);
    const aliased = tree.aliased[size] + ranked.best.filter((f) => f.aliased).length;
    out.push({
      size,
      subsets: tree.subsets[size],
      aliased,
      best,
      exact: ranked.exact,
      bound: ranked.bound,
    });
  });
  return out;
}

/** The best `keep` by PRESS among a pool sorted by RSS, with the bound PRESS ≥ RSS. */
function looRanking(
  pool: { mask: number; rss: number }[],
  basis: FitBasis,
  keep: number,
  estimable: number,
): { best: SubsetFit[]; exact: boolean; bound: number } {
  const n = basis.data.n, order = better("loo");
  const best: SubsetFit[] = [], aliased: SubsetFit[] = [];
  // PRESS = n·RMSE²; RSS of the tree is on the unit scale of the response, times TSS.
  const worst = () => best.length >= keep ? criterionOf(best[keep - 1], "loo") : null;
  const floor = (rss: number) => rss * basis.tss * (1 - MARGIN);
  const closed = (bound: number) => {
    const w = worst();
    return w !== null && bound >= n * w * w;
  };
  for (const s of pool) {
    if (closed(floor(s.rss))) {
      return { best: [...best, ...aliased], exact: true, bound: floor(s.rss) };
    }
    const f = fitSubset(basis, s.mask);
    if (f.aliased) {
      aliased.push(f);
      continue;
    }
    best.push(f);
    best.sort(order);
    if (best.length > keep) best.length = keep;
  }
  // Every estimable subset of this size was in the pool, or those outside it have at least
  // the largest RSS in it.
  const all = pool.length >= estimable;
  const bound = all ? Infinity : floor(pool[pool.length - 1].rss);
  return { best: [...best, ...aliased], exact: all || closed(bound), bound };
}

/**
 * Whether the best `keep` overall are proven: every subset not fitted has a
 * PRESS bound at or above the overall `keep`-th best (always true for the
 * criteria other than loo).
 *
 * @param sizes The rankings per size.
 * @param overall The best overall, in order.
 * @param keep How many are listed.
 * @param n Rows (PRESS = n·RMSE²).
 * @returns True when no subset left out could enter the overall list.
 */
export function overallExact(
  sizes: readonly SizeRanking[],
  overall: readonly SubsetFit[],
  keep: number,
  n: number,
): boolean {
  const last = overall.length >= keep ? criterionOf(overall[keep - 1], "loo") : null;
  const worst = last === null ? Infinity : n * last * last;
  return sizes.every((s) => s.bound === Infinity || s.bound >= worst);
}
