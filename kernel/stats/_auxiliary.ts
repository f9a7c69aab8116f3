/**
 * Auxiliary least-squares regressions for the diagnostics (VIF, Breusch–Pagan,
 * RESET): kernel/linalg `leastSquares` (pivoted Householder QR, never the
 * normal equations), with R² centred on a given constant column (the
 * √w-scaled column of ones for weighted problems), or uncentred (about zero)
 * for the variance inflation of a design without an intercept.
 *
 * When the regressors are the fit's own design plus a few columns, the
 * fit's QR is reused (`splitOnBase`): the residual of y on [X, Z] is that of
 * Q₂ᵀy on Q₂ᵀZ, Q = [Q₁ Q₂] the fit's orthogonal factor (adding columns to a
 * QR factorization: Golub & Van Loan, *Matrix Computations*, 4th ed., §6.5.2;
 * Björck, *Numerical Methods for Least Squares Problems*, 1996, §3.2.4; from
 * memory for the sections), one application of Qᵀ per vector (O(np)) and a
 * QR of the (n − p) × q block instead of the whole n × (p + q) one. Where an
 * added column lies nearly in the design's span (less than 1e-6 of its
 * length outside it) the full regression decides the rank instead.
 *
 * @module
 */
import {
  applyQtInPlace,
  factorInPlace,
  leastSquares,
  type QRFactorization,
} from "../linalg/mod.ts";

/** Sums of an auxiliary regression. */
export interface Auxiliary {
  rss: number;
  /** ‖y − c·(cᵀy/cᵀc)‖², the total sum of squares about the constant column c (‖y‖² uncentred). */
  tss: number;
  /** 1 − rss/tss (NaN when tss = 0). */
  r2: number;
}

/**
 * Regresses y on the columns; null when the columns are rank-deficient.
 *
 * @param columns Regressor columns (include the constant column yourself).
 * @param y The response.
 * @param constant The constant column c for the centred TSS (default all ones).
 * @param uncentred True for the TSS about zero, ‖y‖² (then `constant` is not read).
 * @returns RSS, TSS and R², or null for a rank-deficient design.
 */
export function auxiliaryRegression(
  columns: readonly Float64Array[],
  y: Float64Array,
  constant: Float64Array | null = null,
  uncentred = false,
): Auxiliary | null {
  const fit = leastSquares(columns, y, columns.map((_, j) => `column ${j + 1}`));
  if (!fit.fullRank) return null;
  return totals(fit.rss, y, constant, uncentred);
}

/**
 * RSS, TSS and R² from a regression's RSS: TSS about the constant column c
 * (`cᵀy/cᵀc`; all ones when null), or about zero when `uncentred`.
 *
 * @param rss The regression's residual sum of squares.
 * @param y The response.
 * @param constant The constant column c (default all ones).
 * @param uncentred True for the TSS about zero.
 * @returns The sums.
 */
function totals(
  rss: number,
  y: Float64Array,
  constant: Float64Array | null = null,
  uncentred = false,
): Auxiliary {
  if (uncentred) {
    let tss = 0;
    for (let i = 0; i < y.length; i++) tss += y[i] * y[i];
    return { rss, tss, r2: 1 - rss / tss };
  }
  let cy = 0, cc = 0;
  for (let i = 0; i < y.length; i++) {
    const c = constant ? constant[i] : 1;
    cy += c * y[i];
    cc += c * c;
  }
  let tss = 0;
  for (let i = 0; i < y.length; i++) {
    const d = y[i] - (constant ? constant[i] : 1) * (cy / cc);
    tss += d * d;
  }
  return { rss, tss, r2: 1 - rss / tss };
}

/** Below this share of its length outside the design's span an added column is left to the full regression. */
const OUTSIDE_SPAN = 1e-6;

/** The two parts of ‖y‖² on [X, Z]: what the regression leaves and what it explains. */
export interface Split {
  /** ‖y − [X Z]·β̂‖². */
  rss: number;
  /** ‖[X Z]·β̂‖² = ‖y‖² − rss, summed from its own terms (no cancellation when it is small). */
  explained: number;
}

/**
 * y regressed on [X, Z] through the QR of X already made, in a scratch
 * buffer the caller gives (no other n-long array is made: touching new
 * memory costs about 2.5 ms per MB on a million rows, issue 16). The
 * explained sum of squares is summed from its own terms, ‖Q₁ᵀy‖² plus the
 * added columns' share of Q₂ᵀy, so an F test of a small effect keeps its
 * digits (on 1,000,000 rows RESET's F = 0.28 needs RSS₀ − RSS₁ ≈ 6e-7·RSS₁,
 * which the difference of the two sums gets to 6e-8 relative only).
 *
 * @param base The full-rank pivoted QR of X (or of X scaled by columns: the span is what counts).
 * @param work (q + 1)·m numbers, m = base.m: the q added columns Z, then y; overwritten.
 * @param q The number of added columns (0 for y on X alone).
 * @returns RSS and ESS, or null when this route cannot decide: the QR is
 *   rank-deficient or of other rows, an added column lies nearly in X's span,
 *   or the added columns are nearly dependent (then use {@link auxiliaryRegression}).
 * @example
 * ```ts
 * import { householderQR } from "../linalg/mod.ts";
 * import { splitOnBase } from "./_auxiliary.ts";
 * // y = (1, 2, 4) on a constant: RSS = Σ(y − 7/3)² = 14/3, ESS = 3·(7/3)² = 49/3;
 * // adding x = (0, 1, 2) leaves RSS 1/6 (hand computation).
 * const base = householderQR(Float64Array.of(1, 1, 1), 3, 1);
 * const a = splitOnBase(base, Float64Array.of(1, 2, 4), 0)!;
 * if (Math.abs(a.rss - 14 / 3) > 1e-14 || Math.abs(a.explained - 49 / 3) > 1e-14) throw new Error();
 * const b = splitOnBase(base, Float64Array.of(0, 1, 2, 1, 2, 4), 1)!;
 * if (Math.abs(b.rss - 1 / 6) > 1e-14 || Math.abs(b.explained - (21 - 1 / 6)) > 1e-13) throw new Error();
 * ```
 */
export function splitOnBase(base: QRFactorization, work: Float64Array, q: number): Split | null {
  const { m, n: p } = base, r = m - p;
  if (base.rank !== p || work.length !== (q + 1) * m || r <= q) return null;
  const column = (j: number) => work.subarray(j * m, (j + 1) * m);
  const length2 = Array.from({ length: q }, (_, j) => sumSquares(column(j)));
  for (let j = 0; j <= q; j++) applyQtInPlace(base, column(j));
  const y2 = work.subarray(q * m + p, (q + 1) * m);
  const inX = sumSquares(work.subarray(q * m, q * m + p));
  if (q === 0) return { rss: sumSquares(y2), explained: inX };
  // Each added column's part outside X's span, Q₂ᵀz, moved to the front: an r × q matrix
  // (copyWithin moves left, ahead of what it reads), scaled by powers of two (exact) so
  // that the rank decision does not depend on units, as leastSquares does.
  for (let j = 0; j < q; j++) {
    const outside = sumSquares(work.subarray(j * m + p, (j + 1) * m));
    if (!(outside >= OUTSIDE_SPAN ** 2 * length2[j])) return null;
    work.copyWithin(j * r, j * m + p, (j + 1) * m);
    const s = 2 ** -(Math.floor(Math.log2(Math.sqrt(outside))) + 1);
    for (let i = j * r; i < (j + 1) * r; i++) work[i] *= s;
  }
  const f = factorInPlace(work.subarray(0, q * r), r, q);
  const d = f.rDiag;
  if (f.rank < q || !(Math.abs(d[q - 1]) >= OUTSIDE_SPAN * Math.abs(d[0]))) return null;
  applyQtInPlace(f, y2);
  return { rss: sumSquares(y2.subarray(q)), explained: inX + sumSquares(y2.subarray(0, q)) };
}

function sumSquares(v: Float64Array): number {
  let s = 0;
  for (let i = 0; i < v.length; i++) s += v[i] * v[i];
  return s;
}

/** Index of a column that is constant (all entries equal and not zero), or −1. */
export function constantColumn(design: readonly Float64Array[]): number {
  return design.findIndex((c) => c.length > 0 && c[0] !== 0 && allEqual(c, c[0]));
}

/** Whether every entry equals v (a plain loop: `every` with a callback is slower on a million rows). */
function allEqual(c: Float64Array, v: number): boolean {
  for (let i = 0; i < c.length; i++) if (c[i] !== v) return false;
  return true;
}

/** The columns scaled row-wise by √wᵢ (the same arrays when weights is null). */
export function scaleRows(
  columns: readonly Float64Array[],
  weights: Float64Array | null,
): Float64Array[] {
  if (!weights) return [...columns];
  return columns.map((c) => c.map((v, i) => v * Math.sqrt(weights[i])));
}
