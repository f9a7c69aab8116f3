/**
 * The precise paths of the linear solver, both from the data as printed
 * (the table's decimal corrections, or `printedLo` of `_dd_design.ts` where it kept none):
 *
 * - the double-double solve: the design, response and offset evaluated in
 *   double-double, then QR least squares in double-double (`ddLeastSquares`,
 *   kernel/linalg) in the pivot order of the double factorization; its R̃
 *   is kept in double-double for prediction variances and leverages;
 * - the refinement of the double solution (`refineLeastSquares`, kernel/
 *   linalg: Björck 1967, the augmented system's residuals in double-double,
 *   the design's rows computed again per pass, `_dd_rows.ts`).
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
 *   {@link PRECISE_CONDITION}: there its R̃ (the covariance, prediction
 *   variances and leverages) in double-double matters, the double R̃'s
 *   relative error being of order κ·u;
 * - every other problem takes the double QR and then refines its solution,
 *   one or two passes over the data. The double QR's error, of order
 *   u·κ + u·κ²·‖r‖/(‖X‖‖θ‖) (Golub & Van Loan, *Matrix Computations*, 4th
 *   ed., §5.3.8; from memory for the section), grows with the rows: NIST
 *   StRD sets replicated to 20,000 rows gave Wampler4 7.0, Wampler5 5.0 and
 *   Norris 12.5 digits on the double path alone, and at 1,000,000 rows
 *   Filip 4.8–6.5, Wampler4 5.9–6.3 and Longley 9.4; refined, 14.3 or more
 *   (test/reference/strd_linear_test.ts; `certified_million` of
 *   `deno task bench`: 1.1–1.3 times the double path's time in a new
 *   process, 1.2–1.45 in a warm one). Measured on
 *   10,000 rows (the fits of test/e2e/latency_bench.ts): 0.4–1.5 ms more a
 *   fit, 8 ms with a log term (double-double log is the dearest). The
 *   covariance then comes from the double R̃, accurate to about κ·u·c(m)
 *   relative: at 1,000,000 rows the standard errors of Filip (κ 5e9) keep
 *   7.6 digits, of Wampler4 and Longley 13.6 or more.
 *
 * @module
 */
import {
  ddLeastSquares,
  type DDRows,
  ddSumOfSquares,
  factorOfQR,
  type LeastSquaresFit,
  refineLeastSquares,
  type TriangularFactor,
} from "../../kernel/linalg/mod.ts";
import { sumError } from "../../kernel/dd.ts";
import type { DDColumn } from "./_dd_design.ts";

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

/** Results of a precise path (double-double solve or refinement), rounded to doubles. */
export interface PreciseLinear {
  estimates: Float64Array;
  /** Low parts of the estimates (estimate + lo to about 32 digits). */
  estimatesLo: Float64Array;
  unscaledCovariance: Float64Array;
  fitted: Float64Array;
  residuals: Float64Array;
  rss: number;
  /** TSS from the response in double-double (centred with an intercept); unweighted fits only. */
  tss: number | undefined;
  /** The triangular factor of the solve (double-double on the double-double path). */
  factor: TriangularFactor;
}

/** The response in double-double and the target y − f(x; 0) (the response less any offset). */
export interface DDResponse {
  y: DDColumn;
  target: DDColumn;
}

/**
 * Solves the problem again in double-double (`ddLeastSquares`).
 *
 * @param design The design as printed, in double-double.
 * @param dd The response and target in double-double.
 * @param order The pivot order of the double factorization (full rank).
 * @param root √w per row for a weighted fit, else null.
 * @param hasIntercept Whether a constant is in the span of the design.
 * @returns The solution, or null when some double-double value is not finite
 *   (the caller keeps the double solution).
 */
export function solvePrecise(
  design: readonly DDColumn[],
  dd: DDResponse,
  order: Int32Array,
  root: Float64Array | null,
  hasIntercept: boolean,
): PreciseLinear | null {
  if (!design.every((d) => finite(d.hi)) || !finite(dd.target.hi) || !finite(dd.y.hi)) {
    return null;
  }
  const ls = ddLeastSquares(design, dd.target, order, root);
  return {
    estimates: ls.coefficients,
    estimatesLo: ls.coefficientsLo,
    unscaledCovariance: ls.unscaledCovariance,
    ...fromResiduals(dd.y, ls.residuals, ls.residualsLo, root, hasIntercept),
    residuals: ls.residuals,
    rss: ls.rss + ls.rssLo,
    factor: ls.factor,
  };
}

/**
 * Refines the double solution against the data as printed (`refineLeastSquares`).
 *
 * @param ls The double solution of the (whitened) problem.
 * @param rows The design's rows as printed, in double-double.
 * @param dd The response and target in double-double.
 * @param root √w per row for a weighted fit, else null.
 * @param hasIntercept Whether a constant is in the span of the design.
 * @returns The refined solution, or null when refinement does not apply
 *   (the caller keeps the double solution).
 */
export function solveRefined(
  ls: LeastSquaresFit,
  rows: DDRows,
  dd: DDResponse,
  root: Float64Array | null,
  hasIntercept: boolean,
): PreciseLinear | null {
  // (A response or target that is not finite makes the refinement's residuals so: it returns null.)
  // The double solution's fitted values and residuals are not used: its arrays are the work space.
  const r = refineLeastSquares(ls, rows, dd.target, root, { reuse: true });
  if (r === null) return null;
  return {
    estimates: r.coefficients,
    estimatesLo: r.coefficientsLo,
    unscaledCovariance: ls.unscaledCovariance,
    ...fromResiduals(dd.y, r.residuals, r.residualsLo, root, hasIntercept, ls.fitted),
    residuals: r.residuals,
    rss: r.rss + r.rssLo,
    factor: factorOfQR(ls.qr, ls.scale),
  };
}

/**
 * fitted = y − r in double-double (so residuals = y − fitted exactly as the
 * double path), into `out` when given, and, for an unweighted fit, TSS in
 * double-double from the response as printed (`ddSumOfSquares`).
 */
function fromResiduals(
  y: DDColumn,
  residuals: Float64Array,
  residualsLo: Float64Array,
  root: Float64Array | null,
  hasIntercept: boolean,
  out?: Float64Array,
) {
  const n = residuals.length, yl = y.lo;
  const fitted = out ?? new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const a = y.hi[i], s = a - residuals[i], e = sumError(a, -residuals[i], s);
    fitted[i] = s + (e + ((yl === null ? 0 : yl[i]) - residualsLo[i]));
  }
  return { fitted, tss: root === null ? ddSumOfSquares(y, hasIntercept) : undefined };
}

function finite(v: Float64Array): boolean {
  for (let i = 0; i < v.length; i++) if (!Number.isFinite(v[i])) return false;
  return true;
}
