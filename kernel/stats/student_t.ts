/**
 * Student's t distribution with ν degrees of freedom.
 *
 * Method: P(T > t) = ½·I_x(ν/2, ½) with x = ν/(ν + t²) for t > 0 (A&S
 * 26.7.1 with 26.5.27), computed directly from the incomplete beta function
 * with y = 1 − x = t²/(ν + t²) passed exactly, so tails stay relative-accurate
 * down to the underflow threshold. The density is the incomplete beta's
 * factor xᵃyᵇ/B(a, b) divided by |t| (the same algebra), so it shares its
 * accuracy for large ν. Quantiles invert the tail (see `_invert.ts`).
 *
 * @module
 */
import { logBetaFront, regularizedBeta } from "./incomplete_beta.ts";
import { checkDf, checkProbability, type Distribution } from "./distribution.ts";
import { invertTail } from "./_invert.ts";
import { lnGamma } from "./log_gamma.ts";
import { standardNormal } from "./normal.ts";

/** x = ν/(ν + t²) and y = t²/(ν + t²), without overflow for huge t. */
function split(t: number, nu: number): [number, number] {
  const t2 = t * t;
  if (!Number.isFinite(t2)) return [nu / t / t, 1];
  return [nu / (nu + t2), t2 / (nu + t2)];
}

/**
 * P(T > t) when x = ν/(ν + t²) is below 1e-290 (it could underflow): then
 * I_x(a, ½) = xᵃ/(a·B(a, ½))·(1 + O(x)) (A&S 26.5.4, first term), with
 * ln x = ln ν − 2 ln t formed without x itself.
 */
function farTail(t: number, nu: number): number {
  const a = nu / 2;
  const lnB = lnGamma(a) + lnGamma(0.5) - lnGamma(a + 0.5);
  return 0.5 * Math.exp(a * (Math.log(nu) - 2 * Math.log(t)) - lnB - Math.log(a));
}

/**
 * Student's t distribution.
 *
 * @param nu Degrees of freedom, positive (need not be whole).
 * @returns The distribution.
 * @throws {RangeError} For ν ≤ 0 or not finite.
 * @example
 * ```ts
 * import { studentT } from "./student_t.ts";
 * // t₀.₉₇₅ with 10 df = 2.228 (NIST/SEMATECH e-Handbook §1.3.6.7.2).
 * if (Math.abs(studentT(10).quantile(0.975) - 2.228) > 5e-4) throw new Error();
 * ```
 */
export function studentT(nu: number): Distribution {
  checkDf(nu, "t distribution");
  const upper = (t: number): number => {
    if (Number.isNaN(t)) return NaN;
    if (t === 0) return 0.5;
    if (t < 0) return 1 - upper(-t);
    if (t === Infinity) return 0;
    const [x, y] = split(t, nu);
    if (x < 1e-290) return farTail(t, nu);
    const b = regularizedBeta(x, nu / 2, 0.5, y);
    return b.lower <= 0.5 ? 0.5 * b.lower : 0.5 * (1 - b.upper);
  };
  const density = (t: number): number => {
    if (!Number.isFinite(t)) return 0;
    // At |t| ≤ 1e-150 the density equals its value at 0 to the last bit.
    const a = Math.max(Math.abs(t), 1e-150);
    const [x, y] = split(a, nu);
    return Math.exp(logBetaFront(x, y, nu / 2, 0.5)) / a;
  };
  const upperQuantile = (q: number): number => {
    checkProbability(q, "Upper-tail probability");
    if (q === 0) return Infinity;
    if (q === 1) return -Infinity;
    if (q === 0.5) return 0;
    if (q > 0.5) return -upperQuantile(1 - q);
    const guess = Math.max(standardNormal.upperQuantile(q), 1e-3);
    return invertTail({ tail: upper, slope: (t) => -density(t), positive: true, guess }, q);
  };
  return {
    cdf: (t) => upper(-t),
    upper,
    density,
    quantile: (p) => {
      checkProbability(p, "Probability");
      return p <= 0.5 ? -upperQuantile(p) : upperQuantile(1 - p);
    },
    upperQuantile,
  };
}
