/**
 * The `check` cell's output value and its RUN-JSON result
 * (../shared/RUN-JSON.md, `check`). Fields beyond RUN-JSON's list are
 * extensions: the rows, fitted values and residuals the residual charts need,
 * the Durbin–Watson test, the order of the runs test, robust standard errors.
 *
 * @module
 */
import type { CellOutput } from "../../kernel/contract/mod.ts";
import type { DurbinWatsonTest } from "../../kernel/stats/mod.ts";

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
  rows: number[];
  fitted: number[];
  residuals: number[];
  leverage: number[];
  studentized_internal: (number | null)[];
  studentized_external: (number | null)[];
  cooks_distance: (number | null)[];
  dffits: (number | null)[];
  vif: Record<string, number | null>;
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
  /** Heteroscedasticity-consistent standard errors by parameter (option `robust`), or null. */
  robust: { type: "hc0" | "hc1" | "hc2" | "hc3"; std_errors: Record<string, number | null> } | null;
  findings: Finding[];
}

/** What a check cell gives other cells (charts, the record). */
export interface Diagnostics extends CellOutput {
  type: "Diagnostics";
  result: CheckResult;
}
