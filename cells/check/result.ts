/**
 * The `check` cell's output value and its RUN-JSON result
 * (../shared/RUN-JSON.md, `check`). Fields beyond RUN-JSON's list are
 * extensions: the rows, fitted values and residuals the residual charts need,
 * the Durbin–Watson test, the order of the runs test, the VIF's form, what
 * Breusch–Pagan regressed on, robust inference.
 *
 * For a nonlinear fit the design is the Jacobian at the estimates: leverage,
 * VIF and condition number are local, linearised quantities there.
 *
 * @module
 */
import type { CellOutput } from "../../kernel/contract/mod.ts";
import type { DurbinWatsonTest } from "../../kernel/stats/mod.ts";
import type { CensoredCheck } from "./censored.ts";

/** One finding: a code, the source rows it concerns, a plain sentence with evidence and threshold. */
export interface Finding {
  code:
    | "determined-by-one-row"
    | "outlier"
    | "influential"
    | "high-leverage"
    | "curvature"
    | "non-constant-variance"
    | "non-normal"
    | "autocorrelation"
    | "alternation"
    | "collinearity";
  rows: number[];
  message: string;
}

/** The RUN-JSON `check` object. Per-row arrays are per used row, in row order. */
export interface CheckResult {
  fit: string;
  n: number;
  p: number;
  method: "linear" | "nonlinear";
  weighted: boolean;
  significance: number;
  /** RUN-JSON addition: the unit of the fit's fitted values and residuals (its `sigma_unit`); null when none. */
  sigma_unit?: string | null;
  rows: number[];
  fitted: number[];
  residuals: number[];
  leverage: number[];
  studentized_internal: (number | null)[];
  studentized_external: (number | null)[];
  cooks_distance: (number | null)[];
  dffits: (number | null)[];
  /** By parameter (none for the intercept, nor for a parameter held at a bound); null: infinite. */
  vif: Record<string, number | null>;
  /**
   * Addition: "centred" (the design has an intercept: 1/(1 − R²) about the mean) or
   * "uncentred" (no intercept, e.g. a nonlinear fit's Jacobian: (XᵀX)ⱼⱼ·((XᵀX)⁻¹)ⱼⱼ).
   */
  vif_form: "centred" | "uncentred";
  condition_number: number | null;
  durbin_watson: number | null;
  /**
   * The null law of d under this design: `p_value` = P(d ≤ observed) (positive
   * correlation), `p_value_negative` = P(d ≥ observed) (alternation; addition),
   * `distribution` "exact" (Imhof 1961) or "beta" (Durbin & Watson 1971; addition).
   */
  durbin_watson_test: Omit<DurbinWatsonTest, "statistic"> | null;
  breusch_pagan: {
    variant: "koenker" | "original";
    statistic: number;
    df: number;
    p_value: number;
    f: number | null;
    f_p_value: number | null;
    /**
     * Addition: what e² was regressed on, "design" (the model's design, linear fits) or
     * "fitted" (1 and ŷ, df 1: nonlinear fits, whose Jacobian columns are not predictors).
     */
    regressors: "design" | "fitted";
  } | null;
  shapiro_wilk: { w: number; p_value: number } | null;
  jarque_bera: { statistic: number; p_value: number; skewness: number; kurtosis: number } | null;
  reset: { f: number; df1: number; df2: number; p_value: number } | null;
  runs: {
    runs: number;
    expected: number;
    z: number;
    p_value: number;
    /** "x": signs read in order of the one predictor; "rows": in row order (several predictors). */
    order: "x" | "rows";
  } | null;
  lack_of_fit: {
    f: number;
    df1: number;
    df2: number;
    p_value: number;
    ss_lack_of_fit: number;
    ss_pure_error: number;
  } | null;
  press: number | null;
  loo_rmse: number | null;
  /**
   * Heteroscedasticity-consistent inference (option `robust`), or null: standard errors by
   * parameter and the additions below (null entries where a value does not exist).
   */
  robust: {
    type: "hc0" | "hc1" | "hc2" | "hc3";
    std_errors: Record<string, number | null>;
    /** Addition: the interval level (the document's confidence). */
    level: number;
    /** Addition: degrees of freedom of the t reference (the fit's n − p). */
    df: number;
    /** Addition: θ̂/se by parameter. */
    t: Record<string, number | null>;
    /** Addition: two-sided p-values from t(df). */
    p_value: Record<string, number | null>;
    /** Addition: θ̂ ± t(1 − α/2; df)·se by parameter. */
    ci: Record<string, [number, number] | null>;
    /** Addition: the HC covariance, p × p in the fit's parameter order. */
    covariance: (number | null)[][];
  } | null;
  findings: Finding[];
  /**
   * Addition: present when the fit was computed in its database (its rows stay there): the
   * per-row fields above are then empty, and this says what was judged from sums and what not.
   */
  in_engine?: InEngineCheck;
  /**
   * Addition: present when the fit's response has rows below a detection limit: how those
   * rows entered the check (randomized quantile residuals for an ML fit, seeded; or the
   * substituted values, judged as if measured).
   */
  censored?: CensoredCheck;
}

/** What the check of a fit computed in its database judged, from the engine's sums. */
export interface InEngineCheck {
  engine: "duckdb" | "postgres";
  /** One sentence: the rows stay in the database, so no panel of rows can be drawn. */
  note: string;
  /** What was judged from sums, in words. */
  judged: string[];
  /** What was not, and why, in words. */
  not_judged: string[];
  /** The column Durbin–Watson followed, or null (then it was not computed). */
  order_by: string | null;
  /** κ of the centred, unit-column design (the fit's `in_engine_detail.kappa`). */
  kappa: number;
  leverage: { max: number; over_2p: number; over_3p: number; limit_2p: number; limit_3p: number };
  influence: {
    max_abs_studentized: number | null;
    studentized_over_3: number;
    max_cooks_distance: number | null;
    cooks_cut: number;
    cooks_over_cut: number;
    leverage_one: number;
    press: number | null;
    loo_rmse: number | null;
  };
  /** Central moments (divide by n) of the residuals (√w·e when weighted), their unit's powers. */
  residual_moments: {
    mean: number;
    m2: number;
    m3: number;
    m4: number;
    skewness: number | null;
    kurtosis: number | null;
  };
}

/** The per-row fields of the RUN-JSON `check` object (`CellKind.rows`), in their order there. */
export const ROW_FIELDS = [
  "rows",
  "fitted",
  "residuals",
  "leverage",
  "studentized_internal",
  "studentized_external",
  "cooks_distance",
  "dffits",
] as const;

/** One of {@link ROW_FIELDS}. */
export type RowField = typeof ROW_FIELDS[number];

/**
 * The per-row fields as the compute worker keeps them: typed arrays, NaN where
 * a value does not exist (null in RUN-JSON). Plain arrays are made by the
 * summary only for the fields asked for: a million rows of them, with nulls,
 * were millions of heap numbers that every later collection walked.
 */
export type CheckRows = Record<RowField, ArrayLike<number>>;

/** Everything a check gives but its per-row fields. */
export type CheckScalars = Omit<CheckResult, RowField>;

/** What a check cell gives other cells (charts, the record). */
export interface Diagnostics extends CellOutput {
  type: "Diagnostics";
  result: CheckScalars;
  perRow: CheckRows;
}
