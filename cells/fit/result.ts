/**
 * The RUN-JSON `result` of a fit cell (see RUN-JSON.md, `fit`), and the
 * summary that builds it from a {@link Fit}.
 *
 * Not filled yet (they need t and F distributions, which arrive with the
 * statistics work): `p_value`, `ci`, `f_statistic`, `f_p_value`; nor the
 * likelihood and criteria (`log_likelihood`, `k`, `aic`, `aicc`, `bic`).
 *
 * @module
 */
import type { Fit } from "./fit.ts";

/** One parameter row. */
export interface FitParameterResult {
  name: string;
  estimate: number;
  /** σ·√[(XᵀX)⁻¹]_jj; null when there are no residual degrees of freedom. */
  std_error: number | null;
  /** estimate / std_error; null when that does not exist. */
  t: number | null;
  at_bound: false;
}

/** The `fit` result object. */
export interface FitResult {
  method: "linear" | "nonlinear";
  model: string;
  response: string;
  weighted: false;
  n: number;
  p: number;
  df_residual: number;
  parameters: FitParameterResult[];
  covariance: number[][] | null;
  correlation: number[][];
  covariance_scaled: true;
  rss: number;
  tss: number;
  ess: number;
  r2: number | null;
  adj_r2: number | null;
  /** Our addition: "centred" (with an intercept) or "uncentred" (1 − RSS/Σy²). */
  r2_kind: "centred" | "uncentred";
  sigma: number | null;
  /** Our addition: σ_max/σ_min of the design (or Jacobian) as evaluated. */
  condition_number: number | null;
  fitted: number[];
  residuals: number[];
  rows: number[];
  converged: boolean;
  iterations: number;
  rank_deficient: null;
}

function square(a: Float64Array, p: number): number[][] {
  return Array.from({ length: p }, (_, i) => Array.from({ length: p }, (_, j) => a[i + j * p]));
}

/**
 * Builds the RUN-JSON result of a fit.
 *
 * @param fit The fit cell's output.
 * @returns Plain JSON (non-finite numbers become null).
 */
export function summarizeFit(fit: Fit): FitResult {
  const st = fit.statistics;
  const p = fit.parameters.length;
  return {
    method: fit.method,
    model: fit.model.text,
    response: fit.responseText,
    weighted: false,
    n: st.n,
    p,
    df_residual: st.dfResidual,
    parameters: fit.parameters.map((name, j) => ({
      name,
      estimate: fit.estimates[j],
      std_error: st.stdErrors[j],
      t: st.t[j],
      at_bound: false,
    })),
    covariance: st.covariance ? square(st.covariance, p) : null,
    correlation: square(st.correlation, p),
    covariance_scaled: true,
    rss: st.rss,
    tss: st.tss,
    ess: st.tss - st.rss,
    r2: st.r2,
    adj_r2: st.adjR2,
    r2_kind: st.r2Centred ? "centred" : "uncentred",
    sigma: st.sigma,
    condition_number: Number.isFinite(fit.conditionNumber) ? fit.conditionNumber : null,
    fitted: Array.from(fit.fitted),
    residuals: Array.from(fit.residuals),
    rows: Array.from(fit.rows),
    converged: fit.converged,
    iterations: fit.iterations,
    rank_deficient: null,
  };
}
