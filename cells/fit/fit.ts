/**
 * The `Fit` value a fit cell gives other cells (compare, check, predict,
 * chart). It stays in the compute worker; only its summary travels.
 *
 * @module
 */
import type { Model } from "../../kernel/expr/mod.ts";
import type { CellOutput } from "../../kernel/contract/mod.ts";
import type { ModelUnits } from "../../kernel/units/mod.ts";
import type { FitStatistics } from "./_statistics.ts";
import type { Weighting } from "./_weighting.ts";
import type { DesignFactor } from "./problem.ts";
import type { InEngineRecord } from "./_in_engine.ts";
import type { FitIntervals } from "./_intervals.ts";
import type { CensoringRecord } from "./_censored_fit.ts";
import type { RobustRecord } from "./_robust.ts";

/** A fitted model with everything downstream cells need to judge and use it. */
export interface Fit extends CellOutput {
  type: "Fit";
  method: "linear" | "nonlinear";
  /** The table cell it was fitted on. */
  on: string;
  /** The parsed model (response, right side, parameters, columns). */
  model: Model;
  /** The response as written, e.g. `log(y)`. */
  responseText: string;
  /** Whether the rows were weighted (relative weights or known standard deviations). */
  weighted: boolean;
  /** none, relative (`weights`, rescaled by the residual variance) or absolute (`known_sigma`). */
  weighting: Weighting;
  /** wᵢ of the rows used (1/σᵢ² for known standard deviations), or null. */
  weights: Float64Array | null;
  /** The `weights` (or `known_sigma`) expression as written; absent for an unweighted fit. */
  weightsText?: string;
  /** Parameter names, in the model's order. */
  parameters: string[];
  /**
   * Units by dimensional analysis of the model from the table's column units
   * (kernel/units): each parameter's unit or why it has none, the response's.
   * Absent on fits built by hand.
   */
  units?: ModelUnits;
  estimates: Float64Array;
  /** (XᵀX)⁻¹ or (JᵀJ)⁻¹, p×p column-major. */
  unscaledCovariance: Float64Array;
  statistics: FitStatistics;
  /** Values of `model.columns` on the rows used. */
  columns: Float64Array[];
  /** The response as written (transformed), on the rows used. */
  y: Float64Array;
  fitted: Float64Array;
  residuals: Float64Array;
  /** Source row number of each row used. */
  rows: Int32Array;
  /**
   * Source row numbers (ascending) left out because a column the model or
   * the weights use is missing there; absent when none.
   */
  rowsMissing?: Int32Array;
  /** Design (linear) or Jacobian (nonlinear) columns, one per parameter. */
  design: Float64Array[];
  /**
   * Linear fits: the full-rank QR of the (√w-scaled) design the solver
   * factored, with the solve's triangular factor and, on the precise paths,
   * the estimates' low parts (FitSolution, {@link DesignFactor}).
   */
  designQR?: DesignFactor;
  /** The parameter-free part of a linear model per row, or null. */
  offset: Float64Array | null;
  /** Whether a constant is in the span of the design (R² centred). */
  hasIntercept: boolean;
  /** σ_max/σ_min of the design as evaluated. */
  conditionNumber: number;
  converged: boolean;
  iterations: number;
  /** Per parameter: it ended on a bound (nonlinear fits with limits); absent otherwise. */
  atBound?: boolean[];
  /**
   * When a database computed the fit's sums (a table kept in its engine):
   * where each number came from. The per-row arrays are then empty.
   */
  inEngine?: InEngineRecord;
  /**
   * Every interval of each parameter, labelled by method (Wald, profile,
   * bootstrap), with the profile traces and bootstrap replicates behind them
   * (_intervals.ts). Absent for fits computed in a database.
   */
  intervals?: FitIntervals;
  /** A response with rows below a detection limit: how it was fitted (_censored_fit.ts). */
  censoring?: CensoringRecord;
  /**
   * A robust fit (`loss:`): the loss, tuning constant, robust scale, final
   * weights and the sandwich covariance (_robust.ts). Then `estimates`,
   * `fitted` and `residuals` are the M-estimate's, `statistics.covariance`
   * the sandwich, `statistics.sigma` the robust scale, `unscaledCovariance`
   * (X̃ᵀX̃)⁻¹ at the estimates; `weights` stay the prior weights. Absent for
   * least squares.
   */
  robust?: RobustRecord;
  /**
   * Censored response only (`below_limit`, `censored_by`): 1 for each row (in
   * the order of `rows`) whose response lies below its detection limit; `y`
   * then holds the limit. Absent when no row is below a limit.
   */
  below?: Uint8Array;
  /**
   * The bootstrap replicates (when bootstrap intervals were asked): B×p,
   * row-major in the order of `parameters` (chart bands read them).
   */
  bootstrap?: {
    replicates: Float64Array;
    b: number;
    resample: "residuals" | "cases";
    seed: number;
  };
}
