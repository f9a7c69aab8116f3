/**
 * The standard normal distribution.
 *
 * Method: the upper tail is Q(z) = ½·Q(½, z²/2), the regularized upper
 * incomplete gamma function (A&S 26.2.30 with 6.5.17: erfc x = Q(½, x²)),
 * computed directly by its continued fraction for large z, so it stays
 * relative-accurate down to Q(37.5) ≈ 5e-309 rather than rounding to 0 as
 * ½·(1 + erf) does. Quantiles invert the tail (see `_invert.ts`), starting
 * from the rational approximation of A&S 26.2.23.
 *
 * @module
 */
import { regularizedGamma } from "./incomplete_gamma.ts";
import { checkProbability, type Distribution } from "./distribution.ts";
import { invertTail } from "./_invert.ts";

const INV_SQRT_2PI = 0.3989422804014327;

function upper(z: number): number {
  if (Number.isNaN(z)) return NaN;
  if (z < 0) return 1 - upper(-z);
  const { upper: q, lower } = regularizedGamma(0.5, 0.5 * z * z);
  return z === 0 ? 0.5 : q <= 0.5 ? 0.5 * q : 0.5 * (1 - lower);
}

function density(z: number): number {
  return INV_SQRT_2PI * Math.exp(-0.5 * z * z);
}

/** A&S 26.2.23: x with Q(x) ≈ q for 0 < q ≤ ½, |error| < 4.5e-4. */
function roughUpperQuantile(q: number): number {
  const t = Math.sqrt(-2 * Math.log(q));
  return t - (2.515517 + 0.802853 * t + 0.010328 * t * t) /
      (1 + 1.432788 * t + 0.189269 * t * t + 0.001308 * t * t * t);
}

function upperQuantile(q: number): number {
  checkProbability(q, "Upper-tail probability");
  if (q === 0) return Infinity;
  if (q === 1) return -Infinity;
  if (q === 0.5) return 0;
  if (q > 0.5) return -upperQuantile(1 - q);
  return invertTail({
    tail: upper,
    slope: (x) => -density(x),
    positive: true,
    guess: roughUpperQuantile(q),
  }, q);
}

/**
 * The standard normal distribution N(0, 1).
 *
 * @example
 * ```ts
 * import { standardNormal } from "./normal.ts";
 * // z₀.₉₇₅ = 1.959964 (NIST/SEMATECH e-Handbook §1.3.6.7.1, from memory).
 * if (Math.abs(standardNormal.quantile(0.975) - 1.959964) > 1e-6) throw new Error();
 * ```
 */
export const standardNormal: Distribution = {
  cdf: (z) => upper(-z),
  upper,
  density,
  quantile: (p) => {
    checkProbability(p, "Probability");
    return p <= 0.5 ? -upperQuantile(p) : upperQuantile(1 - p);
  },
  upperQuantile,
};
