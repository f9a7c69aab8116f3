/**
 * Breusch–Pagan test for non-constant residual variance.
 *
 * Method: Breusch & Pagan (1979), "A simple test for heteroscedasticity and
 * random coefficient variation", Econometrica 47:1287–1294 (the original
 * form), and Koenker (1981), "A note on studentizing a test for
 * heteroscedasticity", J. Econometrics 17:107–112 (the studentized form,
 * robust to non-normal errors; our default):
 *
 * - auxiliary regression of eᵢ² on the model's own design (with an intercept);
 * - Koenker: LM = n·R² of that regression;
 * - original: LM = ESS/2 of the regression of eᵢ²/(RSS/n) on the design;
 * - both against χ²(q − 1), q the columns of the auxiliary design (p − 1 for
 *   a model with an intercept). The overall F of the auxiliary regression is
 *   reported too (the same in both forms).
 *
 * A design without a constant column gets one. For a weighted fit eᵢ is
 * √wᵢ·eᵢ (constant variance under the model) regressed on the unweighted
 * design; for a nonlinear fit the design is the Jacobian at the solution.
 *
 * @module
 */
import { chiSquared } from "./chi_squared.ts";
import { fisherF } from "./fisher_f.ts";
import { auxiliaryRegression, constantColumn } from "./_auxiliary.ts";

/** Which form of the statistic. */
export type BreuschPaganVariant = "koenker" | "original";

/** The test's outcome. */
export interface BreuschPagan {
  variant: BreuschPaganVariant;
  statistic: number;
  df: number;
  p_value: number;
  /** Overall F of the auxiliary regression and its p-value (null when it has no residual df). */
  f: number | null;
  f_p_value: number | null;
}

/**
 * Breusch–Pagan test of the residuals against the design.
 *
 * @param residuals eᵢ per row (unweighted).
 * @param design The model's design columns (or Jacobian), each n long.
 * @param weights wᵢ per row, or null.
 * @param variant "koenker" (default) or "original".
 * @returns The statistic, df and p-value; null when the test does not exist (no
 *   non-constant column, a rank-deficient auxiliary design, or all residuals 0).
 * @throws {RangeError} When the lengths differ.
 * @example
 * ```ts
 * import { breuschPagan } from "./breusch_pagan.ts";
 * const x = new Float64Array([1, 2, 3, 4, 5, 6]), one = new Float64Array(6).fill(1);
 * const bp = breuschPagan(new Float64Array([0.1, -0.2, 0.3, -0.4, 0.5, -0.6]), [one, x], null);
 * if (bp === null || bp.df !== 1 || !(bp.p_value > 0 && bp.p_value < 1)) throw new Error();
 * ```
 */
export function breuschPagan(
  residuals: Float64Array,
  design: readonly Float64Array[],
  weights: Float64Array | null,
  variant: BreuschPaganVariant = "koenker",
): BreuschPagan | null {
  const n = residuals.length;
  if (design.some((c) => c.length !== n)) {
    throw new RangeError(`Cannot run Breusch–Pagan: design columns are not ${n} rows long`);
  }
  const e2 = residuals.map((e, i) => e * e * (weights ? weights[i] : 1));
  const k = constantColumn(design);
  const cols = k >= 0 ? [...design] : [new Float64Array(n).fill(1), ...design];
  const q = cols.length;
  if (q < 2 || n <= q) return null;
  const rss = e2.reduce((a, b) => a + b, 0);
  if (!(rss > 0)) return null;
  const aux = auxiliaryRegression(cols, e2);
  if (aux === null || !(aux.tss > 0)) return null;
  // original: e²/(RSS/n) has the same R², and its ESS = R²·TSS·(n/RSS)².
  const statistic = variant === "koenker" ? n * aux.r2 : (aux.tss - aux.rss) * (n / rss) ** 2 / 2;
  const df = q - 1;
  const f = (aux.r2 / df) / ((1 - aux.r2) / (n - q));
  return {
    variant,
    statistic,
    df,
    p_value: chiSquared(df).upper(statistic),
    f: Number.isFinite(f) ? f : null,
    f_p_value: Number.isFinite(f) ? fisherF(df, n - q).upper(f) : null,
  };
}
