/**
 * Passing–Bablok regression: a line through two methods' readings that is
 * unchanged when the methods swap axes, from the slopes of every pair of
 * samples, with rank-based confidence limits and the cusum test of
 * linearity.
 *
 * Source: Passing & Bablok 1983, "A new biometrical procedure for testing
 * the equality of measurements from two different analytical methods",
 * J. Clin. Chem. Clin. Biochem. 21:709–720, transcribed step by step:
 *
 * 1. `pairSlopes`: Sᵢⱼ = (yⱼ − yᵢ)/(xⱼ − xᵢ) for i < j; a pair equal in both
 *    is left out, so is a slope of exactly −1; xⱼ = xᵢ gives ±∞ by the sign
 *    of yⱼ − yᵢ. K counts the slopes below −1.
 * 2. `shiftedMedian`: b is the median of the N sorted slopes shifted by K:
 *    S₍₍N+1)/2+K₎ for odd N, ½(S₍N/2+K₎ + S₍N/2+1+K₎) for even N (1-based).
 * 3. Limits of b: C = z₁₋α/₂·√(n(n − 1)(2n + 5)/18), M₁ = round((N − C)/2),
 *    M₂ = N − M₁ + 1; b_L = S₍M₁+K₎, b_U = S₍M₂+K₎ (open when out of range).
 * 4. a = med(yᵢ − b·xᵢ); a_L = med(yᵢ − b_U·xᵢ), a_U = med(yᵢ − b_L·xᵢ).
 * 5. `cusumTest`: l points above the line, L below; score √(L/l) above,
 *    −√(l/L) below, 0 on it; cumulative sums in the order of
 *    Dᵢ = (yᵢ + xᵢ/b − a)/√(1 + 1/b²); linearity is rejected when
 *    max |cusum| exceeds h·√(l + L), h the Kolmogorov–Smirnov quantile
 *    (1.36 at 5 %). The paper's printed "√(L+1)" reads as √(L + l): the
 *    scores are a bridge of l + L unit-variance steps, so that is its scale
 *    (our reading; the section numbering of the paper is from memory).
 *
 * Memory: N ≤ n(n − 1)/2 doubles; `MAX_SAMPLES` keeps it under 40 MB.
 *
 * @module
 */
import { standardNormal } from "../../kernel/stats/mod.ts";

/** The most samples the all-pairs slopes are taken for (4.5 million slopes). */
export const MAX_SAMPLES = 3000;

/** The sorted slopes of every pair, and K (those below −1). */
export interface PairSlopes {
  slopes: Float64Array;
  below: number;
}

/** Passing–Bablok's line with its limits; a limit is null where the ranks leave the slopes. */
export interface PassingBablok {
  intercept: number;
  slope: number;
  interceptCi: [number | null, number | null];
  slopeCi: [number | null, number | null];
  level: number;
  /** N, the slopes used, and K. */
  slopes: number;
  below: number;
  /** The ranks M₁ and M₂ of the slope's limits (1-based, before the shift by K). */
  ranks: [number, number];
  cusum: Cusum | null;
}

/** The cusum test of linearity. */
export interface Cusum {
  /** max |cusum|. */
  statistic: number;
  above: number;
  belowLine: number;
  /** h·√(l + L) at the level. */
  critical: number;
  /** Kolmogorov's asymptotic p-value of max |cusum|/√(l + L). */
  pValue: number;
  linear: boolean;
  /** The cumulative sums in order of D (for a chart). */
  path: number[];
}

/** Why Passing–Bablok's line cannot be drawn. */
export class PassingBablokError extends Error {}

/**
 * Step 1: the slopes of every pair, sorted, and K.
 *
 * @param x The comparison method's values.
 * @param y The other method's values.
 * @returns The sorted slopes and K.
 * @example
 * ```ts
 * import { pairSlopes } from "./passing_bablok.ts";
 * // (0,0), (1,2), (2,1): slopes 2, 0.5, −1 (left out) — exact arithmetic.
 * const s = pairSlopes([0, 1, 2], [0, 2, 1]);
 * if (s.slopes.join() !== "0.5,2" || s.below !== 0) throw new Error(s.slopes.join());
 * ```
 */
export function pairSlopes(x: ArrayLike<number>, y: ArrayLike<number>): PairSlopes {
  const n = x.length;
  const out = new Float64Array((n * (n - 1)) / 2);
  let m = 0, below = 0;
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const dx = x[j] - x[i], dy = y[j] - y[i];
      let s: number;
      if (dx === 0) {
        if (dy === 0) continue;
        s = dy > 0 ? Infinity : -Infinity;
      } else {
        s = dy / dx;
        if (s === -1) continue;
      }
      if (s < -1) below++;
      out[m++] = s;
    }
  }
  return { slopes: out.subarray(0, m).sort(), below };
}

/**
 * Step 2: the median of the sorted slopes shifted by K.
 *
 * @param s The sorted slopes and K.
 * @returns b.
 * @throws {PassingBablokError} When the shift leaves the slopes (the methods fall together).
 */
export function shiftedMedian(s: PairSlopes): number {
  const N = s.slopes.length, K = s.below;
  const at = (k: number) => s.slopes[k - 1]; // 1-based, as the paper writes it
  const last = N % 2 === 1 ? (N + 1) / 2 + K : N / 2 + 1 + K;
  if (N === 0 || last > N) {
    throw new PassingBablokError(
      "most pairs of samples fall from one method to the other, so the methods do not measure the same quantity on one rising line",
    );
  }
  return N % 2 === 1 ? at((N + 1) / 2 + K) : 0.5 * (at(N / 2 + K) + at(N / 2 + 1 + K));
}

/**
 * Passing–Bablok regression with its limits at `level` and the cusum test.
 *
 * @param x The comparison method's values, one per sample.
 * @param y The other method's values.
 * @param level Confidence level of the limits and the test.
 * @returns The line, limits and test.
 * @throws {PassingBablokError} When the slopes do not determine a rising line.
 */
export function passingBablok(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  level: number,
): PassingBablok {
  const n = x.length;
  const s = pairSlopes(x, y);
  const b = shiftedMedian(s);
  if (!Number.isFinite(b) || !(b > 0)) {
    throw new PassingBablokError(
      `the median pairwise slope is ${b}: Passing–Bablok regression needs the two methods to rise together`,
    );
  }
  const N = s.slopes.length, K = s.below;
  const C = standardNormal.quantile((1 + level) / 2) * Math.sqrt((n * (n - 1) * (2 * n + 5)) / 18);
  const M1 = Math.round((N - C) / 2), M2 = N - M1 + 1;
  const rank = (k: number) => (k >= 1 && k <= N ? s.slopes[k - 1] : null);
  const finite = (v: number | null) => (v !== null && Number.isFinite(v) ? v : null);
  const bL = M1 >= 1 ? finite(rank(M1 + K)) : null;
  const bU = M2 <= N ? finite(rank(M2 + K)) : null;
  const a = medianOf(x, y, b);
  return {
    intercept: a,
    slope: b,
    interceptCi: [bU === null ? null : medianOf(x, y, bU), bL === null ? null : medianOf(x, y, bL)],
    slopeCi: [bL, bU],
    level,
    slopes: N,
    below: K,
    ranks: [M1, M2],
    cusum: cusumTest(x, y, a, b, level),
  };
}

/** Step 4: med(yᵢ − b·xᵢ). */
function medianOf(x: ArrayLike<number>, y: ArrayLike<number>, b: number): number {
  const r = Float64Array.from({ length: x.length }, (_, i) => y[i] - b * x[i]).sort();
  const n = r.length, h = n >> 1;
  return n % 2 === 1 ? r[h] : 0.5 * (r[h - 1] + r[h]);
}

/**
 * Step 5: the cusum test of linearity.
 *
 * @param x The comparison method's values.
 * @param y The other method's values.
 * @param a The line's intercept.
 * @param b The line's slope (positive).
 * @param level The test's level is 1 − `level`.
 * @returns The test, or null when every point lies on one side of the line or on it.
 */
export function cusumTest(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  a: number,
  b: number,
  level: number,
): Cusum | null {
  const n = x.length;
  let l = 0, L = 0;
  const side = new Int8Array(n);
  for (let i = 0; i < n; i++) {
    const r = y[i] - (a + b * x[i]);
    side[i] = r > 0 ? 1 : r < 0 ? -1 : 0;
    if (r > 0) l++;
    else if (r < 0) L++;
  }
  if (l === 0 || L === 0) return null;
  const norm = Math.sqrt(1 + 1 / (b * b));
  const D = Float64Array.from({ length: n }, (_, i) => (y[i] + x[i] / b - a) / norm);
  const order = Array.from({ length: n }, (_, i) => i).sort((i, j) => D[i] - D[j] || i - j);
  const up = Math.sqrt(L / l), down = -Math.sqrt(l / L);
  let sum = 0, max = 0;
  const path: number[] = [];
  for (const i of order) {
    sum += side[i] > 0 ? up : side[i] < 0 ? down : 0;
    path.push(sum);
    max = Math.max(max, Math.abs(sum));
  }
  const scale = Math.sqrt(l + L);
  const critical = kolmogorovQuantile(1 - level) * scale;
  return {
    statistic: max,
    above: l,
    belowLine: L,
    critical,
    pValue: kolmogorovUpper(max / scale),
    linear: max <= critical,
    path,
  };
}

/**
 * Kolmogorov's limiting law of √n·Dₙ: P(K > h) = 2 Σₖ (−1)ᵏ⁻¹ e^(−2k²h²)
 * (Kolmogorov 1933; the series as every textbook states it).
 *
 * @param h The scaled statistic.
 * @returns The upper tail.
 * @example
 * ```ts
 * import { kolmogorovUpper } from "./passing_bablok.ts";
 * // The 5 % point is 1.3581 (common tables; from memory).
 * if (Math.abs(kolmogorovUpper(1.3581) - 0.05) > 1e-4) throw new Error(String(kolmogorovUpper(1.3581)));
 * ```
 */
export function kolmogorovUpper(h: number): number {
  if (h <= 0) return 1;
  if (h < 0.2) return 1; // the series converges slowly here; the tail is 1 to 16 digits
  let sum = 0;
  for (let k = 1; k <= 100; k++) {
    const term = Math.exp(-2 * k * k * h * h);
    sum += (k % 2 === 1 ? 1 : -1) * term;
    if (term < 1e-17) break;
  }
  return Math.min(1, Math.max(0, 2 * sum));
}

/** The h with P(K > h) = α, by bisection (the tail falls monotonically). */
export function kolmogorovQuantile(alpha: number): number {
  let lo = 0.2, hi = 10;
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (kolmogorovUpper(mid) > alpha) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}
