/**
 * Auxiliary least-squares regressions for the diagnostics (VIF, Breusch–Pagan,
 * RESET): kernel/linalg `leastSquares` (pivoted Householder QR, never the
 * normal equations), with R² centred on a given constant column (the
 * √w-scaled column of ones for weighted problems), or uncentred (about zero)
 * for the variance inflation of a design without an intercept.
 *
 * @module
 */
import { leastSquares } from "../linalg/mod.ts";

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
  if (uncentred) {
    let tss = 0;
    for (let i = 0; i < y.length; i++) tss += y[i] * y[i];
    return { rss: fit.rss, tss, r2: 1 - fit.rss / tss };
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
  return { rss: fit.rss, tss, r2: 1 - fit.rss / tss };
}

/** Index of a column that is constant (all entries equal and not zero), or −1. */
export function constantColumn(design: readonly Float64Array[]): number {
  return design.findIndex((c) => c.length > 0 && c[0] !== 0 && c.every((v) => v === c[0]));
}

/** The columns scaled row-wise by √wᵢ (the same arrays when weights is null). */
export function scaleRows(
  columns: readonly Float64Array[],
  weights: Float64Array | null,
): Float64Array[] {
  if (!weights) return [...columns];
  return columns.map((c) => c.map((v, i) => v * Math.sqrt(weights[i])));
}
