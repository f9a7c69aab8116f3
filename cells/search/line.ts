/**
 * The CLI summary of a search result: one line for the best model, then
 * the best of each size.
 *
 * @module
 */
import type { SearchModel, SearchResult } from "./result.ts";
import { formatNumber } from "../shared/format.ts";

/**
 * A model's predictors in words.
 *
 * @param m The model.
 * @returns `temp + feed`, or `intercept only` for a model of none.
 */
export function predictorsText(m: SearchModel): string {
  return m.predictors.length > 0 ? m.predictors.join(" + ") : "intercept only";
}

/** A criterion's value as the summary prints it (6 significant digits). */
function value(x: number | null): string {
  return formatNumber(x, 6);
}

/**
 * `best by BIC: temp + feed (k 4, BIC 812.35) · 32,768 subsets of 15 candidates`.
 *
 * @param r The search result.
 * @returns The line.
 * @example
 * ```ts
 * import { searchLine } from "./line.ts";
 * import type { SearchResult } from "./result.ts";
 * const r = { criterion: "BIC", subsets_evaluated: 8, candidates: ["a", "b", "c"],
 *   best: [{ predictors: ["a"], k: 3, criterion: 12.5 }] } as unknown as SearchResult;
 * if (searchLine(r) !== "best by BIC: a (k 3, BIC 12.5) · 8 subsets of 3 candidates") throw new Error(searchLine(r));
 * ```
 */
export function searchLine(r: SearchResult): string {
  const tail = `${r.subsets_evaluated.toLocaleString("en-US")} subsets of ${r.candidates.length} ${
    r.candidates.length === 1 ? "candidate" : "candidates"
  }`;
  const best = r.best[0];
  if (best === undefined) return `no subset could be ranked by ${r.criterion} · ${tail}`;
  return `best by ${r.criterion}: ${predictorsText(best)} (k ${best.k}, ${r.criterion} ${
    value(best.criterion)
  }) · ${tail}`;
}

/**
 * The best model of each size, one line each, by the candidates it chose:
 * `3 candidates: temp + feed + age, BIC 815.1 (Δ 2.7)`; first, when some
 * columns are in every model, a line naming them.
 *
 * @param r The search result.
 * @returns The lines.
 */
export function searchDetails(r: SearchResult): string[] {
  const held = r.always.length > 0 ? [`every model holds ${r.always.join(" + ")}`] : [];
  return [
    ...held,
    ...r.sizes.flatMap((s) => {
      const m = s.best[0];
      if (m === undefined) return [];
      const size = `${s.size} ${s.size === 1 ? "candidate" : "candidates"}`;
      const chosen = m.chosen.length > 0
        ? m.chosen.join(" + ")
        : r.always.length > 0 || !r.intercept
        ? "none"
        : "intercept only";
      return [
        `${size}: ${chosen}, ${r.criterion} ${value(m.criterion)} (Δ ${formatNumber(m.delta, 3)})`,
      ];
    }),
  ];
}
