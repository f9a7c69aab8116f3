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
 * When: {@link usePrecise}. Measured with kernel/linalg/qr_bench.ts (this
 * machine, Deno 2.9.6): the double-double solve costs about 4 times the
 * double one, 15 ms at n = 10,000 × 10 and 130 ms at 100,000 × 10 (double:
 * 3.5 ms and 33 ms), and with the design evaluated in double-double a
 * 10,000-row fit of two to four terms takes 8–35 ms more than the double
 * path (log and exp terms cost most). The rule:
 *
 * - n·p² ≤ {@link PRECISE_ALWAYS_LIMIT} (1e4: 2,500 rows of 2 terms, 625
 *   of 4; every NIST StRD linear set, Filip's 82 × 11 the largest at 9,922):
 *   always: there it costs 1–3 ms with power and root terms and up to about
 *   13 ms with a log term (2,500 rows; double-double log is the dearest);
 * - larger problems up to n·p² ≤ {@link PRECISE_WORK_LIMIT} (2e7, ~0.3 s):
 *   only when the design is ill-conditioned, scaled condition number (unit
 *   columns, kernel/linalg `scaledConditionNumber`) above
 *   {@link PRECISE_CONDITION}. Below it the double QR's error, of order
 *   ε·κ plus ε·κ²·‖r‖/(‖X‖‖θ‖) (Golub & Van Loan, *Matrix Computations*,
 *   4th ed., §5.3.8; from memory for the section), stays near 1e−12
 *   relative, far below any data's own rounding. Measured on the six
 *   10,000-row fits of test/e2e/latency_bench.ts (κ 4 to 86): estimates,
 *   covariance and RSS agree with the double-double ones to 13–15 digits
 *   (10 on a slope whose value is near zero);
 * - beyond 2e7 the double path alone, whatever the conditioning.
 *
 * @module
 */
import { compileDD, type Expr } from "../../kernel/expr/mod.ts";
import { ddLeastSquares, ddSumOfSquares, twoSum } from "../../kernel/linalg/mod.ts";
import type { FitProblem } from "./problem.ts";

/** Largest n·p² solved in double-double (10,000 rows × 10 terms is 1e6). */
export const PRECISE_WORK_LIMIT = 2e7;

/** Largest n·p² always solved in double-double, whatever the conditioning. */
export const PRECISE_ALWAYS_LIMIT = 1e4;

/** Scaled condition number above which a larger problem is still solved in double-double. */
export const PRECISE_CONDITION = 1e4;

/**
 * Whether a problem of n rows and p terms takes the double-double path.
 *
 * @param n Rows used.
 * @param p Terms (parameters).
 * @param kappa Scaled condition number of the design (unit-length columns);
 *   NaN or Infinity counts as ill-conditioned.
 * @returns True when n·p² ≤ {@link PRECISE_ALWAYS_LIMIT}, or when
 *   n·p² ≤ {@link PRECISE_WORK_LIMIT} and κ is above {@link PRECISE_CONDITION}.
 * @example
 * ```ts
 * import { usePrecise } from "./_precise_linear.ts";
 * if (!usePrecise(82, 11, 1e15)) throw new Error("NIST Filip is small: double-double");
 * if (usePrecise(10_000, 2, 4)) throw new Error("10,000 rows, well-conditioned: double");
 * if (!usePrecise(10_000, 4, 1e6)) throw new Error("10,000 rows, ill-conditioned: double-double");
 * ```
 */
export function usePrecise(n: number, p: number, kappa: number): boolean {
  const work = n * p * p;
  if (work <= PRECISE_ALWAYS_LIMIT) return true;
  return work <= PRECISE_WORK_LIMIT && !(kappa <= PRECISE_CONDITION);
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
  const finite = (v: Float64Array) => {
    for (let i = 0; i < v.length; i++) if (!Number.isFinite(v[i])) return false;
    return true;
  };
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
