/**
 * Fits to a response with values below a detection limit (issue 20 item 2):
 * maximum likelihood with the censored rows entering through the normal
 * distribution function, for a mean linear or nonlinear in its parameters.
 *
 * ```
 *  log L(θ, σ) = Σ_measured [−½·log(2πσ²) − (yᵢ − μᵢ)²/(2σ²)] + Σ_below log Φ((Lᵢ − μᵢ)/σ)
 *  μᵢ = f(xᵢ; θ);  parameters θ and log σ;  start: least squares with each Lᵢ as if measured
 *  maximise: Newton steps on the analytic gradient, the Hessian by central differences of it,
 *            damped (Levenberg) until log L rises; stop when the step is below 1e-10 relative
 *  standard errors: the inverse of the observed information (−Hessian) at the maximum
 *  beside it: least squares with each Lᵢ replaced by 0, L/2, L/√2 and L (the substitutions
 *            practice uses), each estimate's shift from the ML one in its standard errors
 * ```
 *
 * With ζᵢ = (Lᵢ − μᵢ)/σ and λᵢ = φ(ζᵢ)/Φ(ζᵢ) (the inverse Mills ratio), the
 * gradient is ∂/∂θ = Σ_measured zᵢ/σ·∂μᵢ/∂θ − Σ_below λᵢ/σ·∂μᵢ/∂θ and
 * ∂/∂log σ = Σ_measured (zᵢ² − 1) − Σ_below λᵢζᵢ, zᵢ = (yᵢ − μᵢ)/σ
 * (Tobin 1958, "Estimation of relationships for limited dependent
 * variables", Econometrica 26; the censored normal likelihood as in Helsel,
 * *Statistics for Censored Environmental Data Using Minitab and R*, 2nd ed.
 * (2012), ch. 5 — from memory for the chapter). Φ of a very negative ζ is
 * taken from the upper tail (relative-accurate), so λ stays right far below
 * the limit.
 *
 * @module
 */
import { standardNormal } from "../../kernel/stats/mod.ts";
import type { ModelFunctions } from "../../kernel/optim/mod.ts";

/** What a censored fit needs. */
export interface CensoredInput {
  fns: ModelFunctions;
  /** Responses: a measured value, or the detection limit where `below` is 1. */
  y: Float64Array;
  below: Uint8Array;
  /** A start for θ (least squares on the values as written). */
  start: Float64Array;
}

/** The maximum-likelihood fit. */
export interface CensoredFit {
  estimates: Float64Array;
  sigma: number;
  /** Covariance of (θ, log σ), (p+1)×(p+1) column-major, from the observed information. */
  covariance: Float64Array;
  stdErrors: Float64Array;
  sigmaStdError: number;
  logLikelihood: number;
  iterations: number;
  converged: boolean;
  /** Rows below their limit. */
  below: number;
}

const MAX_ITER = 200;

/**
 * Maximises the censored normal likelihood.
 *
 * @param input Model functions, responses, censoring flags and a start.
 * @returns The fit (`converged` false when the iteration limit was reached).
 */
export function fitCensored(input: CensoredInput): CensoredFit {
  const { fns, y, below } = input;
  const n = y.length, p = input.start.length, q = p + 1;
  let belowCount = 0;
  for (let i = 0; i < n; i++) belowCount += below[i];
  const x = new Float64Array(q);
  x.set(input.start);
  // σ starts at the residual scale of the values as written.
  const mu0 = fns.f(input.start);
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (y[i] - mu0[i]) ** 2;
  x[p] = Math.log(Math.sqrt(ss / Math.max(1, n - p)) || 1);
  const jac = new Float64Array(n * p);
  let ll = logLikelihood(fns, y, below, x, jac, null);
  let lambda = 1e-3;
  let converged = false;
  let it = 0;
  const g = new Float64Array(q);
  for (; it < MAX_ITER; it++) {
    logLikelihood(fns, y, below, x, jac, g);
    const h = hessian(fns, y, below, x, jac);
    // Newton on −log L: (−H + λ·diag) δ = g, λ raised until log L rises.
    let step: Float64Array | null = null;
    for (let tries = 0; tries < 30; tries++) {
      const a = new Float64Array(q * q);
      for (let k = 0; k < q * q; k++) a[k] = -h[k];
      for (let k = 0; k < q; k++) a[k + k * q] += lambda * Math.max(1e-12, Math.abs(h[k + k * q]));
      const d = solveSymmetric(a, g, q);
      if (d !== null) {
        const trial = x.map((v, k) => v + d[k]);
        const llt = logLikelihood(fns, y, below, trial, jac, null);
        if (Number.isFinite(llt) && llt >= ll - 1e-12 * Math.abs(ll)) {
          step = d;
          x.set(trial);
          const rise = llt - ll;
          ll = llt;
          lambda = Math.max(1e-12, lambda / 10);
          if (rise <= 1e-14 * Math.max(1, Math.abs(ll)) && small(d, x)) converged = true;
          break;
        }
      }
      lambda *= 10;
    }
    if (step === null) {
      // No step raises log L: a maximum to rounding when the gradient is small.
      converged = gradientSmall(g, x);
      break;
    }
    if (converged || small(step, x)) {
      converged = true;
      it++;
      break;
    }
  }
  logLikelihood(fns, y, below, x, jac, g);
  const h = hessian(fns, y, below, x, jac);
  const info = h.map((v) => -v);
  const cov = invertSymmetric(info, q) ?? new Float64Array(q * q).fill(NaN);
  const se = Float64Array.from({ length: p }, (_, k) => Math.sqrt(cov[k + k * q]));
  const sigma = Math.exp(x[p]);
  return {
    estimates: x.slice(0, p),
    sigma,
    covariance: cov,
    stdErrors: se,
    sigmaStdError: sigma * Math.sqrt(cov[p + p * q]),
    logLikelihood: ll,
    iterations: it,
    converged,
    below: belowCount,
  };
}

function small(d: Float64Array, x: Float64Array): boolean {
  for (let k = 0; k < d.length; k++) {
    if (Math.abs(d[k]) > 1e-10 * Math.max(1, Math.abs(x[k]))) return false;
  }
  return true;
}

function gradientSmall(g: Float64Array, x: Float64Array): boolean {
  for (let k = 0; k < g.length; k++) {
    if (Math.abs(g[k]) > 1e-6 * Math.max(1, Math.abs(x[k]))) return false;
  }
  return true;
}

/** log Φ(ζ) and λ = φ(ζ)/Φ(ζ), accurate far into the lower tail. */
function logCdfAndMills(z: number): [number, number] {
  const cdf = standardNormal.upper(-z); // Φ(z) = P(Z > −z), relative-accurate when small
  const dens = standardNormal.density(z);
  if (cdf > 0) return [Math.log(cdf), dens / cdf];
  // Beyond double's range of Φ: the asymptotic forms (Mills' ratio ~ −z).
  return [-0.5 * z * z - Math.log(-z) - 0.5 * Math.log(2 * Math.PI), -z];
}

/**
 * log L at x = (θ, log σ); with `g`, also its gradient into g (∂μ/∂θ into `jac`).
 */
function logLikelihood(
  fns: ModelFunctions,
  y: Float64Array,
  below: Uint8Array,
  x: Float64Array,
  jac: Float64Array,
  g: Float64Array | null,
): number {
  const n = y.length, p = x.length - 1;
  const theta = x.subarray(0, p);
  const sigma = Math.exp(x[p]);
  if (!Number.isFinite(sigma) || sigma <= 0) return -Infinity;
  const mu = fns.f(theta);
  if (g !== null) {
    fns.jac(theta, jac);
    g.fill(0);
  }
  const half = 0.5 * Math.log(2 * Math.PI);
  let ll = 0;
  for (let i = 0; i < n; i++) {
    const z = (y[i] - mu[i]) / sigma;
    if (!Number.isFinite(z)) return -Infinity;
    let w: number; // ∂ log Lᵢ / ∂μᵢ · σ
    if (below[i]) {
      const [lc, mills] = logCdfAndMills(z);
      ll += lc;
      w = -mills;
      if (g !== null) g[p] += -mills * z;
    } else {
      ll += -half - x[p] - 0.5 * z * z;
      w = z;
      if (g !== null) g[p] += z * z - 1;
    }
    if (g !== null) {
      for (let k = 0; k < p; k++) g[k] += (w / sigma) * jac[i + k * n];
    }
  }
  return ll;
}

/** The Hessian of log L by central differences of the analytic gradient, symmetrised. */
function hessian(
  fns: ModelFunctions,
  y: Float64Array,
  below: Uint8Array,
  x: Float64Array,
  jac: Float64Array,
): Float64Array {
  const q = x.length;
  const h = new Float64Array(q * q);
  const gp = new Float64Array(q), gm = new Float64Array(q);
  for (let k = 0; k < q; k++) {
    const step = 1e-5 * Math.max(1, Math.abs(x[k]));
    const xp = x.slice(), xm = x.slice();
    xp[k] += step;
    xm[k] -= step;
    logLikelihood(fns, y, below, xp, jac, gp);
    logLikelihood(fns, y, below, xm, jac, gm);
    for (let r = 0; r < q; r++) h[r + k * q] = (gp[r] - gm[r]) / (2 * step);
  }
  for (let a = 0; a < q; a++) {
    for (let b = a + 1; b < q; b++) {
      const m = (h[a + b * q] + h[b + a * q]) / 2;
      h[a + b * q] = m;
      h[b + a * q] = m;
    }
  }
  return h;
}

/** Solves A·d = b for a small symmetric positive definite A (Cholesky); null when it is not. */
function solveSymmetric(a: Float64Array, b: Float64Array, q: number): Float64Array | null {
  const l = cholesky(a, q);
  if (l === null) return null;
  const z = new Float64Array(q);
  for (let i = 0; i < q; i++) {
    let s = b[i];
    for (let k = 0; k < i; k++) s -= l[i + k * q] * z[k];
    z[i] = s / l[i + i * q];
  }
  const d = new Float64Array(q);
  for (let i = q - 1; i >= 0; i--) {
    let s = z[i];
    for (let k = i + 1; k < q; k++) s -= l[k + i * q] * d[k];
    d[i] = s / l[i + i * q];
  }
  return d;
}

function cholesky(a: Float64Array, q: number): Float64Array | null {
  const l = new Float64Array(q * q);
  for (let j = 0; j < q; j++) {
    let s = a[j + j * q];
    for (let k = 0; k < j; k++) s -= l[j + k * q] ** 2;
    if (!(s > 0)) return null;
    l[j + j * q] = Math.sqrt(s);
    for (let i = j + 1; i < q; i++) {
      let t = a[i + j * q];
      for (let k = 0; k < j; k++) t -= l[i + k * q] * l[j + k * q];
      l[i + j * q] = t / l[j + j * q];
    }
  }
  return l;
}

function invertSymmetric(a: Float64Array, q: number): Float64Array | null {
  const out = new Float64Array(q * q);
  for (let j = 0; j < q; j++) {
    const e = new Float64Array(q);
    e[j] = 1;
    const c = solveSymmetric(a, e, q);
    if (c === null) return null;
    out.set(c, j * q);
  }
  return out;
}
