/**
 * Solving the stacked problem: Levenberg–Marquardt (kernel/optim `lmder`,
 * MINPACK-1; Moré, Garbow & Hillstrom 1980, ANL-80-74) from the start,
 * Gauss–Newton polishing on residuals in double-double from the data as
 * printed (kernel/optim `polish`), then (JᵀJ)⁻¹ by MINPACK's `covar` over the
 * parameters not held at a range's end. The same steps as the fit kind's
 * nonlinear solver (cells/fit/solve_nonlinear.ts), on the stacked problem,
 * so a joint fit whose parameters are all per group, or all shared, is the
 * fit kind's estimator on each table, or on the pooled rows.
 *
 * @module
 */
import { covar, lmder, polish } from "../../kernel/optim/mod.ts";
import type { Stacked } from "./_stacked.ts";

/** A solved stacked problem. */
export interface StackedFit {
  /** The estimates (global layout). */
  x: Float64Array;
  /** y − f at the estimates, stacked (double-double rounded to double where the data carry corrections). */
  residuals: Float64Array;
  /** Σ residuals². */
  rss: number;
  /** (JᵀJ)⁻¹, P×P column-major; NaN rows and columns for parameters held at a range's end. */
  unscaled: Float64Array;
  /** Parameters that ended on a range's end. */
  atBound: boolean[];
  /** Levenberg–Marquardt's accepted steps plus the polishing steps. */
  iterations: number;
}

/** Why a stacked problem has no solution here. */
export type StackedFailure =
  | { why: "not-converged"; iterations: number; rss: number; info: string }
  | { why: "not-finite" }
  | { why: "unidentifiable"; parameters: number[] };

/**
 * Fits the stacked problem from `x0` (inside the ranges).
 *
 * @param st The stacked problem.
 * @param x0 The start (global layout), finite.
 * @param lower Lower ends (−Infinity for none).
 * @param upper Upper ends (Infinity for none).
 * @returns The fit, or why there is none.
 */
export function fitStacked(
  st: Stacked,
  x0: Float64Array,
  lower: Float64Array,
  upper: Float64Array,
): StackedFit | StackedFailure {
  const { m: N, n: P } = st;
  const f0 = new Float64Array(N);
  st.problem.fcn(x0, f0);
  if (!f0.every(Number.isFinite)) return { why: "not-finite" };
  const run = lmder(st.problem, x0, { lower, upper });
  if (!run.converged) {
    return {
      why: "not-converged",
      iterations: run.iterations,
      rss: run.fnorm ** 2,
      info: run.info,
    };
  }
  const atBound = [...run.x].map((v, j) => v === lower[j] || v === upper[j]);
  const pol = polish(st.accurate, run.x, atBound);
  const J = new Float64Array(N * P);
  st.problem.jac(pol.x, J);
  const free = atBound.map((b, j) => (b ? -1 : j)).filter((j) => j >= 0);
  const sub = free.length === P ? J : new Float64Array(N * free.length);
  if (sub !== J) free.forEach((j, k) => sub.set(J.subarray(j * N, (j + 1) * N), k * N));
  const c = covar(N, free.length, sub);
  if (c.unidentifiable.length > 0) {
    return { why: "unidentifiable", parameters: c.unidentifiable.map((k) => free[k]) };
  }
  const q = free.length;
  const unscaled = new Float64Array(P * P).fill(NaN);
  for (let a = 0; a < q; a++) {
    for (let b = 0; b < q; b++) unscaled[free[a] + free[b] * P] = c.unscaled[a + b * q];
  }
  return {
    x: pol.x,
    residuals: pol.r,
    rss: pol.rss,
    unscaled,
    atBound,
    iterations: run.iterations + pol.steps,
  };
}

/** Whether a result is a failure. */
export const failed = (r: StackedFit | StackedFailure): r is StackedFailure => "why" in r;
