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
 * column and the residuals by √wᵢ. Given the fit's own QR of √W·X, only
 * the residuals, ŷ² and ŷ³ are carried through Qᵀ (`_auxiliary.ts`
 * `splitOnBase`).
 *
 * @module
 */
import { fisherF } from "./fisher_f.ts";
import type { QRFactorization } from "../linalg/mod.ts";
import { auxiliaryRegression, scaleRows, type Split, splitOnBase } from "./_auxiliary.ts";

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
 * @param base The fit's own QR of the √w-scaled design (its span is what counts), to regress on
 *   without factoring the design again (`splitOnBase`); null to factor it here.
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
  base: QRFactorization | null = null,
): Reset | null {
  const n = residuals.length;
  const p = design.length;
  const df2 = n - p - 2;
  if (df2 < 1) return null;
  // On the fit's QR the added columns' share is summed directly (RSS₀ − RSS₁ can be a
  // millionth of RSS₁ on a million rows); by the full QR it is RSS₀ − RSS₁, as before.
  const fast = base !== null && base.n === p ? onBase(base, residuals, fitted, weights) : null;
  let rss: number | null, gain: number;
  if (fast !== null) {
    rss = fast.rss;
    gain = fast.explained;
  } else {
    rss = fullRss(residuals, fitted, design, weights);
    let rss0 = 0;
    for (let i = 0; i < n; i++) {
      const v = residuals[i] * (weights ? Math.sqrt(weights[i]) : 1);
      rss0 += v * v;
    }
    gain = rss === null ? NaN : rss0 - rss;
  }
  if (rss === null || !(rss > 0)) return null;
  const f = (gain / 2) / (rss / df2);
  return { f, df1: 2, df2, p_value: fisherF(2, df2).upper(Math.max(0, f)) };
}

/** The RSS of √w·e on √w·[X, ŷ², ŷ³] by a QR of the whole augmented design; null when rank-deficient. */
function fullRss(
  residuals: Float64Array,
  fitted: Float64Array,
  design: readonly Float64Array[],
  weights: Float64Array | null,
): number | null {
  const cols = scaleRows(
    [...design, fitted.map((v) => v * v), fitted.map((v) => v * v * v)],
    weights,
  );
  return auxiliaryRegression(cols, scaleRows([residuals], weights)[0])?.rss ?? null;
}

/** The split of √w·e on √w·[X, ŷ², ŷ³] through the fit's QR of √W·X (`splitOnBase`), or null. */
function onBase(
  base: QRFactorization,
  residuals: Float64Array,
  fitted: Float64Array,
  weights: Float64Array | null,
): Split | null {
  // [ŷ², ŷ³, e], each scaled by √wᵢ: the scratch splitOnBase overwrites.
  const n = residuals.length, work = new Float64Array(3 * n);
  for (let i = 0; i < n; i++) {
    const root = weights ? Math.sqrt(weights[i]) : 1, v = fitted[i];
    work[i] = v * v * root;
    work[n + i] = v * v * v * root;
    work[2 * n + i] = residuals[i] * root;
  }
  return splitOnBase(base, work, 2);
}
