/**
 * Levenberg–Marquardt with a trust region and scaling, using an exact
 * Jacobian: MINPACK's `lmder` (Moré, Garbow & Hillstrom 1980, *User Guide for
 * MINPACK-1*, Argonne report ANL-80-74), the algorithm of Moré 1978, "The
 * Levenberg–Marquardt algorithm: implementation and theory", Numerical
 * Analysis (Dundee 1977), Lecture Notes in Mathematics 630, pp. 105–116.
 * Transcribed step by step (0-based, column-major) with these deviations:
 *
 * - Non-finite residuals at a trial point count as a failed step (actual
 *   reduction −1), so the radius Δ shrinks and λ grows; a non-finite Jacobian
 *   at an accepted point stops with `info: "jacobian-not-finite"`.
 * - An iteration limit besides MINPACK's evaluation limit `maxfev`.
 * - Box bounds (optional), by a projected active-set step: a parameter at a
 *   bound whose gradient points outward is held (its Jacobian column is
 *   zeroed before the QR, so the step leaves it alone and the gradient test
 *   ignores it); a trial point is projected onto the box, and the predicted
 *   reduction is then that of the projected step, 1 − ‖F + J·s‖²/‖F‖², so the
 *   ratio test and the radius update keep their meaning. Projection keeps the
 *   parameters themselves (and so the Jacobian and covariance) untransformed,
 *   unlike a change of variables that flattens the objective near a bound;
 *   projected Levenberg–Marquardt converges like the unconstrained method
 *   (Kanzow, Yamashita & Fukushima 2004, "Levenberg–Marquardt methods with
 *   strong local convergence properties for solving nonlinear equations
 *   with convex constraints", J. Comput. Appl. Math. 172; from memory).
 *
 * ```
 *  x ──fcn──▶ F ──jac──▶ J ──qrfac──▶ R, QᵀF, column norms → D = max(D, ‖J_j‖)
 *        ▲                               │
 *        │   ρ = actual / predicted ◀────┴─ lmpar(Δ) → λ, step p (‖Dp‖ ≈ Δ)
 *        └── accept if ρ ≥ 1e-4; Δ ← Δ/2…Δ/10 when ρ ≤ ¼, 2‖Dp‖ when ρ ≥ ¾
 * ```
 *
 * @module
 */
import { enorm } from "./enorm.ts";
import { qrfac, qrfacWork } from "./qrfac.ts";
import { lmpar } from "./lmpar.ts";

const EPSMCH = 2.220446049250313e-16;

/** A least-squares problem: minimise ½‖F(x)‖² over x ∈ ℝⁿ, F: ℝⁿ → ℝᵐ. */
export interface LeastSquaresProblem {
  /** Number of residuals. */
  m: number;
  /** Number of parameters. */
  n: number;
  /** Writes F(x) into `fvec` (non-finite values allowed: the step is refused). */
  fcn(x: Float64Array, fvec: Float64Array): void;
  /** Writes ∂F/∂x into `fjac` (m×n, column-major). */
  jac(x: Float64Array, fjac: Float64Array): void;
}

/** Tolerances and limits; defaults in {@link LMDER_DEFAULTS}. */
export interface LmderOptions {
  /** Stop when actual and predicted relative reductions of ‖F‖² are ≤ ftol. */
  ftol?: number;
  /** Stop when the relative change of the scaled parameters is ≤ xtol. */
  xtol?: number;
  /** Stop when the cosine between F and every column of J is ≤ gtol. */
  gtol?: number;
  /** Largest number of evaluations of F. */
  maxfev?: number;
  /** Largest number of accepted steps. */
  maxIterations?: number;
  /** Initial Δ = factor·‖D·x₀‖ (or factor when that is 0). */
  factor?: number;
  /** Lower bounds (−Infinity for none); the start must lie inside. */
  lower?: Float64Array;
  /** Upper bounds (Infinity for none). */
  upper?: Float64Array;
}

/** Tight defaults: the fit cell wants every digit the data carry. */
export const LMDER_DEFAULTS = {
  ftol: 1e-15,
  xtol: 1e-15,
  gtol: 1e-15,
  maxfev: 0, // 0: 200·(n + 1)·… see lmder
  maxIterations: 1000,
  factor: 100,
} as const;

/** Why the iteration stopped (MINPACK's `info`, by name). */
export type LmderInfo =
  | "ftol" // 1: relative reduction ≤ ftol
  | "xtol" // 2: relative step ≤ xtol
  | "ftol+xtol" // 3
  | "gtol" // 4: gradient cosine ≤ gtol
  | "maxfev" // 5
  | "ftol-eps" // 6: no further reduction possible in double
  | "xtol-eps" // 7: no further improvement of x possible
  | "gtol-eps" // 8: F orthogonal to J's columns to machine precision
  | "maxiter"
  | "jacobian-not-finite"
  | "start-not-finite";

/** The outcome. */
export interface LmderResult {
  x: Float64Array;
  /** F at `x`. */
  fvec: Float64Array;
  /** ‖F(x)‖. */
  fnorm: number;
  info: LmderInfo;
  /** Whether `info` is one of the convergence tests (1–4, 6–8). */
  converged: boolean;
  nfev: number;
  njev: number;
  /** Accepted steps. */
  iterations: number;
  /** Largest |cosine| between F and a free column of J at the last Jacobian. */
  gnorm: number;
}

const CONVERGED = new Set<LmderInfo>([
  "ftol",
  "xtol",
  "ftol+xtol",
  "gtol",
  "ftol-eps",
  "xtol-eps",
  "gtol-eps",
]);

/**
 * Minimises ½‖F(x)‖² from `x0` (see the module doc).
 *
 * @param problem F, its Jacobian and the sizes.
 * @param x0 The start (inside the bounds when bounds are given).
 * @param options Tolerances, limits and bounds.
 * @returns The last accepted point, its residuals and why the iteration stopped.
 * @example
 * ```ts
 * import { lmder } from "./lmder.ts";
 * // Rosenbrock as least squares: F = (10(x₂ − x₁²), 1 − x₁), minimum at (1, 1).
 * const r = lmder({
 *   m: 2, n: 2,
 *   fcn: (x, f) => { f[0] = 10 * (x[1] - x[0] * x[0]); f[1] = 1 - x[0]; },
 *   jac: (x, j) => { j[0] = -20 * x[0]; j[1] = -1; j[2] = 10; j[3] = 0; },
 * }, new Float64Array([-1.2, 1]));
 * if (!r.converged || Math.abs(r.x[0] - 1) > 1e-12) throw new Error(r.info);
 * ```
 */
export function lmder(
  problem: LeastSquaresProblem,
  x0: ArrayLike<number>,
  options: LmderOptions = {},
): LmderResult {
  const { m, n } = problem;
  const o = { ...LMDER_DEFAULTS, ...options };
  const maxfev = o.maxfev > 0 ? o.maxfev : 200 * (n + 1) * 5;
  const lower = options.lower, upper = options.upper;
  const bounded = lower !== undefined || upper !== undefined;
  const x = Float64Array.from(x0);
  let fvec = new Float64Array(m), wa4 = new Float64Array(m);
  const fjac = new Float64Array(m * n), jcopy = bounded ? new Float64Array(m * n) : null;
  const diag = new Float64Array(n), qtf = new Float64Array(n);
  const wa1 = new Float64Array(n), wa2 = new Float64Array(n), wa3 = new Float64Array(n);
  const sdiag = new Float64Array(n);
  // Work arrays made once per call, not once per step (as MINPACK's lmder passes its wa2, wa3
  // to lmpar as scratch; they hold nothing across that call).
  const qrWork = qrfacWork(n), wqtf = new Float64Array(m), swa = new Float64Array(n);
  const out = (info: LmderInfo): LmderResult => ({
    x,
    fvec,
    fnorm,
    info,
    converged: CONVERGED.has(info),
    nfev,
    njev,
    iterations: iter - 1,
    gnorm,
  });
  let nfev = 1, njev = 0, iter = 1, gnorm = Infinity, par = 0, delta = 0, xnorm = 0;
  problem.fcn(x, fvec);
  let fnorm = enorm(fvec);
  if (!Number.isFinite(fnorm)) return out("start-not-finite");
  for (;;) {
    // Outer loop: Jacobian, its QR, scaling and the gradient test.
    problem.jac(x, fjac);
    njev++;
    if (!allFinite(fjac)) return out("jacobian-not-finite");
    if (bounded) holdActive(m, n, x, fvec, fjac, lower, upper);
    if (jcopy) jcopy.set(fjac);
    const { ipvt, rdiag, acnorm } = qrfac(m, n, fjac, true, qrWork);
    if (iter === 1) {
      for (let j = 0; j < n; j++) diag[j] = acnorm[j] === 0 ? 1 : acnorm[j];
      for (let j = 0; j < n; j++) wa3[j] = diag[j] * x[j];
      xnorm = enorm(wa3);
      delta = o.factor * xnorm;
      if (delta === 0) delta = o.factor;
    }
    formQtf(m, n, fjac, rdiag, fvec, qtf, wqtf);
    gnorm = gradientCosine(m, n, fjac, ipvt, acnorm, qtf, fnorm);
    if (gnorm <= o.gtol) return out("gtol");
    for (let j = 0; j < n; j++) diag[j] = Math.max(diag[j], acnorm[j]);
    // Inner loop: shrink Δ until a step is accepted.
    for (;;) {
      par = lmpar(n, fjac, m, ipvt, diag, qtf, delta, par, wa1, sdiag, wa2, wa3, swa);
      let clipped = false;
      for (let j = 0; j < n; j++) {
        wa1[j] = -wa1[j];
        let t = x[j] + wa1[j];
        if (lower && t < lower[j]) [t, clipped] = [lower[j], true];
        if (upper && t > upper[j]) [t, clipped] = [upper[j], true];
        wa2[j] = t;
      }
      if (clipped) { for (let j = 0; j < n; j++) wa1[j] = wa2[j] - x[j]; }
      for (let j = 0; j < n; j++) wa3[j] = diag[j] * wa1[j];
      const pnorm = enorm(wa3);
      if (iter === 1) delta = Math.min(delta, pnorm);
      problem.fcn(wa2, wa4);
      nfev++;
      let fnorm1 = enorm(wa4);
      if (!Number.isFinite(fnorm1)) fnorm1 = Infinity;
      const actred = 0.1 * fnorm1 < fnorm ? 1 - (fnorm1 / fnorm) ** 2 : -1;
      const { prered, dirder } = clipped
        ? projectedReduction(m, n, jcopy!, fvec, wa1, fnorm)
        : predictedReduction(n, fjac, m, ipvt, wa1, wa3, par, pnorm, fnorm);
      const ratio = prered !== 0 ? actred / prered : 0;
      // Update the radius Δ and λ.
      if (ratio <= 0.25) {
        let temp = actred >= 0 ? 0.5 : 0.5 * dirder / (dirder + 0.5 * actred);
        if (0.1 * fnorm1 >= fnorm || temp < 0.1 || !Number.isFinite(temp)) temp = 0.1;
        delta = temp * Math.min(delta, pnorm / 0.1);
        par /= temp;
      } else if (par === 0 || ratio >= 0.75) {
        delta = pnorm / 0.5;
        par *= 0.5;
      }
      if (ratio >= 1e-4) {
        // Successful iteration: take the step.
        x.set(wa2);
        for (let j = 0; j < n; j++) wa2[j] = diag[j] * x[j];
        [fvec, wa4] = [wa4, fvec];
        xnorm = enorm(wa2);
        fnorm = fnorm1;
        iter++;
      }
      // Convergence tests.
      const fOk = Math.abs(actred) <= o.ftol && prered <= o.ftol && 0.5 * ratio <= 1;
      const xOk = delta <= o.xtol * xnorm;
      if (fOk && xOk) return out("ftol+xtol");
      if (fOk) return out("ftol");
      if (xOk) return out("xtol");
      // Termination tests: limits and tolerances too small for double.
      if (nfev >= maxfev) return out("maxfev");
      if (iter > o.maxIterations) return out("maxiter");
      if (Math.abs(actred) <= EPSMCH && prered <= EPSMCH && 0.5 * ratio <= 1) {
        return out("ftol-eps");
      }
      if (delta <= EPSMCH * xnorm) return out("xtol-eps");
      if (gnorm <= EPSMCH) return out("gtol-eps");
      if (ratio >= 1e-4) break;
    }
  }
}

function allFinite(a: Float64Array): boolean {
  for (let i = 0; i < a.length; i++) if (!Number.isFinite(a[i])) return false;
  return true;
}

/**
 * Holds parameters at a bound whose descent direction −(JᵀF)_j points out of
 * the box by zeroing their Jacobian columns.
 */
function holdActive(
  m: number,
  n: number,
  x: Float64Array,
  f: Float64Array,
  jac: Float64Array,
  lower: Float64Array | undefined,
  upper: Float64Array | undefined,
): void {
  for (let j = 0; j < n; j++) {
    const atLo = lower !== undefined && x[j] <= lower[j];
    const atHi = upper !== undefined && x[j] >= upper[j];
    if (!atLo && !atHi) continue;
    let g = 0;
    for (let i = 0; i < m; i++) g += jac[i + j * m] * f[i];
    if ((atLo && g > 0) || (atHi && g < 0)) jac.fill(0, j * m, j * m + m);
  }
}

/** Qᵀ·fvec (first n components into qtf, `w` of m values as scratch), then R's diagonal back into the matrix. */
function formQtf(
  m: number,
  n: number,
  fjac: Float64Array,
  rdiag: Float64Array,
  fvec: Float64Array,
  qtf: Float64Array,
  w: Float64Array,
): void {
  w.set(fvec);
  for (let j = 0; j < n; j++) {
    const cj = j * m, ajj = fjac[j + cj];
    if (ajj !== 0) {
      let sum = 0;
      for (let i = j; i < m; i++) sum += fjac[i + cj] * w[i];
      const temp = -sum / ajj;
      for (let i = j; i < m; i++) w[i] += fjac[i + cj] * temp;
    }
    fjac[j + cj] = rdiag[j];
    qtf[j] = w[j];
  }
}

/** MINPACK's gnorm: max_j |cos(F, J_j)| over columns with non-zero norm. */
function gradientCosine(
  m: number,
  n: number,
  r: Float64Array,
  ipvt: Int32Array,
  acnorm: Float64Array,
  qtf: Float64Array,
  fnorm: number,
): number {
  let g = 0;
  if (fnorm === 0) return 0;
  for (let j = 0; j < n; j++) {
    const l = ipvt[j];
    if (acnorm[l] === 0) continue;
    let sum = 0;
    for (let i = 0; i <= j; i++) sum += r[i + j * m] * (qtf[i] / fnorm);
    g = Math.max(g, Math.abs(sum / acnorm[l]));
  }
  return g;
}

/** MINPACK's scaled predicted reduction and directional derivative, from R. */
function predictedReduction(
  n: number,
  r: Float64Array,
  ldr: number,
  ipvt: Int32Array,
  p: Float64Array,
  w: Float64Array,
  par: number,
  pnorm: number,
  fnorm: number,
): { prered: number; dirder: number } {
  w.fill(0);
  for (let j = 0; j < n; j++) {
    const temp = p[ipvt[j]];
    for (let i = 0; i <= j; i++) w[i] += r[i + j * ldr] * temp;
  }
  const t1 = enorm(w) / fnorm, t2 = Math.sqrt(par) * pnorm / fnorm;
  return { prered: t1 * t1 + t2 * t2 / 0.5, dirder: -(t1 * t1 + t2 * t2) };
}

/** Reduction predicted by the linear model for a projected step s: 1 − ‖F + Js‖²/‖F‖². */
function projectedReduction(
  m: number,
  n: number,
  jac: Float64Array,
  f: Float64Array,
  s: Float64Array,
  fnorm: number,
): { prered: number; dirder: number } {
  let lin = 0, cross = 0;
  for (let i = 0; i < m; i++) {
    let js = 0;
    for (let j = 0; j < n; j++) js += jac[i + j * m] * s[j];
    const v = (f[i] + js) / fnorm;
    lin += v * v;
    cross += f[i] * js;
  }
  return { prered: 1 - lin, dirder: 2 * cross / (fnorm * fnorm) };
}
