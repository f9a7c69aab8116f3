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
 * design. An unweighted fit's own QR of the design is reused when given
 * (`_auxiliary.ts` `splitOnBase`): only e² is carried through Qᵀ, and R² is
 * summed from what the regression explains.
 *
 * On the fitted values ({@link breuschPaganOnFitted}): the auxiliary
 * regression of eᵢ² on 1 and ŷᵢ, df = 1, for models whose design is not a
 * set of predictors: the Jacobian columns of a nonlinear model are
 * derivatives, and a funnel (spread growing with the mean) is what one
 * looks for. This is Cook & Weisberg's score test with the variance a
 * function of the fitted values (1983, "Diagnostics for heteroscedasticity
 * in regression", Biometrika 70:1–10; from memory), the default of common
 * software (R's car::ncvTest; common practice, no source beyond it), here in
 * either form, Koenker's studentized by default.
 *
 * @module
 */
import { chiSquared } from "./chi_squared.ts";
import { fisherF } from "./fisher_f.ts";
import type { QRFactorization } from "../linalg/mod.ts";
import { type Auxiliary, auxiliaryRegression, constantColumn, splitOnBase } from "./_auxiliary.ts";

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
 * @param base The fit's own QR of the design (unweighted fits; its span is what counts), to
 *   regress on without factoring the design again (`splitOnBase`); null to factor it here.
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
  base: QRFactorization | null = null,
): BreuschPagan | null {
  const n = residuals.length;
  if (design.some((c) => c.length !== n)) {
    throw new RangeError(`Cannot run Breusch–Pagan: design columns are not ${n} rows long`);
  }
  const e2 = squaredResiduals(residuals, weights);
  const k = constantColumn(design);
  const cols = k >= 0 ? [...design] : [new Float64Array(n).fill(1), ...design];
  const q = cols.length;
  if (q < 2 || n <= q) return null;
  let rss = 0;
  for (let i = 0; i < n; i++) rss += e2[i];
  if (!(rss > 0)) return null;
  const fast = base === null || weights !== null || base.n !== design.length
    ? null
    : onBase(base, e2, k >= 0 ? null : cols[0]);
  const aux = fast ?? auxiliaryRegression(cols, e2);
  if (aux === null || !(aux.tss > 0)) return null;
  // original: e²/(RSS/n) has the same R², and its ESS = R²·TSS·(n/RSS)².
  const ess = fast?.ess ?? aux.tss - aux.rss;
  const statistic = variant === "koenker" ? n * aux.r2 : ess * (n / rss) ** 2 / 2;
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

/**
 * The auxiliary regression through the fit's own QR of the design (and a
 * constant column when the design has none): e² less its mean goes through
 * Qᵀ (the mean is in the span, so RSS does not change), and what the
 * regression explains is summed directly, ESS = ‖Q₁ᵀ(e² − ē²)‖² (and the
 * constant's share), R² = ESS/TSS: an R² of 1e-5 on a million rows keeps its
 * digits, where 1 − RSS/TSS would cancel them. Null where `splitOnBase`
 * cannot decide.
 */
function onBase(
  base: QRFactorization,
  e2: Float64Array,
  constant: Float64Array | null,
): (Auxiliary & { ess: number }) | null {
  const n = e2.length;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += e2[i];
  mean /= n;
  const work = new Float64Array((constant === null ? 1 : 2) * n), at = constant === null ? 0 : n;
  if (constant !== null) work.set(constant);
  let tss = 0;
  for (let i = 0; i < n; i++) {
    const c = e2[i] - mean;
    work[at + i] = c;
    tss += c * c;
  }
  const split = splitOnBase(base, work, constant === null ? 0 : 1);
  return split && { rss: split.rss, tss, r2: split.explained / tss, ess: split.explained };
}

/** wᵢ·eᵢ² (eᵢ² unweighted). */
function squaredResiduals(residuals: Float64Array, weights: Float64Array | null): Float64Array {
  const out = new Float64Array(residuals.length);
  for (let i = 0; i < out.length; i++) {
    out[i] = residuals[i] * residuals[i] * (weights ? weights[i] : 1);
  }
  return out;
}

/**
 * Breusch–Pagan test of the residuals against the fitted values: eᵢ² (wᵢeᵢ²
 * when weighted) regressed on 1 and ŷᵢ, χ²(1); see the module notes.
 *
 * @param residuals eᵢ per row (unweighted).
 * @param fitted ŷᵢ per row.
 * @param weights wᵢ per row, or null.
 * @param variant "koenker" (default) or "original".
 * @returns As {@link breuschPagan}, df 1; null when ŷ is constant or every residual 0.
 * @throws {RangeError} When the lengths differ.
 * @example
 * ```ts
 * import { breuschPaganOnFitted } from "./breusch_pagan.ts";
 * // e² = 1, 1, 4, 4 against ŷ = 1, 2, 3, 4: R² = 0.8 (Sxy² = 36, Sxx = 5, Syy = 9), n·R² = 3.2.
 * const bp = breuschPaganOnFitted(new Float64Array([1, -1, 2, -2]), new Float64Array([1, 2, 3, 4]), null)!;
 * if (bp.df !== 1 || Math.abs(bp.statistic - 3.2) > 1e-14) throw new Error(String(bp.statistic));
 * ```
 */
export function breuschPaganOnFitted(
  residuals: Float64Array,
  fitted: Float64Array,
  weights: Float64Array | null,
  variant: BreuschPaganVariant = "koenker",
): BreuschPagan | null {
  return breuschPagan(
    residuals,
    [new Float64Array(fitted.length).fill(1), fitted],
    weights,
    variant,
  );
}
