/**
 * The regularized incomplete gamma functions P(a, x) = γ(a, x)/Γ(a) and
 * Q(a, x) = Γ(a, x)/Γ(a) = 1 − P(a, x), each relative-accurate also when it
 * is tiny: the smaller of the two is always computed directly, never as
 * 1 − the other.
 *
 * Method (Press, Teukolsky, Vetterling & Flannery, *Numerical Recipes*, 3rd
 * ed., §6.2, routines `gser` and `gcf`):
 * - x < a + 1: the series γ(a, x) = e⁻ˣ xᵃ Σₙ xⁿ / (a(a + 1)…(a + n)), which
 *   gives P directly;
 * - x ≥ a + 1: the continued fraction for Γ(a, x), evaluated by the modified
 *   Lentz method (Lentz 1976; Thompson & Barnett 1986), which gives Q directly.
 *
 * Deviation: the common factor xᵃe⁻ˣ/Γ(a) is computed as
 * √(a/2π)·exp(a·(ln(1 + t) − t) − δ(a)) with t = (x − a)/a and δ the
 * Stirling remainder, so no large logarithms cancel for large a (the idea of
 * Temme's uniform expansion, Temme 1979, "The asymptotic expansion of the
 * incomplete gamma functions", SIAM J. Math. Anal. 10, without its series).
 *
 * @module
 */
import { lnGamma } from "./log_gamma.ts";
import { HALF_LN_2PI, log1pmx, stirlingError } from "./_stirling.ts";

// Just above 2⁻⁵²: a ratio within one ulp of 1 counts as converged (1e-16 would never be met).
const EPS = 3e-16;
const TINY = 1e-300;
const MAX_ITER = 100000;

/** Both regularized incomplete gamma functions. */
export interface GammaTails {
  /** P(a, x), the lower tail. */
  lower: number;
  /** Q(a, x), the upper tail. */
  upper: number;
}

/**
 * P(a, x) and Q(a, x) for a > 0, x ≥ 0.
 *
 * @param a Shape, positive.
 * @param x Argument, non-negative (Infinity allowed).
 * @returns Both tails; the smaller is relative-accurate down to the
 *   underflow threshold (about 1e-308).
 * @throws {RangeError} For a ≤ 0, x < 0 or NaN.
 * @example
 * ```ts
 * import { regularizedGamma } from "./incomplete_gamma.ts";
 * // Q(1, x) = e^-x (definition of the exponential distribution).
 * const { upper } = regularizedGamma(1, 700);
 * if (Math.abs(upper / Math.exp(-700) - 1) > 1e-13) throw new Error(String(upper));
 * ```
 */
export function regularizedGamma(a: number, x: number): GammaTails {
  if (!(a > 0) || !(x >= 0)) {
    throw new RangeError(`Incomplete gamma arguments "${a}", "${x}": need a > 0 and x ≥ 0`);
  }
  if (x === 0) return { lower: 0, upper: 1 };
  if (x === Infinity) return { lower: 1, upper: 0 };
  const lnFront = logFront(a, x);
  // Beyond the underflow threshold the directly computed tail is 0.
  if (lnFront < -746) return x < a + 1 ? { lower: 0, upper: 1 } : { lower: 1, upper: 0 };
  const front = Math.exp(lnFront);
  if (x < a + 1) {
    const lower = front * series(a, x);
    return { lower, upper: 1 - lower };
  }
  const upper = front * continuedFraction(a, x);
  return { lower: 1 - upper, upper };
}

/**
 * ln(xᵃ e⁻ˣ / Γ(a)), the common factor of both tails; the χ² density is this
 * factor divided by 2·(x/2) at x/2.
 *
 * @param a Shape, positive.
 * @param x Argument, positive.
 * @returns The logarithm of the factor.
 */
export function logGammaFront(a: number, x: number): number {
  return logFront(a, x);
}

function logFront(a: number, x: number): number {
  if (a < 8) return a * Math.log(x) - x - lnGamma(a);
  return 0.5 * Math.log(a) - HALF_LN_2PI + a * log1pmx((x - a) / a) - stirlingError(a);
}

/** Σₙ xⁿ / (a(a + 1)…(a + n)) (NR `gser`). */
function series(a: number, x: number): number {
  let ap = a, del = 1 / a, sum = del;
  for (let n = 0; n < MAX_ITER; n++) {
    ap += 1;
    del *= x / ap;
    sum += del;
    if (Math.abs(del) < Math.abs(sum) * EPS) return sum;
  }
  throw new RangeError(`Incomplete gamma series did not converge for a = ${a}, x = ${x}`);
}

/** Γ(a, x) eˣ x⁻ᵃ by the continued fraction, modified Lentz (NR `gcf`). */
function continuedFraction(a: number, x: number): number {
  let b = x + 1 - a, c = 1 / TINY, d = 1 / b, h = d;
  for (let i = 1; i < MAX_ITER; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPS) return h;
  }
  throw new RangeError(`Incomplete gamma fraction did not converge for a = ${a}, x = ${x}`);
}
