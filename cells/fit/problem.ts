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
import type { DDVector, QRFactorization, TriangularFactor } from "../../kernel/linalg/mod.ts";
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
  /**
   * Decimal corrections of `columns` and of the untransformed response
   * column (`lo` of `NumberColumn` in cells/types.ts, on the rows used), for residuals
   * in double-double; absent or null where the table kept none.
   */
  lo?: {
    columns: (Float64Array | null)[];
    /** The response column's values (before any transform) and their corrections. */
    response: { hi: Float64Array; lo: Float64Array | null };
  };
  /** Bounds by parameter name, `null` for an open end (the fit's `within` option). */
  limits?: Readonly<Record<string, readonly [number | null, number | null]>>;
  /** Seed for the multi-start search (the document's `seed` setting). */
  seed?: number;
  /** Records a warning on the cell (solvers that warn use it). */
  warn?: (message: string) => void;
  /**
   * Weights wᵢ > 0 of the rows used; null or absent for an unweighted fit.
   * Relative weights (`weights:`) and known standard deviations
   * (`known_sigma:`, wᵢ = 1/σᵢ²) both arrive here, checked finite and
   * positive (zero-weight rows are already left out). A solver then
   * minimises Σ wᵢ·(yᵢ − f(xᵢ; θ))², and must:
   *
   * - multiply row i of the design (linear) or of the Jacobian (nonlinear)
   *   and the residual yᵢ − fᵢ by √wᵢ before factoring or stepping
   *   (`whiten` in `_weights.ts` does it for a list of columns);
   * - return `rss` = Σ wᵢ·rᵢ² and `unscaledCovariance` = (XᵀWX)⁻¹ or
   *   (JᵀWJ)⁻¹, i.e. what the whitened problem gives;
   * - return `fitted`, `residuals` (= y − fitted) and `design` on the
   *   original, unweighted scale;
   * - decide `hasIntercept` on the unweighted design: a constant is in the
   *   span of X exactly when √w is in the span of √W·X.
   *
   * The cell derives every weighted statistic from these (`_statistics.ts`).
   */
  weights?: Float64Array | null;
  /**
   * Source row numbers (ascending) left out before the solver because a
   * column the model or the weights use is missing there (RUN-JSON
   * `rows_missing`); absent when none. Solvers do not read it.
   */
  rowsMissing?: Int32Array;
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
  /**
   * Linear fits: the pivoted Householder QR of the (√w-scaled,
   * column-equilibrated) design the solver factored, of full rank; its Q
   * spans the design's column space (fit_leverage.ts `fitBasis` uses it).
   * It also carries the solve's triangular factor, through which prediction
   * variances and leverages are read (see {@link DesignFactor}).
   */
  designQR?: DesignFactor;
  /** The part of the model free of parameters, evaluated per row (linear only; null when zero). */
  offset: Float64Array | null;
  /**
   * The total sum of squares of R² when the solver computed it more
   * accurately than the doubles of `y` allow (the linear double-double path,
   * unweighted fits): Σ(y − ȳ)² with an intercept, Σy² without.
   */
  tss?: number;
  /**
   * Per parameter: it ended on a bound of `limits` (nonlinear only). Its rows
   * and columns of `unscaledCovariance` are then NaN: no standard error.
   */
  atBound?: boolean[];
}

/**
 * What a linear solver keeps of its solve for the quantities derived from
 * the fit (prediction variances gᵀ(XᵀWX)⁻¹g and leverages, through R̃: see
 * kernel/linalg `inverseGramForms`), beside the double QR of the design.
 *
 * ```
 *  path            triangular          estimatesLo   designDD
 *  double-double   R̃ in double-double  yes           the design as printed (hi + lo)
 *  refined double  R̃ of the double QR  yes           —
 * ```
 */
export interface DesignFactor extends QRFactorization {
  /** R̃ of the solve that gave the estimates, with its pivot order and column scales. */
  triangular: TriangularFactor;
  /** Low parts of the estimates (estimate + lo to about 32 digits), when the solve gave them. */
  estimatesLo?: Float64Array;
  /** The unweighted design as the double-double solve factored it (hi + lo per term). */
  designDD?: DDVector[];
}
