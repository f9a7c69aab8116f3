/**
 * Helpers shared by the incomplete gamma and beta functions: the remainder of
 * Stirling's series and ln(1 + t) − t without cancellation.
 *
 * Methods:
 * - δ(z) = ln Γ(z) − [½ln 2π + (z − ½)ln z − z], the Stirling series
 *   Σ B₂ₖ / (2k(2k − 1) z²ᵏ⁻¹) (Abramowitz & Stegun 6.1.40) for z ≥ 8, and
 *   through ln Γ otherwise.
 * - ln(1 + t) − t by its Maclaurin series −t²/2 + t³/3 − … for |t| < ½ (the
 *   subtraction would cancel there), `Math.log1p(t) − t` elsewhere.
 *
 * @module
 */
import { lnGamma } from "./log_gamma.ts";

const HALF_LN_2PI = 0.9189385332046728;

/** Coefficients B₂ₖ/(2k(2k − 1)), k = 1…7 (A&S Table 23.2 Bernoulli numbers). */
const STIRLING = [
  1 / 12,
  -1 / 360,
  1 / 1260,
  -1 / 1680,
  1 / 1188,
  -691 / 360360,
  1 / 156,
];

/** δ(z) = ln Γ(z) − (½ln 2π + (z − ½)ln z − z), for z > 0. */
export function stirlingError(z: number): number {
  if (z < 8) return lnGamma(z) - (HALF_LN_2PI + (z - 0.5) * Math.log(z) - z);
  const w = 1 / (z * z);
  let s = 0;
  for (let k = STIRLING.length - 1; k >= 0; k--) s = s * w + STIRLING[k];
  return s / z;
}

/** ln(1 + t) − t for t > −1, accurate to a few ulps also for small |t|. */
export function log1pmx(t: number): number {
  if (Math.abs(t) >= 0.5) return Math.log1p(t) - t;
  // −Σ_{k≥2} (−t)^k / k; |t| < ½ so 60 terms reach 2⁻⁶⁰.
  let term = t * t, sum = 0;
  for (let k = 2; k < 80; k++) {
    const add = term / k;
    sum += k % 2 === 0 ? -add : add;
    if (Math.abs(add) <= 1e-17 * Math.abs(sum)) break;
    term *= t;
  }
  return sum;
}

/** ½ ln 2π. */
export { HALF_LN_2PI };
