/**
 * The χ² distribution with k degrees of freedom.
 *
 * Method: P(X ≤ x) = P(k/2, x/2) and P(X > x) = Q(k/2, x/2), the regularized
 * incomplete gamma functions (A&S 26.4.19), each computed directly when it is
 * the smaller (see `incomplete_gamma.ts`). The density is the common factor
 * (x/2)^(k/2)·e^(−x/2)/Γ(k/2) divided by x. Quantiles invert the smaller tail
 * in ln x, starting from the Wilson–Hilferty approximation (A&S 26.4.17).
 *
 * @module
 */
import { logGammaFront, regularizedGamma } from "./incomplete_gamma.ts";
import { checkDf, type Distribution } from "./distribution.ts";
import { positiveDistribution } from "./_invert.ts";
import { standardNormal } from "./normal.ts";

/**
 * The χ² distribution.
 *
 * @param k Degrees of freedom, positive.
 * @returns The distribution.
 * @throws {RangeError} For k ≤ 0 or not finite.
 * @example
 * ```ts
 * import { chiSquared } from "./chi_squared.ts";
 * // χ²₀.₉₅ with 1 df = 3.841 (NIST/SEMATECH e-Handbook §1.3.6.7.4).
 * if (Math.abs(chiSquared(1).quantile(0.95) - 3.841) > 5e-4) throw new Error();
 * ```
 */
export function chiSquared(k: number): Distribution {
  checkDf(k, "χ² distribution");
  const a = k / 2;
  const upper = (x: number): number => {
    if (Number.isNaN(x)) return NaN;
    return x <= 0 ? 1 : regularizedGamma(a, x / 2).upper;
  };
  const cdf = (x: number): number => {
    if (Number.isNaN(x)) return NaN;
    return x <= 0 ? 0 : regularizedGamma(a, x / 2).lower;
  };
  const density = (x: number): number => {
    if (x < 0 || x === Infinity) return 0;
    if (x === 0) return k < 2 ? Infinity : k === 2 ? 0.5 : 0;
    return Math.exp(logGammaFront(a, x / 2)) / x;
  };
  /** Wilson–Hilferty: x ≈ k(1 − 2/(9k) + z√(2/(9k)))³ for the upper tail q. */
  const guess = (q: number) => {
    const z = standardNormal.upperQuantile(q), c = 2 / (9 * k);
    const x = k * Math.pow(1 - c + z * Math.sqrt(c), 3);
    return x > 0 ? x : Math.max(k * 1e-3, 1e-300);
  };
  return positiveDistribution({ cdf, upper, density, guess: guess });
}
