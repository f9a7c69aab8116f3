/**
 * The `search` cell's output and its RUN-JSON result: the `search` object of
 * ../shared/RUN-JSON.md (`by`, `candidates`, `subsets_evaluated`, `best`:
 * [{ `predictors`, `k`, `criterion` }]) and our additions: the best models
 * per size, each model's criteria and its model equation (what a fit cell
 * made from it writes), and what the page's view needs besides.
 *
 * @module
 */
import type { CellOutput } from "../../kernel/contract/mod.ts";
import type { SearchCriterion } from "./spec.ts";

/** One model a search lists. */
export interface SearchModel {
  /** Every predictor column of the model: those in `always`, then the chosen candidates. */
  predictors: string[];
  /** The candidates chosen (the subset). */
  chosen: string[];
  /** How many candidates were chosen. */
  size: number;
  /** Mean parameters (intercept, always, chosen). */
  p: number;
  /** Parameters the criteria count (p + 1 unless count_variance is false). */
  k: number;
  /** The value of the criterion the search ranks by; null when it does not exist. */
  criterion: number | null;
  /** How far it is from the best model's (≥ 0; for adjusted R², the best's minus this one's). */
  delta: number | null;
  rss: number;
  r2: number | null;
  adj_r2: number | null;
  log_likelihood: number | null;
  aic: number | null;
  aicc: number | null;
  bic: number | null;
  /** Leave-one-out RMSE (PRESS); null when a row has leverage 1. */
  loo_rmse: number | null;
  /** The model equation a fit cell of this subset writes. */
  model: string;
}

/** The best models of one size. */
export interface SearchSize {
  size: number;
  /** Subsets of this size. */
  subsets: number;
  /** Of which aliased (ranked last, not listed). */
  aliased: number;
  best: SearchModel[];
  /** False when a leave-one-out list is exact only among the subsets of smallest RSS examined. */
  exact: boolean;
}

/** The RUN-JSON result of a `search` cell. */
export interface SearchResult {
  /** The table searched. */
  on: string;
  response: string;
  /** The response column's unit (that of LOO RMSE), or null. */
  response_unit: string | null;
  by: SearchCriterion;
  /** The criterion's name as printed ("BIC", "adjusted R²", "LOO RMSE"). */
  criterion: string;
  /** Whether a larger value is better (adjusted R² only). */
  larger_is_better: boolean;
  candidates: string[];
  always: string[];
  intercept: boolean;
  /** Rows used by every subset. */
  n: number;
  keep: number;
  /** The most candidates a subset held. */
  largest: number;
  /** Subsets ranked, aliased ones included. */
  subsets_evaluated: number;
  /** Subsets aliased (ranked last). */
  aliased: number;
  /** A few aliased subsets, by their candidates. */
  aliased_examples: string[][];
  k_convention: string;
  /** False when the criteria count only the mean parameters (the search's `count_variance`). */
  count_variance: boolean;
  /** The best overall, in order. */
  best: SearchModel[];
  /** Whether `best` is proven the best of every subset (false only for a loo list not proven). */
  exact: boolean;
  /** The best per size, smallest size first. */
  sizes: SearchSize[];
  /** Whether the models' `loo_rmse` were computed (beyond 100,000 rows only when ranking by loo). */
  loo_given: boolean;
  /** How the subsets were ranked, in one sentence. */
  method: string;
}

/** What `run` gives: the result, built in the worker. */
export interface SearchOutput extends CellOutput {
  type: "Ranked";
  result: SearchResult;
}

/** Names of the criteria as printed. */
export const CRITERION_NAMES: Readonly<Record<SearchCriterion, string>> = {
  bic: "BIC",
  aic: "AIC",
  aicc: "AICc",
  adj_r2: "adjusted R²",
  loo: "LOO RMSE",
};
