/**
 * The F distribution with d₁ and d₂ degrees of freedom.
 *
 * Method: P(F > f) = I_x(d₂/2, d₁/2) with x = d₂/(d₂ + d₁f) and
 * P(F ≤ f) = I_y(d₁/2, d₂/2) with y = d₁f/(d₂ + d₁f) (A&S 26.6.2 with
 * 26.5.27); both x and y are formed directly, so either tail is
 * relative-accurate when small. The density is the incomplete beta's factor
 * y^(d₁/2)·x^(d₂/2)/B divided by f. Quantiles invert the smaller tail in
 * ln f (see `_invert.ts`).
 *
 * @module
 */
import { logBetaFront, regularizedBeta } from "./incomplete_beta.ts";
import { checkDf, type Distribution } from "./distribution.ts";
import { positiveDistribution } from "./_invert.ts";

/**
 * The F distribution.
 *
 * @param d1 Numerator degrees of freedom, positive.
 * @param d2 Denominator degrees of freedom, positive.
 * @returns The distribution.
 * @throws {RangeError} For degrees of freedom ≤ 0 or not finite.
 * @example
 * ```ts
 * import { fisherF } from "./fisher_f.ts";
 * // F₀.₉₅(1, 10) = 4.96 (NIST/SEMATECH e-Handbook §1.3.6.7.3).
 * if (Math.abs(fisherF(1, 10).quantile(0.95) - 4.96) > 5e-3) throw new Error();
 * ```
 */
export function fisherF(d1: number, d2: number): Distribution {
  checkDf(d1, "F distribution (numerator)");
  checkDf(d2, "F distribution (denominator)");
  /** [x, y]: x = d₂/(d₂ + d₁f), y = 1 − x. */
  const split = (f: number): [number, number] => {
    const df = d1 * f;
    if (!Number.isFinite(df + d2)) return [d2 / d1 / f, 1];
    return [d2 / (d2 + df), df / (d2 + df)];
  };
  const tails = (f: number) => {
    const [x, y] = split(f);
    return regularizedBeta(x, d2 / 2, d1 / 2, y);
  };
  const upper = (f: number): number => {
    if (Number.isNaN(f)) return NaN;
    if (f <= 0) return 1;
    if (f === Infinity) return 0;
    return tails(f).lower;
  };
  const cdf = (f: number): number => {
    if (Number.isNaN(f)) return NaN;
    if (f <= 0) return 0;
    if (f === Infinity) return 1;
    return tails(f).upper;
  };
  const density = (f: number): number => {
    if (f < 0 || f === Infinity) return 0;
    if (f === 0) return d1 < 2 ? Infinity : d1 === 2 ? 1 : 0;
    const [x, y] = split(f);
    return Math.exp(logBetaFront(y, x, d1 / 2, d2 / 2)) / f;
  };
  return positiveDistribution({ cdf, upper, density, guess: () => 1 });
}
