/**
 * Robust fits (`loss: huber | soft_l1 | bisquare`): M-estimation by
 * iteratively reweighted least squares.
 *
 * Method: Holland & Welsch (1977, "Robust regression using iteratively
 * reweighted least-squares", Commun. Statist. A6:813–827). From the
 * least-squares fit θ₀, repeat
 *
 * ```
 *  rᵢ = yᵢ − f(xᵢ; θ)                 residuals on the response as written
 *  s  = median |√wᵢ·rᵢ| / Φ⁻¹(3/4)    the normalised MAD, re-estimated each iteration
 *  uᵢ = √wᵢ·rᵢ/s,  vᵢ = ψ(uᵢ)/uᵢ      the loss's weights (_robust_loss.ts)
 *  θ  = argmin Σ wᵢ·vᵢ·(yᵢ − f(xᵢ; θ))²   the fit's own solver (QR, or Levenberg–Marquardt
 *                                      from the last θ), wᵢ the prior `weights` (else 1)
 * ```
 *
 * until no residual moves by more than 10⁻¹⁰·s and s by no more than
 * 10⁻¹⁰·s. At the fixed point Σ ψ(uᵢ)·√wᵢ·∂f/∂θ = 0 at that s: θ minimises
 * Σ ρ(uᵢ) with s held at its final value (robust_test.ts checks it by
 * perturbation). The scale is the MAD (as MASS's `rlm` default, Venables &
 * Ripley, *Modern Applied Statistics with S*, 4th ed., §6.5), not Huber's
 * Proposal 2: it stays put under up to half the rows being outliers.
 * Bisquare, whose ψ redescends and whose Σρ has several minima, starts from
 * the Huber fit (c = 1.345) instead of least squares (common practice,
 * no source). A row whose bisquare weight is 0 is kept in the solve with
 * weight 10⁻¹⁰⁰ (the solvers take positive weights): its pull is nil.
 *
 * The covariance is Huber's sandwich (_robust_covariance.ts). The fit's
 * statistics (`robustStatistics`) keep the least-squares sums of its
 * residuals (RSS, R²) with the inference replaced: σ is the robust scale s;
 * standard errors, t, p-values and intervals come from the sandwich against
 * t(n − p), as MASS's `summary.rlm` does (Venables & Ripley, §6.5; from
 * memory); the overall F test, the Gaussian log-likelihood and AIC, AICc and
 * BIC are null, as they belong to least squares. Profile and bootstrap
 * intervals are refused for a robust fit (_robust_parse.ts): both refit by
 * least squares.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { singularValues } from "../../kernel/linalg/mod.ts";
import { standardNormal, studentT } from "../../kernel/stats/mod.ts";
import type { FitStatistics } from "./_statistics.ts";
import type { FitProblem, FitSolution } from "./problem.ts";
import { solveLinear } from "./solve_linear.ts";
import { solveNonlinear } from "./solve_nonlinear.ts";
import { DEFAULT_TUNING, type Loss, type LossFunctions, lossFunctions } from "./_robust_loss.ts";
import { type RobustCovariance, robustCovariance } from "./_robust_covariance.ts";

/** Φ⁻¹(3/4): the MAD of a normal sample divided by it estimates σ. */
export const MAD_NORMAL = standardNormal.upperQuantile(0.25);

/** No residual moves by more than this times s, nor s itself: converged. */
const TOLERANCE = 1e-10;
const MAX_ITERATIONS = 500;
/** The weight standing for 0 (bisquare beyond c): the solvers take positive weights. */
const LEAST_WEIGHT = 1e-100;

/** What a robust fit adds to a fit (Fit.robust). */
export interface RobustRecord {
  loss: Loss;
  tuning: number;
  /** The robust scale s at the solution. */
  scale: number;
  /** The loss's final weight ψ(uᵢ)/uᵢ per row used (prior weights not included). */
  weights: Float64Array;
  /** uᵢ = √wᵢ·rᵢ/s per row used. */
  scaled: Float64Array;
  /** IRLS iterations (each one weighted least-squares solve). */
  iterations: number;
  /** Where the iterations started, in words. */
  start: string;
  covariance: RobustCovariance;
}

/**
 * The robust fit of a problem from its least-squares solution.
 *
 * @param problem The problem (prior weights, limits, start values).
 * @param ls Its least-squares solution.
 * @param linear Whether the model is linear in its parameters.
 * @param loss The loss.
 * @param tuning Its tuning constant (default: the loss's 95% value).
 * @returns The solution (estimates, residuals, design on the prior-weighted
 *   problem; `unscaledCovariance` = (X̃ᵀX̃)⁻¹ at the estimates) and the record.
 * @throws {CellError} When the scale is 0 (half the residuals or more are
 *   0), the iterations do not settle, or the covariance does not exist.
 */
export function robustSolve(
  problem: FitProblem,
  ls: FitSolution,
  linear: boolean,
  loss: Loss,
  tuning?: number,
): { solution: FitSolution; record: RobustRecord } {
  const c = tuning ?? DEFAULT_TUNING[loss];
  let from = ls, start = "the least-squares fit", spent = 0;
  if (loss === "bisquare") {
    const h = iterate(problem, ls, linear, lossFunctions("huber", DEFAULT_TUNING.huber), "huber");
    from = h.solution;
    spent = h.iterations;
    start = `the Huber fit (c = ${DEFAULT_TUNING.huber})`;
  }
  const f = lossFunctions(loss, c);
  const it = iterate(problem, from, linear, f, loss);
  const sol = it.solution, n = problem.n;
  const prior = problem.weights ?? null;
  const r = sol.residuals;
  const s = madScale(r, prior);
  if (!(s > 0)) throw zeroScale(problem);
  const scaled = r.map((v, i) => (prior === null ? v : v * Math.sqrt(prior[i])) / s);
  const free = Array.from(sol.estimates, (_, j) => j).filter((j) => !sol.atBound?.[j]);
  const cols = free.map((j) =>
    prior === null ? sol.design[j] : sol.design[j].map((v, i) => v * Math.sqrt(prior[i]))
  );
  const cov = robustCovariance(cols, scaled, s, n - sol.estimates.length, f);
  if (cov === null) throw noCovariance(problem, loss, c);
  const p = sol.estimates.length;
  const unscaled = spread(cov.unscaled, free, p);
  let rss = 0;
  for (let i = 0; i < n; i++) rss += (prior === null ? 1 : prior[i]) * r[i] * r[i];
  const solution: FitSolution = {
    ...sol,
    unscaledCovariance: unscaled,
    rss,
    iterations: spent + it.iterations,
    // Linear fits keep the least-squares design factor (the prior-weighted design's, which
    // leverage reads), without the least-squares estimates' low parts.
    ...(linear && ls.designQR ? { designQR: withoutLo(ls.designQR) } : {}),
    hasIntercept: ls.hasIntercept,
    conditionNumber: linear ? ls.conditionNumber : conditionNumber(cols, n),
    ...(ls.tss === undefined ? {} : { tss: ls.tss }),
  };
  return {
    solution,
    record: {
      loss,
      tuning: c,
      scale: s,
      weights: scaled.map(f.weight),
      scaled,
      iterations: spent + it.iterations,
      start,
      covariance: { ...cov, covariance: spread(cov.covariance, free, p), unscaled },
    },
  };
}

/**
 * The normalised median absolute deviation of the (√w-scaled) residuals about 0.
 *
 * @param r Residuals.
 * @param w Prior weights, or null.
 * @returns median |√wᵢ·rᵢ| / Φ⁻¹(3/4).
 * @example
 * ```ts
 * import { madScale, MAD_NORMAL } from "./_robust.ts";
 * if (madScale(Float64Array.of(-3, 1, 2), null) !== 2 / MAD_NORMAL) throw new Error();
 * ```
 */
export function madScale(r: Float64Array, w: Float64Array | null): number {
  const a = Float64Array.from(r, (v, i) => Math.abs(w === null ? v : v * Math.sqrt(w[i])));
  a.sort();
  const n = a.length, h = n >> 1;
  const med = n % 2 === 1 ? a[h] : (a[h - 1] + a[h]) / 2;
  return med / MAD_NORMAL;
}

/** IRLS from a solution until residuals and scale settle. */
function iterate(
  problem: FitProblem,
  from: FitSolution,
  linear: boolean,
  f: LossFunctions,
  loss: Loss,
): { solution: FitSolution; iterations: number } {
  const prior = problem.weights ?? null, n = problem.n;
  let sol = from, s = madScale(sol.residuals, prior);
  for (let it = 1; it <= MAX_ITERATIONS; it++) {
    if (!(s > 0)) throw zeroScale(problem);
    const v = new Float64Array(n);
    let all = true;
    for (let i = 0; i < n; i++) {
      const u = (prior === null ? sol.residuals[i] : sol.residuals[i] * Math.sqrt(prior[i])) / s;
      v[i] = f.weight(u);
      if (v[i] !== 1) all = false;
    }
    // Every weight 1: the weighted problem is the problem itself (least squares, exactly).
    const weights = all
      ? prior
      : v.map((x, i) => Math.max(x, LEAST_WEIGHT) * (prior === null ? 1 : prior[i]));
    const next = solve({
      ...problem,
      weights,
      start: startOf(problem, sol),
      warn: atLimit(problem),
    }, linear);
    const s2 = madScale(next.residuals, prior);
    let moved = 0;
    for (let i = 0; i < n; i++) {
      moved = Math.max(moved, Math.abs(next.residuals[i] - sol.residuals[i]));
    }
    sol = next;
    const settled = moved <= TOLERANCE * s && Math.abs(s2 - s) <= TOLERANCE * s;
    s = s2;
    if (settled) return { solution: sol, iterations: it };
  }
  throw new CellError(
    `Cannot fit "${problem.name}" with loss ${loss}: the reweighted fits did not settle in ${MAX_ITERATIONS} iterations (the scale is now ${
      Number(s.toPrecision(5))
    }); try loss: huber, whose minimum is unique, or a larger tuning constant`,
    ["loss"],
  );
}

function solve(problem: FitProblem, linear: boolean): FitSolution {
  return linear ? solveLinear(problem) : solveNonlinear(problem);
}

/** The last estimates as start values (nonlinear refits start there). */
function startOf(problem: FitProblem, s: FitSolution): Record<string, number> {
  const out: Record<string, number> = {};
  problem.model.parameters.forEach((k, j) => (out[k] = s.estimates[j]));
  return out;
}

/** The inner solves' warnings: only a parameter ending at a limit is passed on. */
function atLimit(problem: FitProblem): (m: string) => void {
  return (m) => {
    if (/ended at its (lower|upper) limit/.test(m)) problem.warn?.(m);
  };
}

/** A p×p matrix from its free rows and columns, NaN for held parameters. */
function spread(c: Float64Array, free: number[], p: number): Float64Array {
  if (free.length === p) return c;
  const q = free.length, out = new Float64Array(p * p).fill(NaN);
  for (let a = 0; a < q; a++) {
    for (let b = 0; b < q; b++) out[free[a] + free[b] * p] = c[a + b * q];
  }
  return out;
}

function withoutLo<T extends { estimatesLo?: Float64Array }>(f: T): T {
  const { estimatesLo: _, ...rest } = f;
  return rest as T;
}

function conditionNumber(cols: readonly Float64Array[], n: number): number {
  const a = new Float64Array(n * cols.length);
  cols.forEach((c, j) => a.set(c, j * n));
  try {
    const sv = singularValues(a, n, cols.length);
    return sv[0] / sv[sv.length - 1];
  } catch {
    return NaN;
  }
}

function zeroScale(problem: FitProblem): CellError {
  return new CellError(
    `Cannot fit "${problem.name}" robustly: half the residuals or more are 0, so their median absolute deviation, the robust scale, is 0; the model passes through most rows exactly, and least squares (no loss) suits it`,
    ["loss"],
  );
}

function noCovariance(problem: FitProblem, loss: Loss, c: number): CellError {
  return new CellError(
    `Cannot fit "${problem.name}" with loss ${loss} (tuning ${c}): the mean slope of ψ over the rows is not positive, so the estimates have no covariance; most rows lie where the loss redescends: give a larger tuning constant or loss: huber`,
    ["loss"],
  );
}

/**
 * Replaces the inference of least-squares statistics by the robust fit's.
 *
 * @param st The statistics of the robust solution computed as for least squares.
 * @param record The robust record (scale, covariance).
 * @param estimates The robust estimates.
 * @returns The statistics of the robust fit.
 */
export function robustStatistics(
  st: FitStatistics,
  record: RobustRecord,
  estimates: Float64Array,
): FitStatistics {
  const p = estimates.length, cov = record.covariance.covariance;
  const law = studentT(st.dfResidual);
  const q = law.upperQuantile((1 - st.confidence) / 2);
  const stdErrors = Array.from(estimates, (_, j) => finite(Math.sqrt(cov[j + j * p])));
  const t = stdErrors.map((se, j) => se === null ? null : finite(estimates[j] / se));
  const pValues = t.map((v) => v === null ? null : Math.min(1, 2 * law.upper(Math.abs(v))));
  const intervals = stdErrors.map((se, j): [number, number] | null =>
    se === null ? null : [estimates[j] - q * se, estimates[j] + q * se]
  );
  const correlation = cov.map((v, k) =>
    v / Math.sqrt(cov[(k % p) * (p + 1)] * cov[Math.floor(k / p) * (p + 1)])
  );
  return {
    ...st,
    sigma: record.scale,
    covariance: cov,
    correlation,
    covarianceScaled: true,
    stdErrors,
    t,
    pValues,
    intervals,
    inference: "t",
    fStatistic: null,
    fPValue: null,
    logLikelihood: null,
    aic: null,
    aicc: null,
    bic: null,
  };
}

function finite(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}
