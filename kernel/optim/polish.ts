/**
 * Final polishing of a least-squares solution: Gauss–Newton steps whose
 * residuals are computed more accurately than the iterations' (double-double
 * from the data as printed, when the caller can), kept while the steps
 * contract and the residual sum of squares does not rise beyond rounding. This is iterative refinement of the nonlinear
 * solution (Björck 1996, *Numerical Methods for Least Squares Problems*,
 * §2.9 and §9.2; from memory for the sections): near the minimum the
 * Gauss–Newton step is the least-squares correction δ = J⁺r, and its
 * accuracy is limited by that of r, not of J.
 *
 * The correction is solved through the pivoted QR of J (`qrfac`), never the
 * normal equations. Parameters marked as held (at a bound) do not move.
 *
 * @module
 */
import { lsqSolve, lsqWork } from "./_lsq_solve.ts";
import { fastTwoSum, twoSum } from "../linalg/mod.ts";

/** Relative rise of the RSS treated as rounding noise (common practice, no source). */
const RSS_NOISE = 1e-12;

/**
 * A kept step this small relative to the parameters (2⁻⁵⁶, an eighth of the
 * unit roundoff of a double) ends the polishing: what follows moves only the
 * low parts, below anything reported, and near a solution Gauss–Newton's
 * steps there are rounding noise that no longer contracts (on the fit
 * cell's benchmark, y = a·exp(−b·x) + c: 5e-12, 6e-15, 1e-17, then 1e-18,
 * 4e-19, 1e-18; three of six evaluations in double-double saved; the rule is
 * ours, no source).
 */
const STEP_FLOOR = 2 ** -56;

/** What polishing needs: accurate residuals and the Jacobian. */
export interface PolishProblem {
  m: number;
  n: number;
  /**
   * Writes r = y − f(x + xlo), as accurately as the caller can, rounded to
   * double, and returns a bound on the rounding error of Σr² (0 when
   * negligible). `xlo` is the low part of double-double parameters (a
   * caller evaluating in double may ignore it).
   */
  residuals(x: Float64Array, r: Float64Array, xlo: Float64Array): number;
  /** Writes ∂f/∂x (m×n, column-major). */
  jac(x: Float64Array, fjac: Float64Array): void;
}

/** The polished point. */
export interface Polished {
  /** The parameters, rounded to double. */
  x: Float64Array;
  /** Their low parts: x + xlo is the polished point in double-double. */
  xlo: Float64Array;
  /** y − f(x) from `residuals`. */
  r: Float64Array;
  /** Σr² from `residuals`. */
  rss: number;
  /** Steps accepted. */
  steps: number;
}

/**
 * Takes Gauss–Newton steps from `x0` while they contract (each smaller than the
 * last, relative to the parameters) and the RSS does not rise beyond rounding (at most `maxSteps`).
 *
 * @param problem Residuals and Jacobian.
 * @param x0 A converged solution.
 * @param held Parameters that must not move (optional).
 * @param maxSteps Upper limit on accepted steps (default 100).
 * @returns The best point seen, its residuals and RSS.
 * @example
 * ```ts
 * import { polish } from "./polish.ts";
 * // f = a·t on t = 1, 2 with y = 2, 4: one step from a = 1.9 lands on a = 2.
 * const t = [1, 2], y = [2, 4];
 * const p = polish({
 *   m: 2, n: 1,
 *   residuals: (x, r) => { for (let i = 0; i < 2; i++) r[i] = y[i] - x[0] * t[i]; return 0; },
 *   jac: (_x, j) => { j[0] = 1; j[1] = 2; },
 * }, new Float64Array([1.9]));
 * if (p.x[0] !== 2 || p.rss !== 0) throw new Error(String(p.x));
 * ```
 */
export function polish(
  problem: PolishProblem,
  x0: Float64Array,
  held: readonly boolean[] = [],
  maxSteps = 100,
): Polished {
  const { m, n } = problem;
  // The point is kept as double-double (x + xlo): at a solution whose RSS is at
  // the data's rounding level (Lanczos1), rounding θ to double alone moves
  // the RSS in its 6th digit.
  let x = Float64Array.from(x0), xlo = new Float64Array(n), r = new Float64Array(m);
  let noise = problem.residuals(x, r, xlo);
  let rss = sumSquares(r), steps = 0, prev = Infinity;
  const fjac = new Float64Array(m * n), work = lsqWork(m, n);
  // The trial point and its residuals; swapped with the current ones when a step is kept.
  let rt = new Float64Array(m), xt = new Float64Array(n), xtlo = new Float64Array(n);
  for (let k = 0; k < maxSteps && rss > 0; k++) {
    problem.jac(x, fjac);
    for (let j = 0; j < n; j++) if (held[j]) fjac.fill(0, j * m, j * m + m);
    const delta = lsqSolve(m, n, fjac, r, work);
    if (delta === null) break;
    // Relative size of the correction: Gauss–Newton contracts near a solution
    // (only linearly when the residuals are large, as in ENSO); once it stops
    // shrinking, what is left is rounding noise.
    let size = 0;
    for (let j = 0; j < n; j++) size = Math.max(size, Math.abs(delta[j]) / (Math.abs(x[j]) || 1));
    if (size === 0 || !(size < prev)) break;
    for (let j = 0; j < n; j++) {
      const [s, e] = twoSum(x[j], delta[j]);
      [xt[j], xtlo[j]] = fastTwoSum(s, e + xlo[j]);
    }
    const noiseT = problem.residuals(xt, rt, xtlo);
    const rssT = sumSquares(rt);
    // The RSS cannot resolve the last digits of weakly determined parameters,
    // so a contracting step is kept unless it raises the RSS beyond rounding.
    if (!(rssT <= rss * (1 + RSS_NOISE) + noise + noiseT)) break;
    [x, xt, xlo, xtlo, r, rt] = [xt, x, xtlo, xlo, rt, r];
    [rss, prev, noise] = [rssT, size, noiseT];
    steps++;
    if (size < STEP_FLOOR) break;
  }
  return { x, xlo, r, rss, steps };
}

function sumSquares(r: Float64Array): number {
  let s = 0;
  for (let i = 0; i < r.length; i++) s += r[i] * r[i];
  return Number.isFinite(s) ? s : Infinity;
}
