/**
 * Fit statistics from a solution: residual standard error, covariance,
 * standard errors, t, p-values and intervals of the estimates, sums of
 * squares, R², the overall F test, log-likelihood and criteria.
 *
 * Formulas (Draper & Smith, *Applied Regression Analysis*, 3rd ed., ch. 1–2,
 * 5 and 9 for weights; from memory for the chapter numbers):
 *
 * - σ = √(RSS/(n − p)), RSS = Σ wᵢrᵢ² (wᵢ = 1 unweighted).
 * - Relative weights or none: Cov(θ̂) = σ²·(XᵀWX)⁻¹, t_j = θ̂_j/se_j tested
 *   against t(n − p), interval θ̂_j ± t_{(1+c)/2; n−p}·se_j.
 * - Known standard deviations (absolute): Cov(θ̂) = (XᵀWX)⁻¹, not rescaled;
 *   z_j = θ̂_j/se_j against N(0, 1), interval θ̂_j ± z_{(1+c)/2}·se_j.
 * - With an intercept (a constant in the span of the design):
 *   TSS = Σ wᵢ(yᵢ − ȳ_w)², ȳ_w = Σwᵢyᵢ/Σwᵢ; R² = 1 − RSS/TSS;
 *   adj. R² = 1 − (1 − R²)(n − 1)/(n − p); F = (ESS/(p − 1))/(RSS/(n − p))
 *   against F(p − 1, n − p), ESS = TSS − RSS.
 * - Linear fits without one the centred identity fails: R² is the uncentred
 *   1 − RSS/Σwᵢyᵢ², adj. R² = 1 − (1 − R²)·n/(n − p), no F test, and a
 *   warning (as NIST certifies NoInt1/NoInt2; see DESIGN.md §5).
 * - Nonlinear fits: always the centred R² = 1 − RSS/TSS, TSS = Σwᵢ(yᵢ − ȳ_w)²
 *   (the definition of linear fits with an intercept, and of DESIGN.md §5),
 *   adj. R² with n − 1, ESS = Σwᵢ(ŷᵢ − ȳ_w)² computed directly since
 *   TSS = ESS + RSS does not hold; R² is then neither the share of variance
 *   explained nor the squared correlation of observed and fitted values (it
 *   may even be negative): no F test, and a warning that says so.
 * - Known standard deviations: no F test (its denominator would estimate the
 *   scale the σᵢ fix), a warning; instead the Wald χ² of the slopes and the
 *   χ² goodness of fit of `_known_sigma.ts`.
 * - TSS = 0: R² is undefined (null), with a warning.
 *
 * p-values are upper tails computed directly (kernel/stats), so values down
 * to about 1e-300 are numbers, not 0.
 *
 * @module
 */
import { fisherF, standardNormal, studentT } from "../../kernel/stats/mod.ts";
import type { FitProblem, FitSolution } from "./problem.ts";
import { type Likelihood, likelihood } from "./_likelihood.ts";
import type { Weighting } from "./_weighting.ts";
import { explainedSum, totalSum } from "./_sums.ts";
import { type KnownSigmaTests, knownSigmaTests } from "./_known_sigma.ts";

/** Statistics shared by every fit. `null` marks a value that does not exist. */
export interface FitStatistics extends Likelihood, KnownSigmaTests {
  n: number;
  p: number;
  dfResidual: number;
  /** Σ wᵢrᵢ² (Σ rᵢ² unweighted). */
  rss: number;
  /** Σwᵢ(yᵢ − ȳ_w)² with an intercept, Σwᵢyᵢ² without (see `r2Centred`). */
  tss: number;
  ess: number;
  r2: number | null;
  adjR2: number | null;
  /** Whether R² is the centred (true) or uncentred (false) form. */
  r2Centred: boolean;
  sigma: number | null;
  stdErrors: (number | null)[];
  t: (number | null)[];
  pValues: (number | null)[];
  /** Intervals at `confidence`. */
  intervals: ([number, number] | null)[];
  confidence: number;
  /** The reference distribution of t and the intervals. */
  inference: "t" | "normal";
  /** Cov(θ̂), p×p column-major (NaN rows/columns for a parameter at a bound). */
  covariance: Float64Array;
  /** Correlations of the estimates, p×p column-major. */
  correlation: Float64Array;
  /** False with known standard deviations: the covariance is not rescaled by σ². */
  covarianceScaled: boolean;
  weighting: Weighting;
  fStatistic: number | null;
  fPValue: number | null;
}

/** What the statistics depend on besides problem and solution. */
export interface StatisticsOptions {
  /** Confidence level of the intervals (the document's `confidence`). */
  confidence: number;
  weighting: Weighting;
  /** Whether the criteria count the error variance (default true). */
  countVariance: boolean;
}

/**
 * Computes the statistics, warning about uncentred, undefined or
 * non-additive R², an unbounded log-likelihood or an undefined AICc.
 *
 * @param problem The problem solved (weights included).
 * @param s The solver's solution.
 * @param o Confidence level, weighting mode and k convention.
 * @param warn Records a warning on the cell.
 * @returns The statistics.
 */
export function fitStatistics(
  problem: FitProblem,
  s: FitSolution,
  o: StatisticsOptions,
  warn: (m: string) => void,
): FitStatistics {
  const n = problem.n, p = s.estimates.length, df = n - p;
  const weights = problem.weights ?? null;
  const absolute = o.weighting === "absolute";
  const sigma = df > 0 ? Math.sqrt(s.rss / df) : null;
  const scale = absolute ? 1 : sigma === null ? NaN : sigma * sigma;
  const covariance = s.unscaledCovariance.map((v) => v * scale);
  const inf = inference(covariance, s.estimates, o.confidence, absolute ? null : df);
  const diag = (j: number) => s.unscaledCovariance[j + j * p];
  // σ² cancels: corr_ij = u_ij/√(u_ii·u_jj) with u = (XᵀWX)⁻¹.
  const correlation = s.unscaledCovariance.map((v, k) =>
    v / Math.sqrt(diag(k % p) * diag(Math.floor(k / p)))
  );
  const r = rSquared(problem, s, weights, df, absolute, warn);
  const known = knownSigmaTests({
    weights: absolute ? weights : null,
    rss: s.rss,
    df,
    wald: s.method === "linear" && r.r2Centred,
    design: s.design,
    estimates: s.estimates,
  });
  return {
    n,
    p,
    dfResidual: df,
    rss: s.rss,
    ...r,
    sigma,
    ...inf,
    confidence: o.confidence,
    inference: absolute ? "normal" : "t",
    covariance,
    correlation,
    covarianceScaled: !absolute,
    weighting: o.weighting,
    ...known,
    ...likelihood(
      { name: problem.name, n, p, rss: s.rss, weights, weighting: o.weighting },
      o.countVariance,
      warn,
    ),
  };
}

/** Standard errors, t, two-sided p-values and intervals; df null: normal reference. */
function inference(
  cov: Float64Array,
  est: Float64Array,
  confidence: number,
  df: number | null,
) {
  const p = est.length;
  const ref = df === null ? standardNormal : studentT(df);
  const q = ref.upperQuantile((1 - confidence) / 2);
  const stdErrors = Array.from(est, (_, j) => finiteOrNull(Math.sqrt(cov[j + j * p])));
  const t = stdErrors.map((se, j) => (se === null ? null : finiteOrNull(est[j] / se)));
  const pValues = t.map((v) => (v === null ? null : Math.min(1, 2 * ref.upper(Math.abs(v)))));
  const intervals = stdErrors.map((se, j): [number, number] | null =>
    se === null ? null : [est[j] - q * se, est[j] + q * se]
  );
  return { stdErrors, t, pValues, intervals };
}

/** TSS, ESS, R², adjusted R² and the overall F test, with their warnings. */
function rSquared(
  problem: FitProblem,
  s: FitSolution,
  weights: Float64Array | null,
  df: number,
  absolute: boolean,
  warn: (m: string) => void,
) {
  const n = problem.n, p = s.estimates.length;
  // Nonlinear fits always take the centred form, the definition of DESIGN.md §5.
  const linear = s.method === "linear", centred = !linear || s.hasIntercept;
  // The linear solver's double-double TSS (unweighted fits) is the more accurate one when given.
  const tss = weights === null && s.tss !== undefined
    ? s.tss
    : totalSum(problem.y, weights, centred);
  const ess = linear ? tss - s.rss : explainedSum(s.fitted, problem.y, weights, centred);
  const written = problem.model.text.slice(
    problem.model.response.start,
    problem.model.response.end,
  );
  let r2: number | null = null, adjR2: number | null = null;
  if (tss === 0) {
    warn(
      `R² of "${problem.name}" is undefined: the response "${written}" is ${
        centred ? "constant" : "zero"
      } on every row used`,
    );
  } else {
    r2 = 1 - s.rss / tss;
    adjR2 = df > 0 ? 1 - (1 - r2) * (centred ? n - 1 : n) / df : null;
  }
  if (!centred) {
    warn(
      `R² of "${problem.name}" is uncentred, 1 − RSS/Σy², because the model has no intercept: compare it only with fits without one`,
    );
  } else if (!linear) {
    warn(
      `R² of "${problem.name}" is the centred 1 − RSS/TSS of a nonlinear fit: TSS = ESS + RSS does not hold, so it is neither the share of variance explained nor the squared correlation of observed and fitted values, and no overall F test is given`,
    );
  }
  let fStatistic: number | null = null, fPValue: number | null = null;
  if (absolute && linear && centred && p > 1) {
    warn(
      `Overall F test of "${problem.name}" is not given: with known standard deviations ("known_sigma") the scale is not estimated, so every term but the intercept is tested together by the Wald χ² (wald_chi2) instead`,
    );
  } else if (linear && centred && p > 1 && df > 0 && tss > 0) {
    fStatistic = finiteOrNull((ess / (p - 1)) / (s.rss / df));
    if (fStatistic !== null) fPValue = fisherF(p - 1, df).upper(fStatistic);
  }
  return { tss, ess, r2, adjR2, r2Centred: centred, fStatistic, fPValue };
}

function finiteOrNull(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}
