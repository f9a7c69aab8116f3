/**
 * Deming regression of y on x when both carry error, with jackknife
 * standard errors.
 *
 * Sources:
 * - Deming's closed form for a known ratio δ = σ²(y)/σ²(x) of the error
 *   variances: with the centred sums u = Σ(x − x̄)², q = Σ(y − ȳ)²,
 *   p = Σ(x − x̄)(y − ȳ),
 *     b = (q − δu + √((q − δu)² + 4δp²)) / (2p),   a = ȳ − b·x̄
 *   (Linnet 1993, "Evaluation of regression procedures for methods
 *   comparison studies", Clin. Chem. 39:424–432, whose λ is our 1/δ).
 * - The weighted form for proportional errors (Linnet 1990, "Estimation of
 *   the linear relationship between the measurements of two methods with
 *   proportional errors", Stat. Med. 9:1463–1473): the same closed form over
 *   weighted sums, the weights 1/ℓ² of each sample's estimated true level
 *   ℓ = (δ·x̂ + ŷ)/(δ + 1), x̂ and ŷ the points on the line nearest the data
 *   in the metric of the errors; iterated from ℓ = (δx + y)/(δ + 1) until the
 *   estimates settle (the steps as we recall them; from memory).
 * - Standard errors by the jackknife (Linnet 1990, 1993): the estimate
 *   without each sample in turn, SE = √((n − 1)/n · Σ(θ₍₋ᵢ₎ − θ̄₍·₎)²);
 *   intervals estimate ± t(n − 2)·SE around the estimate from all samples.
 *
 * As x carries no error (δ → ∞) b tends to the least-squares slope of y on x.
 *
 * @module
 */
import { studentT } from "../../kernel/stats/mod.ts";

/** One Deming line. */
export interface DemingLine {
  intercept: number;
  slope: number;
  /** Iterations of the weighted form (0 for the closed form). */
  iterations: number;
}

/** A Deming regression with its jackknife inference. */
export interface Deming extends DemingLine {
  /** δ = σ²(y)/σ²(x) used (of CVs for the weighted form). */
  ratio: number;
  weighted: boolean;
  /** Jackknife standard errors. */
  seIntercept: number;
  seSlope: number;
  /** Estimate ± t(n − 2)·SE at `level`. */
  interceptCi: [number, number];
  slopeCi: [number, number];
  level: number;
  df: number;
}

/** Why a Deming line cannot be drawn. */
export class DemingError extends Error {}

/** The weighted form stops when both estimates move less than this, relatively. */
const SETTLED = 1e-12;
const MAX_ITERATIONS = 200;

/**
 * Deming's closed form over (optionally weighted) sums.
 *
 * @param x The comparison method's values.
 * @param y The other method's values.
 * @param ratio δ = σ²(y)/σ²(x).
 * @param w Weights, or null for equal weights.
 * @returns Intercept and slope.
 * @throws {DemingError} When x and y do not co-vary (p = 0).
 * @example
 * ```ts
 * import { demingLine } from "./deming.ts";
 * // Points on y = 1 + 2x lie on the line whatever δ is (exact arithmetic).
 * const l = demingLine([0, 1, 2, 3], [1, 3, 5, 7], 4, null);
 * if (Math.abs(l.slope - 2) > 1e-14 || Math.abs(l.intercept - 1) > 1e-14) throw new Error(JSON.stringify(l));
 * ```
 */
export function demingLine(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  ratio: number,
  w: ArrayLike<number> | null,
): DemingLine {
  const n = x.length;
  let sw = 0, sx = 0, sy = 0;
  for (let i = 0; i < n; i++) {
    const wi = w === null ? 1 : w[i];
    sw += wi;
    sx += wi * x[i];
    sy += wi * y[i];
  }
  const xm = sx / sw, ym = sy / sw;
  // Centred sums in a second pass: running sums of squares lose the digits
  // that a method comparison (x ≈ y, slope ≈ 1) lives on.
  let u = 0, q = 0, p = 0;
  for (let i = 0; i < n; i++) {
    const wi = w === null ? 1 : w[i];
    const dx = x[i] - xm, dy = y[i] - ym;
    u += wi * dx * dx;
    q += wi * dy * dy;
    p += wi * dx * dy;
  }
  if (!(p !== 0) || !Number.isFinite(p)) {
    throw new DemingError("the two methods' readings do not vary together");
  }
  const e = q - ratio * u;
  const root = Math.sqrt(e * e + 4 * ratio * p * p);
  // b = (e + root)/(2p); when e < 0 the sum cancels, so use the conjugate
  // form 2δp/(root − e), equal in exact arithmetic.
  const slope = e >= 0 ? (e + root) / (2 * p) : (2 * ratio * p) / (root - e);
  return { intercept: ym - slope * xm, slope, iterations: 0 };
}

/**
 * The weighted Deming line for proportional errors (Linnet 1990).
 *
 * @param x The comparison method's values (positive levels).
 * @param y The other method's values.
 * @param ratio δ = CV²(y)/CV²(x).
 * @returns The line and the iterations taken.
 * @throws {DemingError} When a level is not positive or the iteration does not settle.
 */
export function weightedDemingLine(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  ratio: number,
): DemingLine {
  const n = x.length;
  const w = new Float64Array(n);
  const setWeights = (xh: (i: number) => number, yh: (i: number) => number) => {
    for (let i = 0; i < n; i++) {
      const level = (ratio * xh(i) + yh(i)) / (ratio + 1);
      if (!(level > 0)) {
        throw new DemingError(
          "a sample's estimated level is not positive, so proportional errors cannot weight it",
        );
      }
      w[i] = 1 / (level * level);
    }
  };
  setWeights((i) => x[i], (i) => y[i]);
  let line = demingLine(x, y, ratio, w);
  let moved = Infinity;
  for (let it = 1; it <= MAX_ITERATIONS; it++) {
    const { intercept: a, slope: b } = line;
    // The point of the line nearest (x, y) when y's error variance is δ times x's:
    // x̂ = x + b·d/(δ + b²), ŷ = y − δ·d/(δ + b²), d = y − a − b·x.
    const k = 1 / (ratio + b * b);
    setWeights(
      (i) => x[i] + b * (y[i] - a - b * x[i]) * k,
      (i) => y[i] - ratio * (y[i] - a - b * x[i]) * k,
    );
    const next = demingLine(x, y, ratio, w);
    // The intercept's change is measured against the scale of the data (ȳ-sized
    // terms), since the intercept itself may be near zero.
    moved = Math.abs(next.slope - b) / Math.abs(b) +
      Math.abs(next.intercept - a) / (Math.abs(a) + Math.abs(b) * meanAbs(x));
    line = { ...next, iterations: it };
    if (moved < SETTLED) return line;
  }
  // The last digits can cycle in the weights' rounding: a step below 1e-9 still counts.
  if (moved < 1e-9) return line;
  throw new DemingError(`the weighted Deming iteration did not settle in ${MAX_ITERATIONS} steps`);
}

function meanAbs(x: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < x.length; i++) s += Math.abs(x[i]);
  return s / x.length;
}

/**
 * Deming regression with jackknife standard errors and t intervals.
 *
 * @param x The comparison method's values, one per sample.
 * @param y The other method's values.
 * @param ratio δ = σ²(y)/σ²(x) (CV² ratio when `weighted`).
 * @param weighted True for proportional errors (Linnet 1990).
 * @param level Confidence level of the intervals.
 * @returns The line, its jackknife SEs and intervals.
 * @throws {DemingError} When the line (or a leave-one-out line) cannot be drawn.
 */
export function deming(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  ratio: number,
  weighted: boolean,
  level: number,
): Deming {
  const n = x.length;
  const fit = (xs: ArrayLike<number>, ys: ArrayLike<number>) =>
    weighted ? weightedDemingLine(xs, ys, ratio) : demingLine(xs, ys, ratio, null);
  const all = fit(x, y);
  const xs = new Float64Array(n - 1), ys = new Float64Array(n - 1);
  const a = new Float64Array(n), b = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    for (let j = 0, k = 0; j < n; j++) {
      if (j === i) continue;
      xs[k] = x[j];
      ys[k++] = y[j];
    }
    const l = fit(xs, ys);
    a[i] = l.intercept;
    b[i] = l.slope;
  }
  const seIntercept = jackknifeSe(a), seSlope = jackknifeSe(b);
  const df = n - 2;
  const t = studentT(df).quantile((1 + level) / 2);
  return {
    ...all,
    ratio,
    weighted,
    seIntercept,
    seSlope,
    interceptCi: [all.intercept - t * seIntercept, all.intercept + t * seIntercept],
    slopeCi: [all.slope - t * seSlope, all.slope + t * seSlope],
    level,
    df,
  };
}

/**
 * The jackknife standard error of leave-one-out estimates.
 *
 * @param loo θ₍₋ᵢ₎ for each i.
 * @returns √((n − 1)/n · Σ(θ₍₋ᵢ₎ − θ̄₍·₎)²).
 */
export function jackknifeSe(loo: ArrayLike<number>): number {
  const n = loo.length;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += loo[i];
  mean /= n;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (loo[i] - mean) ** 2;
  return Math.sqrt((n - 1) / n * ss);
}
