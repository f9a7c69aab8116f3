/**
 * Quantiles by inverting a tail function: bracketing, then Newton's method on
 * the logarithm of the tail with bisection as a safeguard (the `rtsafe`
 * scheme of *Numerical Recipes*, 3rd ed., §9.4).
 *
 * The equation solved is ln T(x) = ln q, where T is whichever tail (lower or
 * upper) is the smaller at the answer; in logarithms the function is close to
 * linear (tails decay like e^(−x²/2) or like a power), so Newton converges in
 * a few steps also for q = 1e-300. Positive-valued distributions are solved
 * in u = ln x so the bracket can widen geometrically and x stays positive.
 *
 * @module
 */
import { checkProbability, type Distribution } from "./distribution.ts";

/** What the inverter needs of one tail. */
export interface Tail {
  /** The tail probability at x (increasing or decreasing in x). */
  tail(x: number): number;
  /** d tail / dx at x (the density, with a sign). */
  slope(x: number): number;
  /** Whether x ranges over (0, ∞) (else over the real line). */
  positive: boolean;
  /** A first guess. */
  guess: number;
}

/**
 * Solves tail(x) = q.
 *
 * @param t The tail and its slope.
 * @param q The target probability, 0 < q < 1.
 * @returns x.
 * @throws {RangeError} When no bracket is found (a tail that never reaches q).
 */
export function invertTail(t: Tail, q: number): number {
  const lnq = Math.log(q);
  const toX = (u: number) => (t.positive ? Math.exp(u) : u);
  // g(u) = ln tail(x(u)) − ln q; its sign tells which side of the root u is on.
  const g = (u: number) => Math.log(t.tail(toX(u))) - lnq;
  let u0 = t.positive ? Math.log(t.guess) : t.guess;
  if (!Number.isFinite(u0)) u0 = 0;
  const [lo, hi] = bracket(g, u0);
  let a = lo, b = hi, ga = g(a);
  let u = 0.5 * (a + b);
  if (Number.isFinite(u0) && u0 > a && u0 < b) u = u0;
  for (let iter = 0; iter < 200; iter++) {
    const gu = g(u);
    if (gu === 0) return toX(u);
    if (Math.sign(gu) === Math.sign(ga)) [a, ga] = [u, gu];
    else b = u;
    const x = toX(u);
    const dgdu = t.slope(x) / t.tail(x) * (t.positive ? x : 1);
    let next = u - gu / dgdu;
    if (!(next > Math.min(a, b) && next < Math.max(a, b))) next = 0.5 * (a + b);
    if (Math.abs(next - u) <= 4e-16 * Math.max(1, Math.abs(u))) return toX(next);
    if (Math.abs(b - a) <= 4e-16 * Math.max(1, Math.abs(u))) return toX(0.5 * (a + b));
    u = next;
  }
  return toX(u);
}

/** An interval [a, b] (in either order) over which g changes sign. */
function bracket(g: (u: number) => number, u0: number): [number, number] {
  const g0 = g(u0);
  if (g0 === 0) return [u0, u0];
  let step = Math.max(1, Math.abs(u0) * 0.1);
  // Try both directions, doubling the step.
  for (let k = 0; k < 60; k++) {
    for (const s of [step, -step]) {
      const u = u0 + s;
      const gu = g(u);
      if (!Number.isNaN(gu) && Math.sign(gu) !== Math.sign(g0)) return [u0, u];
    }
    step *= 2;
  }
  throw new RangeError(`No quantile bracket found from ${u0}`);
}

/** The parts of a distribution on (0, ∞) from which quantiles are found. */
export interface PositiveParts {
  cdf(x: number): number;
  upper(x: number): number;
  density(x: number): number;
  /** A starting point for the x whose upper-tail probability is `q`. */
  guess(q: number): number;
}

/**
 * A distribution on (0, ∞) with quantiles by {@link invertTail}: each
 * quantile inverts the smaller tail, so probabilities near 0 and near 1 keep
 * their relative accuracy (shared by χ² and F).
 *
 * @param d Tails, density and a starting guess.
 * @returns The distribution.
 */
export function positiveDistribution(d: PositiveParts): Distribution {
  const { cdf, upper, density } = d;
  const solve = (q: number, useUpper: boolean) =>
    invertTail({
      tail: useUpper ? upper : cdf,
      slope: useUpper ? (x) => -density(x) : density,
      positive: true,
      guess: d.guess(useUpper ? q : 1 - q),
    }, q);
  return {
    cdf,
    upper,
    density,
    quantile: (p) => {
      checkProbability(p, "Probability");
      if (p === 0) return 0;
      if (p === 1) return Infinity;
      return p <= 0.5 ? solve(p, false) : solve(1 - p, true);
    },
    upperQuantile: (q) => {
      checkProbability(q, "Upper-tail probability");
      if (q === 0) return Infinity;
      if (q === 1) return 0;
      return q <= 0.5 ? solve(q, true) : solve(1 - q, false);
    },
  };
}
