/**
 * Ramsey's RESET test for a missed non-linearity in the mean.
 *
 * Method: Ramsey (1969), "Tests for specification errors in classical linear
 * least-squares regression analysis", J. Royal Statist. Soc. B 31:350–371:
 * add ŷ² and ŷ³ to the design and F-test the two added terms,
 * F = ((RSS₀ − RSS₁)/2)/(RSS₁/(n − r − 2)), r the rank of the design.
 * Computed as the regression of the residuals on [X, ŷ², ŷ³], which gives
 * the same RSS₁ for a linear fit (residuals are orthogonal to X, Frisch–Waugh)
 * and is the Gauss–Newton (linearised) form of the test for a nonlinear
 * fit, X being the Jacobian at the solution. A weighted fit scales every
 * column and the residuals by √wᵢ.
 *
 * @module
 */
import { fisherF } from "./fisher_f.ts";
import { auxiliaryRegression, scaleRows } from "./_auxiliary.ts";

/** The F test of the added powers of the fitted values. */
export interface Reset {
  f: number;
  df1: number;
  df2: number;
  p_value: number;
}

/**
 * RESET with ŷ² and ŷ³.
 *
 * @param residuals eᵢ (unweighted).
 * @param fitted ŷᵢ.
 * @param design The model's design (or Jacobian) columns.
 * @param weights wᵢ per row, or null.
 * @returns The test; null when the augmented design is rank-deficient (ŷ² and ŷ³
 *   add nothing new, e.g. when ŷ takes only two values), n − p − 2 < 1, or it fits exactly.
 * @example
 * ```ts
 * import { ramseyReset } from "./ramsey_reset.ts";
 * // y = x² fitted by a line on x = 1..6: the curvature is caught.
 * const x = [1, 2, 3, 4, 5, 6], one = new Float64Array(6).fill(1);
 * const fitted = new Float64Array(x.map((v) => 7 * v - 28 / 3)), e = new Float64Array(x.map((v, i) => v * v - fitted[i]));
 * const r = ramseyReset(e, fitted, [one, new Float64Array(x)], null);
 * if (r === null || !(r.p_value < 0.01)) throw new Error(JSON.stringify(r));
 * ```
 */
export function ramseyReset(
  residuals: Float64Array,
  fitted: Float64Array,
  design: readonly Float64Array[],
  weights: Float64Array | null,
): Reset | null {
  const n = residuals.length;
  const p = design.length;
  const df2 = n - p - 2;
  if (df2 < 1) return null;
  const cols = scaleRows(
    [...design, fitted.map((v) => v * v), fitted.map((v) => v * v * v)],
    weights,
  );
  const e = scaleRows([residuals], weights)[0];
  const aux = auxiliaryRegression(cols, e);
  if (aux === null) return null;
  let rss0 = 0;
  for (const v of e) rss0 += v * v;
  if (!(aux.rss > 0)) return null;
  const f = ((rss0 - aux.rss) / 2) / (aux.rss / df2);
  return { f, df1: 2, df2, p_value: fisherF(2, df2).upper(Math.max(0, f)) };
}
