/**
 * One subset fitted properly: the numbers a search reports for a model it
 * keeps, computed as a `fit` cell of that model and a `compare` of it
 * compute them, never read off the swept cross-products.
 *
 * - Least squares by orthogonal reduction (Miller, *Subset Selection in
 *   Regression*, 2nd ed., 2002, §2.2, from memory for the section): one
 *   Householder QR of the whole matrix A = [1, always…, candidates…, y]
 *   (kernel/linalg `householderQR`, unpivoted, so R keeps the column order),
 *   taken a block of rows at a time (`row_reduction.ts`), then for a subset
 *   S, since ‖X_S·β − y‖ = ‖R_S·β − R_y‖ for every β (Qᵀ keeps lengths; the
 *   rows of QᵀA below R are 0), the small problem on the
 *   columns of R, solved by pivoted QR (`leastSquares`, Golub & Van Loan,
 *   *Matrix Computations*, 4th ed., §5.3.3): backward stable like a QR of the
 *   n-row design, at O(m·p²) a subset instead of O(n·p²). A rank deficiency
 *   that QR finds marks the subset aliased.
 * - Log-likelihood, k, AIC, AICc and BIC by the fit cell's own function
 *   (cells/fit `likelihood`: k = p + 1 unless `count_variance: false`),
 *   the values a `compare` of the fit ranks by (cells/compare/criteria.ts;
 *   a bare response column has no Jacobian term).
 * - R² = 1 − RSS/TSS, adjusted R² = 1 − (1 − R²)(n − 1)/(n − p), as the fit
 *   cell computes them (cells/fit/_statistics.ts); without an intercept the
 *   uncentred forms, TSS = Σy² and n in place of n − 1.
 * - Leave-one-out RMSE from PRESS (Allen 1974): the residuals y − X_S·β on
 *   the n rows, hat values hᵢ = ‖R̃⁻ᵀxᵢ‖² through the small problem's
 *   triangular factor (X_SᵀX_S = R_SᵀR_S; kernel/linalg `inverseGramForms`,
 *   as the fit's `fitLeverage`), then kernel/stats `press`, as a `compare`
 *   by `loo` does for a linear fit; null when a row has leverage 1, and not
 *   computed beyond {@link LOO_ROWS} rows unless the search ranks by it.
 *
 * @module
 */
import {
  factorOfQR,
  inverseGramForms,
  leastSquares,
  type LeastSquaresFit,
} from "../../kernel/linalg/mod.ts";
import { reduceRows } from "./row_reduction.ts";
import { press } from "../../kernel/stats/mod.ts";
import { likelihood } from "../fit/mod.ts";
import type { SearchData } from "./_data.ts";
import type { SearchCriterion } from "./spec.ts";

/** What a subset's fit gives. */
export interface SubsetFit {
  /** The chosen candidates as a bit mask (bit j: candidate j). */
  mask: number;
  /** True when the QR found the design rank-deficient (no numbers then). */
  aliased: boolean;
  /** Mean parameters: intercept, always and chosen. */
  p: number;
  /** Parameters the criteria count. */
  k: number;
  rss: number;
  logLikelihood: number | null;
  aic: number | null;
  aicc: number | null;
  bic: number | null;
  r2: number | null;
  adjR2: number | null;
  looRmse: number | null;
}

/** What every subset's fit shares: the search's columns and the reduction of them. */
export interface FitBasis {
  data: SearchData;
  intercept: boolean;
  countVariance: boolean;
  /** Σ(y − ȳ)² with an intercept, Σy² without. */
  tss: number;
  /** Whether leave-one-out errors are computed (see {@link LOO_ROWS}). */
  loo: boolean;
  /** The design columns of A in order (1?, always…, candidates…); null for the intercept's ones. */
  columns: (Float64Array | null)[];
  /** R of A = [columns…, y]: `rows`×m, column-major (R[i][j] at i + j·rows, 0 below the diagonal). */
  r: Float64Array;
  rows: number;
}

/**
 * Rows up to which every listed model gets its leave-one-out error; beyond,
 * only a search by `loo` computes it (each costs a pass over the rows with
 * p²/2 products a row: about 0.2 s a model at a million rows here).
 */
export const LOO_ROWS = 100_000;

/**
 * Reduces the search's columns once, for every subset's fit.
 *
 * @param data The search's columns.
 * @param intercept Whether the models have an intercept.
 * @param countVariance Whether k counts the error variance.
 * @param tss The total sum of squares R² is taken against.
 * @param loo Whether to compute leave-one-out errors.
 * @returns The basis {@link fitSubset} reads.
 */
export function fitBasis(
  data: SearchData,
  intercept: boolean,
  countVariance: boolean,
  tss: number,
  loo: boolean,
): FitBasis {
  const columns = [...(intercept ? [null] : []), ...data.forced, ...data.columns];
  const { r, rows } = reduceRows([...columns, data.y], data.n);
  return { data, intercept, countVariance, tss, loo, columns, r, rows };
}

/**
 * Fits one subset and computes its criteria.
 *
 * @param basis The reduction and conventions.
 * @param mask The chosen candidates.
 * @returns The subset's numbers (all null and `aliased` when the QR finds it rank-deficient).
 */
export function fitSubset(basis: FitBasis, mask: number): SubsetFit {
  const { data, intercept, r, rows } = basis;
  const n = data.n;
  const base = (intercept ? 1 : 0) + data.forced.length;
  const index: number[] = [];
  for (let j = 0; j < base; j++) index.push(j);
  data.columns.forEach((_, j) => ((mask >>> j) & 1) && index.push(base + j));
  const p = index.length, m = basis.columns.length + 1;
  const none = {
    mask,
    p,
    k: p + (basis.countVariance ? 1 : 0),
    rss: NaN,
    logLikelihood: null,
    aic: null,
    aicc: null,
    bic: null,
    r2: null,
    adjR2: null,
    looRmse: null,
  };
  if (p === 0 || p > rows) return { ...none, aliased: true };
  const column = (j: number) => r.subarray(j * rows, (j + 1) * rows);
  const ls = leastSquares(index.map(column), column(m - 1), index.map(String));
  if (!ls.fullRank) return { ...none, aliased: true };
  const l = likelihood(
    { name: "", n, p, rss: ls.rss, weights: null, weighting: "none" },
    basis.countVariance,
    () => {},
  );
  const r2 = basis.tss > 0 ? 1 - ls.rss / basis.tss : null;
  const df = n - p;
  return {
    ...none,
    aliased: false,
    rss: ls.rss,
    k: l.k,
    logLikelihood: l.logLikelihood,
    aic: l.aic,
    aicc: l.aicc,
    bic: l.bic,
    r2,
    adjR2: r2 !== null && df > 0 ? 1 - (1 - r2) * (intercept ? n - 1 : n) / df : null,
    looRmse: basis.loo ? looOf(basis, index, ls) : null,
  };
}

/** Leave-one-out RMSE: residuals on the n rows, hat values through the small problem's factor. */
function looOf(basis: FitBasis, index: number[], ls: LeastSquaresFit): number | null {
  const { data } = basis, n = data.n;
  const ones = basis.columns[0] === null ? new Float64Array(n).fill(1) : null;
  const design = index.map((j) => basis.columns[j] ?? ones!);
  const residuals = Float64Array.from(data.y);
  design.forEach((x, t) => {
    const b = ls.coefficients[t];
    for (let i = 0; i < n; i++) residuals[i] -= b * x[i];
  });
  const hat = inverseGramForms(
    factorOfQR(ls.qr, ls.scale),
    design.map((hi) => ({ hi, lo: null })),
    n,
  );
  return press(residuals, hat).looRmse;
}

/**
 * The value a criterion ranks a fitted subset by.
 *
 * @param f The subset's fit.
 * @param by The criterion.
 * @returns The value, or null when it does not exist (ranked last).
 */
export function criterionOf(f: SubsetFit, by: SearchCriterion): number | null {
  if (f.aliased) return null;
  switch (by) {
    case "aic":
      return f.aic;
    case "aicc":
      return f.aicc;
    case "bic":
      return f.bic;
    case "adj_r2":
      return f.adjR2;
    case "loo":
      return f.looRmse;
  }
}

/**
 * Orders two fitted subsets: the better criterion first (larger for
 * adjusted R², smaller for the rest), those without one last, then fewer
 * parameters, then by mask (deterministic).
 *
 * @param by The criterion.
 * @returns A comparator for `Array.prototype.sort`.
 * @example
 * ```ts
 * import { better } from "./exact_fit.ts";
 * const f = (mask: number, bic: number | null) => ({ mask, bic, p: 2, aliased: false }) as never;
 * const order = [f(1, 10), f(2, null), f(4, 3)].sort(better("bic")).map((x: { mask: number }) => x.mask);
 * if (order.join() !== "4,1,2") throw new Error(order.join());
 * ```
 */
export function better(by: SearchCriterion): (a: SubsetFit, b: SubsetFit) => number {
  const sign = by === "adj_r2" ? -1 : 1;
  return (a, b) => {
    const x = criterionOf(a, by), y = criterionOf(b, by);
    if (x !== y) {
      if (x === null) return 1;
      if (y === null) return -1;
      return sign * (x - y);
    }
    return a.p - b.p || a.mask - b.mask;
  };
}

/**
 * How k is counted, in the fit cell's own words (cells/fit `likelihood`).
 *
 * @param countVariance Whether k counts the error variance.
 * @returns The sentence a fit's result gives as its `k` convention.
 */
export function kConvention(countVariance: boolean): string {
  const any = { name: "", n: 3, p: 1, rss: 1, weights: null, weighting: "none" as const };
  return likelihood(any, countVariance, () => {}).kConvention;
}
