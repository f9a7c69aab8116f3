/**
 * The RUN-JSON `result` of a fit cell (see RUN-JSON.md, `fit`), and the
 * summary that builds it from a {@link Fit}.
 *
 * Our additions to the documented shape (extend, never rename): `r2_kind`,
 * `condition_number`, `confidence`, `inference`, `weighting`,
 * `weighting_statement`, `k_convention`, and for fits with known standard
 * deviations the χ² tests `wald_chi2`, `wald_df`, `wald_p_value`,
 * `gof_chi2`, `gof_df`, `gof_p_value`, `reduced_chi2` (`_known_sigma.ts`;
 * null for other fits). From RUN-JSON.md's Additions: `rows_missing`.
 *
 * With weights, `rss`, `tss` and `ess` are the weighted sums Σwᵢrᵢ²,
 * Σwᵢ(yᵢ − ȳ_w)² and TSS − RSS, and `fitted`/`residuals` are on the
 * original (unweighted) scale.
 *
 * @module
 */
import type { Fit } from "./fit.ts";
import type { InEngineRecord } from "./_in_engine.ts";
import type { FitIntervals } from "./_intervals.ts";
import type { LabelledInterval } from "./_profile.ts";
import type { DerivedResult } from "./_derived.ts";
import type { CensoringRecord } from "./_censored_fit.ts";
import type { Weighting } from "./_weighting.ts";
import { plainArray, rowValues } from "../../kernel/arrays.ts";
import { type RobustResult, robustResult } from "./_robust_result.ts";

/** One parameter row. */
export interface FitParameterResult {
  name: string;
  estimate: number;
  /** √Cov_jj; null when it does not exist (a parameter at a bound). */
  std_error: number | null;
  /** estimate / std_error; null when that does not exist. */
  t: number | null;
  /** Two-sided p-value of t (t(n − p), or N(0, 1) with known σ); null with t. */
  p_value: number | null;
  /** Interval at the document's confidence level; null without a standard error. */
  ci: [number, number] | null;
  at_bound: boolean;
  /** RUN-JSON addition: the unit by dimensional analysis of the model; null when none or not derivable. */
  unit: string | null;
  /** RUN-JSON addition: why no unit could be derived; null when it was or none is due. */
  unit_note: string | null;
  /**
   * RUN-JSON addition: every interval computed, each labelled by method
   * (`wald` first, the same as `ci`; then `profile`, `bootstrap-percentile`,
   * `bootstrap-bca` as asked); a null side is unbounded or could not be had,
   * with a `note`.
   */
  intervals: LabelledInterval[];
}

/** RUN-JSON addition: how the non-Wald intervals were computed. */
export interface IntervalsRecord {
  /** The methods computed. */
  methods: string[];
  /** Profile traces (parameter values and profile t), one per parameter; absent without profile. */
  profile_traces?: { parameter: string; at: number[]; tau: number[] }[];
  /** The bootstrap: resamples kept, refits that failed, how rows were redrawn, the seed. */
  bootstrap?: { resamples: number; failed: number; resample: string; seed: number };
}

/** The `fit` result object. */
export interface FitResult {
  method: "linear" | "nonlinear";
  model: string;
  response: string;
  weighted: boolean;
  n: number;
  p: number;
  df_residual: number;
  parameters: FitParameterResult[];
  covariance: (number | null)[][];
  correlation: (number | null)[][];
  covariance_scaled: boolean;
  rss: number;
  tss: number;
  ess: number;
  r2: number | null;
  adj_r2: number | null;
  /**
   * Our addition: "centred" (1 − RSS/TSS about the (weighted) mean: linear
   * fits with an intercept and every nonlinear fit) or "uncentred"
   * (1 − RSS/Σy²: linear fits without an intercept).
   */
  r2_kind: "centred" | "uncentred";
  sigma: number | null;
  /** Null without an intercept, for nonlinear fits, and with known σ (see `wald_chi2`). */
  f_statistic: number | null;
  f_p_value: number | null;
  /**
   * Our addition, known σ only: Wald χ² of every parameter but the intercept,
   * β̂ₛᵀCov⁻¹β̂ₛ with the covariance not rescaled (linear fits with an
   * intercept; null otherwise), on `wald_df` = p − 1 degrees of freedom.
   */
  wald_chi2: number | null;
  wald_df: number | null;
  wald_p_value: number | null;
  /** Our addition, known σ only: goodness of fit χ² = Σ((yᵢ − ŷᵢ)/σᵢ)² (= `rss`). */
  gof_chi2: number | null;
  /** n − p. */
  gof_df: number | null;
  /** P(χ²(gof_df) > gof_chi2). */
  gof_p_value: number | null;
  /** gof_chi2 / gof_df (≈ 1 when the σᵢ describe the scatter). */
  reduced_chi2: number | null;
  log_likelihood: number | null;
  k: number;
  /** Our addition: how `k` was counted, in words. */
  k_convention: string;
  aic: number | null;
  aicc: number | null;
  bic: number | null;
  /** Our addition: the level of `ci` (the document's `confidence`). */
  confidence: number;
  /** Our addition: the reference distribution of t, p and ci. */
  inference: "t" | "normal";
  /** Our addition: none, relative (`weights`) or absolute (`known_sigma`). */
  weighting: Weighting;
  /** Our addition: the weighting in plain words. */
  weighting_statement: string;
  /** Our addition: σ_max/σ_min of the design (or Jacobian) as evaluated. */
  condition_number: number | null;
  fitted: number[];
  residuals: number[];
  rows: number[];
  /**
   * RUN-JSON addition: every source row left out of this fit because a
   * column the model or the weights (`weights`, `known_sigma`) use is missing
   * there, ascending (the warning names the first five). Rows the table
   * excluded, and rows of weight 0, are not in it.
   */
  rows_missing: number[];
  /**
   * RUN-JSON addition: true when a database computed the fit's sums; always
   * present in RUN-JSON (optional here for results written by hand).
   */
  in_engine?: boolean;
  /** With `in_engine`: the engine, the route (sums or QR), κ, what was computed where. */
  in_engine_detail?: InEngineRecord;
  /** RUN-JSON addition: the unit of sigma, fitted values and residuals (the response's as written); null when none. */
  sigma_unit: string | null;
  converged: boolean;
  iterations: number;
  rank_deficient: null;
  /** RUN-JSON addition: how the labelled intervals were computed; absent for fits in a database. */
  intervals?: IntervalsRecord;
  /** RUN-JSON addition: a response with rows below a detection limit (`below_limit`, `censored_by`): how it was fitted. */
  censoring?: CensoringRecord;
  /** RUN-JSON addition: the fit's derived quantities (`derived:`), each with every method used. */
  derived?: DerivedResult[];
  /**
   * RUN-JSON addition, robust fits only (`loss:`): the loss, tuning constant,
   * robust scale and how it was estimated, the covariance's form, the rows
   * down-weighted with their weights. `sigma` is then the robust scale and
   * `covariance` the sandwich; the likelihood, criteria and F test are null.
   */
  robust?: RobustResult;
}

/** The weighting of a fit in plain words (shown in the view and the result). */
export const WEIGHTING_STATEMENTS: Readonly<Record<Weighting, string>> = {
  none: "unweighted",
  relative: "relative weights (∝ 1/variance), covariance rescaled by the residual variance",
  absolute: "absolute (known σ): covariance not rescaled by the residual variance",
};

function num(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

function square(a: Float64Array, p: number): (number | null)[][] {
  return Array.from(
    { length: p },
    (_, i) => Array.from({ length: p }, (_, j) => num(a[i + j * p])),
  );
}

/**
 * Builds the RUN-JSON result of a fit.
 *
 * @param fit The fit cell's output.
 * @param leaveOut Per-row fields (`fitted`, `residuals`, `rows`) not to build:
 *   the live page's copy drops them (3 × n values a fit).
 * @returns Plain JSON (non-finite numbers become null).
 */
export function summarizeFit(fit: Fit, leaveOut?: ReadonlySet<string>): FitResult {
  const st = fit.statistics;
  const p = fit.parameters.length;
  // A page copy lacks the fields left out; RUN-JSON (no leaveOut) has them all.
  const perRow = {
    ...(leaveOut?.has("fitted") ? {} : { fitted: rowValues(fit.fitted) }),
    ...(leaveOut?.has("residuals") ? {} : { residuals: rowValues(fit.residuals) }),
    ...(leaveOut?.has("rows") ? {} : { rows: rowValues(fit.rows) }),
  } as Pick<FitResult, "fitted" | "residuals" | "rows">;
  return {
    method: fit.method,
    model: fit.model.text,
    response: fit.responseText,
    weighted: fit.weighted,
    n: st.n,
    p,
    df_residual: st.dfResidual,
    parameters: fit.parameters.map((name, j) => ({
      name,
      estimate: fit.estimates[j],
      std_error: st.stdErrors[j],
      t: st.t[j],
      p_value: st.pValues[j],
      ci: st.intervals[j],
      at_bound: fit.atBound?.[j] ?? false,
      unit: fit.units?.parameters.get(name)?.unit ?? null,
      unit_note: fit.units?.parameters.get(name)?.note ?? null,
      intervals: fit.intervals?.byParameter[j] ?? [{
        method: "wald" as const,
        level: st.confidence,
        lower: st.intervals[j]?.[0] ?? null,
        upper: st.intervals[j]?.[1] ?? null,
      }],
    })),
    covariance: square(st.covariance, p),
    correlation: square(st.correlation, p),
    covariance_scaled: st.covarianceScaled,
    rss: st.rss,
    tss: st.tss,
    ess: st.ess,
    r2: st.r2,
    adj_r2: st.adjR2,
    r2_kind: st.r2Centred ? "centred" : "uncentred",
    sigma: st.sigma,
    f_statistic: st.fStatistic,
    f_p_value: st.fPValue,
    wald_chi2: st.waldChi2,
    wald_df: st.waldDf,
    wald_p_value: st.waldPValue,
    gof_chi2: st.gofChi2,
    gof_df: st.gofDf,
    gof_p_value: st.gofPValue,
    reduced_chi2: st.reducedChi2,
    log_likelihood: st.logLikelihood,
    k: st.k,
    k_convention: st.kConvention,
    aic: st.aic,
    aicc: st.aicc,
    bic: st.bic,
    confidence: st.confidence,
    inference: st.inference,
    weighting: st.weighting,
    weighting_statement: WEIGHTING_STATEMENTS[st.weighting],
    condition_number: num(fit.conditionNumber),
    ...perRow,
    rows_missing: plainArray(fit.rowsMissing ?? []),
    in_engine: fit.inEngine !== undefined,
    ...(fit.inEngine === undefined ? {} : { in_engine_detail: fit.inEngine }),
    sigma_unit: fit.units?.response ?? null,
    converged: fit.converged,
    iterations: fit.iterations,
    rank_deficient: null,
    ...(fit.intervals === undefined ? {} : { intervals: intervalsRecord(fit.intervals) }),
    ...(fit.censoring === undefined ? {} : { censoring: fit.censoring }),
    ...(fit.intervals === undefined || fit.intervals.derived.length === 0
      ? {}
      : { derived: fit.intervals.derived }),
    ...(fit.robust === undefined ? {} : { robust: robustResult(fit.robust, fit.rows) }),
  };
}

function intervalsRecord(iv: FitIntervals): IntervalsRecord {
  const methods = ["wald"];
  if (iv.traces !== undefined) methods.push("profile");
  if (iv.bootstrap !== undefined) methods.push("bootstrap-percentile", "bootstrap-bca");
  return {
    methods,
    ...(iv.traces === undefined ? {} : {
      profile_traces: iv.traces.map((t) => ({
        parameter: t.parameter,
        at: t.at.map(Number),
        tau: t.tau.map(Number),
      })),
    }),
    ...(iv.bootstrap === undefined ? {} : {
      bootstrap: {
        resamples: iv.bootstrap.b,
        failed: iv.bootstrap.failed,
        resample: iv.bootstrap.resample,
        seed: iv.bootstrap.seed,
      },
    }),
  };
}
