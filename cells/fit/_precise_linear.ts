/**
 * The double-double path of the linear solver: the design, the response and
 * the offset evaluated in double-double from the data as printed (the
 * table's decimal corrections), then QR least squares in double-double
 * (`ddLeastSquares`, kernel/linalg) in the pivot order of the double
 * factorization.
 *
 * Why: NIST StRD's certified values are exact for the data as printed. Data
 * rounded to doubles already move Filip's or Wampler5's estimates in the
 * 8th–10th digit; with the printed decimals kept to ~32 digits, and every
 * step in ~32 digits, the results round correctly to nearly all 15 printed
 * digits (test/reference/strd_linear_test.ts).
 *
 * When: {@link usePrecise} — problems with n·p² ≤ {@link PRECISE_WORK_LIMIT}.
 * Measured with kernel/linalg/qr_bench.ts (this machine, Deno 2.9.6): the
 * double-double solve costs about 4 times the double one, 15 ms at
 * n = 10,000 × 10 and 130 ms at 100,000 × 10 (double: 3.5 ms and 33 ms;
 * 1,000,000 × 10 in double: 0.5 s). The limit 2e7 (200,000 rows of 10
 * terms, ~0.3 s) keeps the extra cost under about half a second; larger
 * problems take the double path alone, whose accuracy there is that of the
 * data rounded to doubles anyway for well-conditioned designs.
 *
 * @module
 */
import { compileDD, type Expr } from "../../kernel/expr/mod.ts";
import { ddLeastSquares, ddSumOfSquares, twoSum } from "../../kernel/linalg/mod.ts";
import type { FitProblem } from "./problem.ts";

/** Largest n·p² solved in double-double (10,000 rows × 10 terms is 1e6). */
export const PRECISE_WORK_LIMIT = 2e7;

/**
 * Whether a problem of n rows and p terms takes the double-double path.
 *
 * @param n Rows used.
 * @param p Terms (parameters).
 * @returns True when n·p² ≤ {@link PRECISE_WORK_LIMIT}.
 */
export function usePrecise(n: number, p: number): boolean {
  return n * p * p <= PRECISE_WORK_LIMIT;
}

/** Results of the double-double path, rounded to doubles. */
export interface PreciseLinear {
  estimates: Float64Array;
  unscaledCovariance: Float64Array;
  fitted: Float64Array;
  residuals: Float64Array;
  rss: number;
  /** TSS from the response in double-double (centred with an intercept); unweighted fits only. */
  tss: number | undefined;
}

/**
 * Solves the problem again in double-double.
 *
 * @param problem The fit problem (with `lo` corrections where the table kept them).
 * @param terms The design terms ∂f/∂θ_j.
 * @param order The pivot order of the double factorization (full rank).
 * @param root √w per row for a weighted fit, else null.
 * @param hasIntercept Whether a constant is in the span of the design.
 * @returns The solution, or null when some double-double value is not finite
 *   (the caller keeps the double solution).
 */
export function solvePrecise(
  problem: FitProblem,
  terms: readonly Expr[],
  order: Int32Array,
  root: Float64Array | null,
  hasIntercept: boolean,
): PreciseLinear | null {
  const { model, n } = problem;
  const params = model.parameters;
  const zeros = new Float64Array(params.length);
  const hi = problem.columns;
  const lo = problem.lo?.columns ?? hi.map(() => null);
  const design = terms.map((t) => compileDD(t, model.columns, params)(hi, lo, zeros, null, n));
  const resp = problem.lo?.response;
  const y = resp
    ? compileDD(model.response, [model.responseColumn], [])([resp.hi], [resp.lo], [], null, n)
    : { hi: problem.y, lo: null };
  // target = y − f(x; 0): the response less the part of the model free of parameters
  const f0 = compileDD(model.rhs, model.columns, params)(hi, lo, zeros, null, n);
  const target = { hi: new Float64Array(n), lo: new Float64Array(n) };
  for (let i = 0; i < n; i++) {
    const [s, e] = twoSum(y.hi[i], -f0.hi[i]);
    const l = e + ((y.lo === null ? 0 : y.lo[i]) - f0.lo[i]);
    target.hi[i] = s + l;
    target.lo[i] = l - (target.hi[i] - s);
  }
  const finite = (v: Float64Array) => v.every(Number.isFinite);
  if (!design.every((d) => finite(d.hi)) || !finite(target.hi) || !finite(y.hi)) return null;
  const ls = ddLeastSquares(design, target, order, root);
  // fitted = y − r, so residuals = y − fitted exactly as the double path
  const fitted = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const [s, e] = twoSum(y.hi[i], -ls.residuals[i]);
    fitted[i] = s + (e + ((y.lo === null ? 0 : y.lo[i]) - ls.residualsLo[i]));
  }
  return {
    estimates: ls.coefficients,
    unscaledCovariance: ls.unscaledCovariance,
    fitted,
    residuals: ls.residuals,
    rss: ls.rss + ls.rssLo,
    tss: root === null ? ddSumOfSquares(y, hasIntercept) : undefined,
  };
}
