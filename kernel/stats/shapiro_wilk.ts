/**
 * Shapiro–Wilk W test of normality.
 *
 * Method: Royston (1995), "Remark AS R94: A remark on algorithm AS 181: the
 * W-test for normality", Applied Statistics 44:547–551, transcribed for a
 * complete (uncensored) sample, with the step names of the published
 * routine SWILK; W itself is Shapiro & Wilk (1965), "An analysis of variance
 * test for normality (complete samples)", Biometrika 52:591–611.
 *
 * - Coefficients: mᵢ = Φ⁻¹((i − 3/8)/(n + 1/4)); the two outermost aᵢ by
 *   Royston's polynomials in 1/√n (c1, c2), the rest −mᵢ/φ normalised.
 * - W as the squared correlation of the sorted data with the coefficients,
 *   computed as 1 − W₁ to keep digits when W is near 1 (AS R94's "w1").
 * - p-value: n = 3 exact (6/π·(asin √W − π/3)); 4 ≤ n ≤ 11 from
 *   −ln(γ − ln(1 − W)), γ = −2.273 + 0.459n, normal with mean and log-sd
 *   polynomial in n (c3, c4); n ≥ 12 from ln(1 − W) normal with mean and
 *   log-sd polynomial in ln n (c5, c6). Valid for 3 ≤ n ≤ 5000.
 *
 * @module
 */
import { standardNormal } from "./normal.ts";

/** W and its p-value. */
export interface ShapiroWilk {
  w: number;
  p_value: number;
}

// Royston's (1995) polynomial coefficients, as printed in AS R94.
const G = [-2.273, 0.459];
const C1 = [0, 0.221157, -0.147981, -2.07119, 4.434685, -2.706056];
const C2 = [0, 0.042981, -0.293762, -1.752461, 5.682633, -3.582633];
const C3 = [0.544, -0.39978, 0.025054, -6.714e-4];
const C4 = [1.3822, -0.77857, 0.062767, -0.0020322];
const C5 = [-1.5861, -0.31082, -0.083751, 0.0038915];
const C6 = [-0.4803, -0.082676, 0.0030302];
const SMALL = 1e-19;

/** AS R94's POLY: c₀ + c₁x + … (Horner). */
function poly(c: readonly number[], x: number): number {
  let r = 0;
  for (let j = c.length - 1; j >= 0; j--) r = r * x + c[j];
  return r;
}

/** The coefficients a₁..a_{n/2} of the upper half (positive), AS R94 step 1. */
function coefficients(n: number): Float64Array {
  const nn2 = Math.floor(n / 2);
  const a = new Float64Array(nn2);
  if (n === 3) {
    a[0] = Math.SQRT1_2;
    return a;
  }
  const m = new Float64Array(nn2);
  let summ2 = 0;
  for (let i = 0; i < nn2; i++) {
    m[i] = standardNormal.quantile((i + 1 - 0.375) / (n + 0.25));
    summ2 += m[i] * m[i];
  }
  summ2 *= 2;
  const ssumm2 = Math.sqrt(summ2), rsn = 1 / Math.sqrt(n);
  const a1 = poly(C1, rsn) - m[0] / ssumm2;
  let i1: number, fac: number;
  if (n > 5) {
    i1 = 2;
    const a2 = -m[1] / ssumm2 + poly(C2, rsn);
    fac = Math.sqrt(
      (summ2 - 2 * m[0] * m[0] - 2 * m[1] * m[1]) / (1 - 2 * a1 * a1 - 2 * a2 * a2),
    );
    a[1] = a2;
  } else {
    i1 = 1;
    fac = Math.sqrt((summ2 - 2 * m[0] * m[0]) / (1 - 2 * a1 * a1));
  }
  a[0] = a1;
  for (let i = i1; i < nn2; i++) a[i] = -m[i] / fac;
  return a;
}

/** 1 − W for sorted x, AS R94 step 2 (the correlation form). */
function oneMinusW(x: Float64Array, a: Float64Array): number {
  const n = x.length;
  const range = x[n - 1] - x[0];
  // Signed coefficient of sorted position i: −a for the lower half, +a for the upper, 0 at the middle.
  const coef = (i: number) => {
    const j = n - 1 - i;
    return i === j ? 0 : Math.sign(i - j) * a[Math.min(i, j)];
  };
  let sa = 0, sx = 0;
  for (let i = 0; i < n; i++) {
    sa += coef(i);
    sx += x[i] / range;
  }
  sa /= n;
  sx /= n;
  let ssa = 0, ssx = 0, sax = 0;
  for (let i = 0; i < n; i++) {
    const asa = coef(i) - sa, xsx = x[i] / range - sx;
    ssa += asa * asa;
    ssx += xsx * xsx;
    sax += asa * xsx;
  }
  const ssassx = Math.sqrt(ssa * ssx);
  return (ssassx - sax) * (ssassx + sax) / (ssa * ssx);
}

/** The p-value for W = 1 − w1, AS R94 step 3. */
function significance(n: number, w1: number): number {
  const w = 1 - w1;
  if (n === 3) {
    const pi6 = 6 / Math.PI, stqr = Math.PI / 3;
    return Math.min(1, Math.max(0, pi6 * (Math.asin(Math.sqrt(w)) - stqr)));
  }
  let y = Math.log(w1);
  let mean: number, sd: number;
  if (n <= 11) {
    const gamma = poly(G, n);
    if (y >= gamma) return 1e-99; // AS R94 returns this tiny value beyond the approximation's range
    y = -Math.log(gamma - y);
    mean = poly(C3, n);
    sd = Math.exp(poly(C4, n));
  } else {
    const xx = Math.log(n);
    mean = poly(C5, xx);
    sd = Math.exp(poly(C6, xx));
  }
  return standardNormal.upper((y - mean) / sd);
}

/**
 * Shapiro–Wilk test of a complete sample.
 *
 * @param sample The values (any order; NaN not allowed), 3 ≤ n ≤ 5000.
 * @returns W and the p-value.
 * @throws {RangeError} When n is outside 3..5000, a value is not finite, or all values are equal.
 * @example
 * ```ts
 * import { shapiroWilk } from "./shapiro_wilk.ts";
 * // n = 3 equally spaced: W = 1 and the exact p-value 6/π·(π/2 − π/3) = 1 (hand computation).
 * const t = shapiroWilk([1, 2, 3]);
 * if (Math.abs(t.w - 1) > 1e-15 || Math.abs(t.p_value - 1) > 1e-12) throw new Error(JSON.stringify(t));
 * ```
 */
export function shapiroWilk(sample: ArrayLike<number>): ShapiroWilk {
  const n = sample.length;
  if (n < 3 || n > 5000) {
    throw new RangeError(`Cannot run Shapiro–Wilk on "${n}" values: it needs 3 to 5000`);
  }
  const x = Float64Array.from(sample);
  const bad = x.findIndex((v) => !Number.isFinite(v));
  if (bad >= 0) {
    throw new RangeError(
      `Cannot run Shapiro–Wilk: value ${bad + 1} is "${x[bad]}", not a finite number`,
    );
  }
  x.sort();
  if (x[n - 1] - x[0] < SMALL * Math.max(1, Math.abs(x[0]))) {
    throw new RangeError("Cannot run Shapiro–Wilk: all values are equal");
  }
  const w1 = oneMinusW(x, coefficients(n));
  return { w: 1 - w1, p_value: significance(n, w1) };
}
