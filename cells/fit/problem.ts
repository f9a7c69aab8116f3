/**
 * The contract between the `fit` cell and its solvers.
 *
 * ```
 *  Table + Model ──_data.ts──▶ FitProblem ──┬─ solveLinear    (QR, kernel/linalg)
 *                                           └─ solveNonlinear (the numerical core's slot)
 *                                                  │
 *                              FitSolution ◀───────┘ ──_statistics.ts──▶ Fit
 * ```
 *
 * A solver sees only the rows the fit uses (missing values already left out)
 * and the response already transformed; it returns estimates and the unscaled
 * covariance, and the cell derives every statistic from them in one place.
 *
 * @module
 */
import type { Model } from "../../kernel/expr/mod.ts";

/** What a solver is given. */
export interface FitProblem {
  /** The fit cell's name, for messages. */
  name: string;
  /** The parsed model. */
  model: Model;
  /** Number of rows used. */
  n: number;
  /** Values of `model.columns` on the rows used, in that order. */
  columns: Float64Array[];
  /** The response as written (transformed), on the rows used. */
  y: Float64Array;
  /** Source row number of each row used. */
  rows: Int32Array;
  /** Start values by parameter name (may be empty). */
  start: Readonly<Record<string, number>>;
}

/** What a solver returns. */
export interface FitSolution {
  method: "linear" | "nonlinear";
  /** Estimates in the order of `model.parameters`. */
  estimates: Float64Array;
  /** (XᵀX)⁻¹ (linear) or (JᵀJ)⁻¹ at the solution (nonlinear), p×p column-major. */
  unscaledCovariance: Float64Array;
  fitted: Float64Array;
  /** y − fitted. */
  residuals: Float64Array;
  rss: number;
  /** Whether a constant lies in the span of the design (or Jacobian): R² is then centred. */
  hasIntercept: boolean;
  /** σ_max/σ_min of the design (or Jacobian) as evaluated. */
  conditionNumber: number;
  converged: boolean;
  iterations: number;
  /** The design columns (linear) or Jacobian columns at the solution, one per parameter. */
  design: Float64Array[];
  /** The part of the model free of parameters, evaluated per row (linear only; null when zero). */
  offset: Float64Array | null;
}
