/**
 * Fit statistics from a solution: residual standard error, standard errors,
 * covariance and correlation of the estimates, R² and adjusted R².
 *
 * Formulas (Draper & Smith, *Applied Regression Analysis*, 3rd ed., ch. 1–2
 * and 5; from memory for the chapter numbers):
 *
 * - σ = √(RSS/(n − p)); Cov(θ̂) = σ²·(XᵀX)⁻¹; se_j = σ·√[(XᵀX)⁻¹]_jj; t_j = θ̂_j/se_j.
 * - With an intercept (a constant in the span of the design):
 *   TSS = Σ(y − ȳ)², R² = 1 − RSS/TSS, adj. R² = 1 − (1 − R²)(n − 1)/(n − p).
 * - Without one the centred identity TSS = ESS + RSS fails, so R² is the
 *   uncentred 1 − RSS/Σy² and adj. R² = 1 − (1 − R²)·n/(n − p), with a
 *   warning (as NIST certifies NoInt1/NoInt2; see DESIGN.md §5).
 * - TSS = 0: R² is undefined (null), with a warning.
 *
 * @module
 */
import type { FitProblem, FitSolution } from "./problem.ts";

/** Statistics shared by every fit. `null` marks a value that does not exist. */
export interface FitStatistics {
  n: number;
  p: number;
  dfResidual: number;
  rss: number;
  /** Σ(y − ȳ)² with an intercept, Σy² without (see `r2Centred`). */
  tss: number;
  r2: number | null;
  adjR2: number | null;
  /** Whether R² is the centred (true) or uncentred (false) form. */
  r2Centred: boolean;
  sigma: number | null;
  stdErrors: (number | null)[];
  t: (number | null)[];
  /** σ²·(XᵀX)⁻¹, p×p column-major; null when df = 0. */
  covariance: Float64Array | null;
  /** Correlations of the estimates, p×p column-major. */
  correlation: Float64Array;
}

/** Computes the statistics, warning about uncentred or undefined R². */
export function fitStatistics(
  problem: FitProblem,
  s: FitSolution,
  warn: (m: string) => void,
): FitStatistics {
  const n = problem.n, p = s.estimates.length, df = n - p;
  const sigma = df > 0 ? Math.sqrt(s.rss / df) : null;
  const cov = sigma === null ? null : s.unscaledCovariance.map((v) => v * sigma * sigma);
  const diag = (j: number) => s.unscaledCovariance[j + j * p];
  const stdErrors = Array.from(
    s.estimates,
    (_, j) => (sigma === null ? null : sigma * Math.sqrt(diag(j))),
  );
  const t = stdErrors.map((se, j) => finiteOrNull(se === null ? NaN : s.estimates[j] / se));
  // σ² cancels: corr_ij = u_ij/√(u_ii·u_jj) with u = (XᵀX)⁻¹.
  const correlation = s.unscaledCovariance.map((v, k) =>
    v / Math.sqrt(diag(k % p) * diag(Math.floor(k / p)))
  );
  const tss = s.tss ??
    (s.hasIntercept ? centredSumOfSquares(problem.y) : problem.y.reduce((a, v) => a + v * v, 0));
  const written = problem.model.text.slice(
    problem.model.response.start,
    problem.model.response.end,
  );
  let r2: number | null = null, adjR2: number | null = null;
  if (tss === 0) {
    warn(
      `R² of "${problem.name}" is undefined: the response "${written}" is ${
        s.hasIntercept ? "constant" : "zero"
      } on every row used`,
    );
  } else {
    r2 = 1 - s.rss / tss;
    adjR2 = df > 0 ? 1 - (1 - r2) * (s.hasIntercept ? n - 1 : n) / df : null;
  }
  if (!s.hasIntercept) {
    warn(
      `R² of "${problem.name}" is uncentred, 1 − RSS/Σy², because the model has no intercept: compare it only with fits without one`,
    );
  }
  return {
    n,
    p,
    dfResidual: df,
    rss: s.rss,
    tss,
    r2,
    adjR2,
    r2Centred: s.hasIntercept,
    sigma,
    stdErrors,
    t,
    covariance: cov,
    correlation,
  };
}

function finiteOrNull(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

/**
 * Σ(y − ȳ)² by the corrected two-pass algorithm (Chan, Golub & LeVeque 1983,
 * "Algorithms for computing the sample variance", Am. Statistician 37; from
 * memory); exactly 0 for a constant y.
 */
function centredSumOfSquares(y: Float64Array): number {
  const n = y.length;
  if (y.every((v) => v === y[0])) return 0;
  let mean = 0;
  for (const v of y) mean += v;
  mean /= n;
  let corr = 0;
  for (const v of y) corr += v - mean;
  mean += corr / n;
  let ss = 0;
  for (const v of y) ss += (v - mean) * (v - mean);
  return ss;
}
