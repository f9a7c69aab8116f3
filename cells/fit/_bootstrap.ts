/**
 * Bootstrap intervals of a fit's parameters (issue 19): refits to resampled
 * data, seeded from the document's seed, each from the estimates (the
 * compiled model reused: only the residual vector changes).
 *
 * ```
 *  residuals: y* = ŷ + e* ÷ √w, e* drawn from the modified residuals
 *             √wᵢ·rᵢ/√(1 − hᵢ), centred    (Davison & Hinkley 1997, Alg. 6.3)
 *  cases:     rows (xᵢ, yᵢ, wᵢ) drawn with replacement   (D&H Alg. 6.2)
 *  each: Levenberg–Marquardt from θ̂ ─▶ θ*_b (a refit that fails is left out and counted)
 *  percentile: θ*_((B+1)α) and θ*_((B+1)(1−α))  (D&H eq. 5.18)
 *  BCa: z₀ = Φ⁻¹(#{θ* < θ̂}/B), a from the jackknife (Efron & Tibshirani 1993, §14.3,
 *       eqs. 14.14–14.15), levels Φ(z₀ + (z₀ + z_α)/(1 − a(z₀ + z_α)))
 *  Monte Carlo error of a limit at level α: half the distance between the order
 *       statistics ±√(Bα(1−α)) ranks away (the count of replicates below a quantile
 *       is binomial; common practice, no source)
 * ```
 *
 * Sources: Efron & Tibshirani, *An Introduction to the Bootstrap* (1993),
 * ch. 13–14; Davison & Hinkley, *Bootstrap Methods and their Application*
 * (1997), ch. 5–6.
 *
 * @module
 */
import { lmder, type ModelFunctions } from "../../kernel/optim/mod.ts";
import { hatValues, standardNormal } from "../../kernel/stats/mod.ts";
import { mulberry32Uint } from "../../kernel/random.ts";
import type { LabelledInterval } from "./_profile.ts";

/** How rows are resampled. */
export type Resample = "residuals" | "cases";

/** What the bootstrap needs of a fit. */
export interface BootstrapInput {
  fns: ModelFunctions;
  parameters: readonly string[];
  estimates: Float64Array;
  /** The response as fitted (transformed), unweighted fitted values and the design (∂f/∂θ columns). */
  y: Float64Array;
  fitted: Float64Array;
  design: readonly Float64Array[];
  /** Row weights, or null. */
  weights: Float64Array | null;
  lower: Float64Array;
  upper: Float64Array;
  resample: Resample;
  /** Resamples wanted. */
  b: number;
  seed: number;
  level: number;
  /** Reports progress in [0, 1]; may throw to stop. */
  progress?: (fraction: number) => void;
}

/** The replicates and what was left out. */
export interface BootstrapRun {
  /** B_ok × p, row-major, parameter order. */
  replicates: Float64Array;
  /** Replicates kept (refits that converged). */
  b: number;
  /** Refits that failed (did not converge, or non-finite), left out. */
  failed: number;
  resample: Resample;
  seed: number;
  /**
   * Jackknife estimates (`jackknifeRows` × p, row-major) for BCa's
   * acceleration: leave-one-row-out up to {@link JACKKNIFE_GROUPS} rows,
   * beyond that leave-one-group-out over that many contiguous groups.
   */
  jackknife: Float64Array | null;
  /** Rows of `jackknife`: n, or the number of groups. */
  jackknifeRows: number;
}

/**
 * Most leave-out refits for BCa's acceleration: beyond this many rows the
 * jackknife leaves out groups of rows instead (a grouped jackknife, Efron &
 * Tibshirani 1993 §11.6), so a large fit does not refit once per row.
 */
export const JACKKNIFE_GROUPS = 500;

/** Tolerances of each refit: looser than the fit itself (the spread is the point, not the digits). */
const REFIT = { ftol: 1e-10, xtol: 1e-10, gtol: 1e-12, maxIterations: 100 };

/**
 * Refits the model to `b` resampled data sets.
 *
 * @param input The fit and the resampling asked for.
 * @returns The replicates (and the jackknife for BCa).
 */
export function bootstrap(input: BootstrapInput): BootstrapRun {
  const { fns, estimates, y, fitted } = input;
  const n = y.length, p = estimates.length;
  const m = fns.problem.m;
  const sqrtW = fns.sqrtW;
  const next = mulberry32Uint(input.seed ^ 0x5bd1e995);
  const draw = (k: number) => Math.floor((next() / 4294967296) * k);
  // F(θ) for the data as fitted, then shifted or gathered per replicate.
  const base = new Float64Array(m), full = new Float64Array(m * p);
  const out = new Float64Array(input.b * p);
  let kept = 0, failed = 0;
  const shift = new Float64Array(n);
  const idx = new Int32Array(n);
  let modified: Float64Array | null = null;
  if (input.resample === "residuals") modified = modifiedResiduals(input);
  for (let r = 0; r < input.b; r++) {
    let problem;
    if (modified !== null) {
      // y* = ŷ + e* ÷ √w: F*(θ) = √w(f − y*) = F(θ) + √w(y − ŷ) − e*.
      for (let i = 0; i < n; i++) {
        shift[i] = sqrtW[i] * (y[i] - fitted[i]) - modified[draw(n)];
      }
      problem = {
        m,
        n: p,
        fcn: (x: Float64Array, f: Float64Array) => {
          fns.problem.fcn(x, f);
          for (let i = 0; i < m; i++) f[i] += shift[i];
        },
        jac: fns.problem.jac,
      };
    } else {
      for (let i = 0; i < n; i++) idx[i] = draw(n);
      problem = gathered(fns, idx, base, full, p);
    }
    const fit = lmder(problem, estimates.slice(), {
      ...REFIT,
      lower: input.lower,
      upper: input.upper,
    });
    if (fit.converged && fit.x.every(Number.isFinite)) {
      out.set(fit.x, kept * p);
      kept++;
    } else failed++;
    if ((r & 63) === 63) input.progress?.((r + 1) / (input.b + Math.min(n, JACKKNIFE_GROUPS)));
  }
  const jackknife = jackknifeOf(input, base, full);
  return {
    replicates: out.slice(0, kept * p),
    b: kept,
    failed,
    resample: input.resample,
    seed: input.seed,
    jackknife,
    jackknifeRows: Math.min(n, JACKKNIFE_GROUPS),
  };
}

/** Centred modified residuals √wᵢ·rᵢ/√(1 − hᵢ) (D&H eq. 6.9; h from ∂f/∂θ at θ̂). */
function modifiedResiduals(input: BootstrapInput): Float64Array {
  const { y, fitted, weights, design } = input;
  const n = y.length;
  let h: Float64Array;
  try {
    h = hatValues(design, weights);
  } catch {
    h = new Float64Array(n);
  }
  const e = new Float64Array(n);
  let mean = 0;
  for (let i = 0; i < n; i++) {
    const w = weights === null ? 1 : Math.sqrt(weights[i]);
    const lev = Math.min(h[i], 1 - 1e-12);
    e[i] = (w * (y[i] - fitted[i])) / Math.sqrt(1 - lev);
    mean += e[i];
  }
  mean /= n;
  for (let i = 0; i < n; i++) e[i] -= mean;
  return e;
}

/** The problem over the rows `idx` (repeats allowed) of the data as fitted. */
function gathered(
  fns: ModelFunctions,
  idx: Int32Array,
  base: Float64Array,
  full: Float64Array,
  p: number,
) {
  const m = idx.length, all = fns.problem.m;
  return {
    m,
    n: p,
    fcn: (x: Float64Array, f: Float64Array) => {
      fns.problem.fcn(x, base);
      for (let i = 0; i < m; i++) f[i] = base[idx[i]];
    },
    jac: (x: Float64Array, out: Float64Array) => {
      fns.problem.jac(x, full);
      for (let j = 0; j < p; j++) {
        const o = j * m, s = j * all;
        for (let i = 0; i < m; i++) out[o + i] = full[s + idx[i]];
      }
    },
  };
}

/**
 * Leave-one-out refits (rows × p) for BCa's acceleration: each row, or each
 * of {@link JACKKNIFE_GROUPS} contiguous groups of rows; null when one fails.
 */
function jackknifeOf(input: BootstrapInput, base: Float64Array, full: Float64Array) {
  const n = input.y.length, p = input.estimates.length;
  const groups = Math.min(n, JACKKNIFE_GROUPS);
  const out = new Float64Array(groups * p);
  const idx = new Int32Array(n);
  for (let g = 0; g < groups; g++) {
    // Group g holds rows [⌊g·n/groups⌋, ⌊(g+1)·n/groups⌋).
    const from = Math.floor((g * n) / groups), to = Math.floor(((g + 1) * n) / groups);
    let k = 0;
    for (let i = 0; i < n; i++) if (i < from || i >= to) idx[k++] = i;
    const fit = lmder(
      gathered(input.fns, idx.subarray(0, k), base, full, p),
      input.estimates.slice(),
      {
        ...REFIT,
        lower: input.lower,
        upper: input.upper,
      },
    );
    if (!fit.converged || !fit.x.every(Number.isFinite)) return null;
    out.set(fit.x, g * p);
    if ((g & 31) === 31) input.progress?.((input.b + g + 1) / (input.b + groups));
  }
  return out;
}

/**
 * Percentile and BCa intervals of one quantity from its replicates.
 *
 * @param values Replicates of the quantity (any order; copied and sorted).
 * @param estimate Its estimate from the data.
 * @param jackknife Its leave-one-out values (for BCa), or null (no BCa).
 * @param level The confidence level.
 * @returns The two labelled intervals (BCa only with a jackknife).
 */
export function bootstrapIntervals(
  values: Float64Array,
  estimate: number,
  jackknife: Float64Array | null,
  level: number,
): LabelledInterval[] {
  const sorted = values.filter(Number.isFinite).sort();
  const b = sorted.length;
  const alpha = (1 - level) / 2;
  const few = b < 2 / Math.min(alpha, 1 - level) ? "too few resamples for this level" : null;
  const percentile = limitsAt(sorted, alpha, 1 - alpha);
  const out: LabelledInterval[] = [{
    method: "bootstrap-percentile",
    level,
    ...percentile,
    ...(few ? { note: few } : {}),
  }];
  if (jackknife === null) return out;
  let below = 0;
  for (const v of sorted) below += v < estimate ? 1 : v === estimate ? 0.5 : 0;
  const N = standardNormal;
  const z0 = N.quantile(Math.min(1 - 1 / (2 * b), Math.max(1 / (2 * b), below / b)));
  const a = acceleration(jackknife);
  const adjust = (za: number) => N.cdf(z0 + (z0 + za) / (1 - a * (z0 + za)));
  const lo = adjust(N.quantile(alpha)), hi = adjust(N.quantile(1 - alpha));
  out.push({
    method: "bootstrap-bca",
    level,
    ...limitsAt(sorted, lo, hi),
    ...(few ? { note: few } : {}),
  });
  return out;
}

/** Efron & Tibshirani eq. 14.15: a = Σ(θ̄ − θ₍ᵢ₎)³ / (6·(Σ(θ̄ − θ₍ᵢ₎)²)^{3/2}). */
function acceleration(jack: Float64Array): number {
  const n = jack.length;
  let mean = 0;
  for (const v of jack) mean += v;
  mean /= n;
  let s2 = 0, s3 = 0;
  for (const v of jack) {
    const d = mean - v;
    s2 += d * d;
    s3 += d * d * d;
  }
  return s2 === 0 ? 0 : s3 / (6 * Math.pow(s2, 1.5));
}

/** The order statistics at levels lo and hi ((B+1)·level, interpolated), with their Monte Carlo errors. */
function limitsAt(sorted: Float64Array, lo: number, hi: number) {
  const at = (q: number) => order(sorted, q);
  const mc = (q: number) => {
    const b = sorted.length;
    const spread = Math.sqrt(b * q * (1 - q)) / (b + 1);
    const a = at(q - spread), c = at(q + spread);
    return a === null || c === null ? null : (c - a) / 2;
  };
  return {
    lower: at(lo),
    upper: at(hi),
    mc_error: { lower: mc(lo), upper: mc(hi) },
  };
}

/** θ*_((B+1)q), linearly interpolated between ranks; null outside 1…B. */
function order(sorted: Float64Array, q: number): number | null {
  const b = sorted.length;
  const r = (b + 1) * q;
  if (!(r >= 1 && r <= b)) return null;
  const k = Math.floor(r), f = r - k;
  return k >= b ? sorted[b - 1] : sorted[k - 1] + f * (sorted[k] - sorted[k - 1]);
}
