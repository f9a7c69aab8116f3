/**
 * The RUN-JSON `result` of a compare cell (RUN-JSON.md, `compare`) and the
 * `Comparison` output that carries it.
 *
 * `aic`, `aicc` and `bic` of each row are computed from
 * `log_likelihood_original_scale` (log L plus the log-Jacobian of the
 * response transform), so fits of `log(y)` and `y` are comparable; for a
 * bare response column they equal the fit's own criteria. `delta` and
 * `weight` are for the criterion `by`; with `by: loo` Δ is in RMSE units and
 * `weight` is null.
 *
 * Our additions (extend, never rename): per row `rank`, `response`,
 * `method`, `log_jacobian`, `loo_method`, `loo_folds`, `weights_option`; per
 * nested test `ss_extra`; at the top `criterion`, `k_convention`,
 * `evidence_scale`, `criteria_scale`, `significance`, `weighting_basis`.
 *
 * Fits may differ in their relative weights (none, 1/x, 1/x²): each row's
 * log-likelihood then includes ½·Σ ln wᵢ of its own weights (the weights as
 * a variance model), `weighting_basis` says so, and nested F tests are given
 * only between fits of equal weights.
 *
 * @module
 */
import type { CellOutput } from "../../kernel/contract/mod.ts";
import type { Criterion } from "./spec.ts";
import type { NestedTest } from "./nested_tests.ts";

/** One row of the comparison table. */
export interface CompareRow {
  fit: string;
  n: number;
  k: number;
  rss: number;
  r2: number | null;
  adj_r2: number | null;
  sigma: number | null;
  log_likelihood: number | null;
  log_likelihood_original_scale: number | null;
  aic: number | null;
  aicc: number | null;
  bic: number | null;
  /** For `by`: value − best value; null where the value does not exist. */
  delta: number | null;
  /** Akaike weight for `by` (null for `loo` and where Δ is null). */
  weight: number | null;
  /** √(mean squared leave-one-out error) on the response column's scale; null when it does not exist. */
  loo_rmse: number | null;
  /** Our addition: 1 for the preferred fit; null when not ranked. */
  rank: number | null;
  /** Our addition: the response as written, e.g. `log(y)`. */
  response: string;
  /** Our addition: linear or nonlinear least squares. */
  method: "linear" | "nonlinear";
  /** Our addition: Σ ln |g′(yᵢ)| added to log L (0 for a bare column). */
  log_jacobian: number;
  /** Our addition: "press" (hat matrix) or "k-fold". */
  loo_method: "press" | "k-fold";
  /** Our addition: folds used by "k-fold", null for "press". */
  loo_folds: number | null;
  /** Our addition: the fit's `weights` option as written; null unweighted or with known σ. */
  weights_option: string | null;
}

/** The `compare` result object. */
export interface CompareResult {
  by: Criterion;
  /** In the order the fits are listed. */
  rows: CompareRow[];
  /** The fit ranked first; null when none could be ranked. */
  preferred: string | null;
  nested_tests: NestedTest[];
  verdict: string;
  /** Our addition: the criterion as printed, e.g. "AICc". */
  criterion: string;
  /** Our addition: how k is counted (the same for every fit). */
  k_convention: string;
  /** Our addition: the evidence scale Δ is read on. */
  evidence_scale: string;
  /** Our addition: the scale the criteria are on, in words. */
  criteria_scale: string;
  /** Our addition: the level the verdict uses for nested F tests. */
  significance: number;
  /**
   * Our addition: when the fits differ in their relative weights, the basis
   * of comparing them in plain words (also the verdict's last sentence);
   * null when every fit is weighted alike.
   */
  weighting_basis: string | null;
}

/** Output of `compare`: its result, ready to summarise. */
export interface Comparison extends CellOutput {
  type: "Comparison";
  result: CompareResult;
}
