/**
 * Tests of a fit with known measurement standard deviations (`known_sigma`):
 * nothing is estimated about the scale, so the overall test is a χ² test,
 * not an F test, and the weighted RSS is itself a test statistic.
 *
 * - Wald test of every parameter but the intercept (linear fits with a
 *   constant in the span of the design): W = β̂ₛᵀ·Cov(β̂)ₛₛ⁻¹·β̂ₛ against
 *   χ²(p − 1), Cov = (XᵀWX)⁻¹ not rescaled. For a linear model W equals the
 *   drop in Σwᵢrᵢ² from the intercept-only model (Seber & Lee, *Linear
 *   Regression Analysis*, 2nd ed., §4.3, from memory for the section: the
 *   Wald form of a linear hypothesis equals RSS_H − RSS). So it is computed
 *   without inverting anything as W = Σwᵢ(mᵢ − m̄_w)², mᵢ = Σⱼ Xᵢⱼβ̂ⱼ the
 *   parameter part of the fitted value and m̄_w its weighted mean: the
 *   intercept-only fit is the weighted mean, and with a constant in the span
 *   the weighted residuals sum to 0. This holds for any parametrisation
 *   whose span holds the constant, not only one with a column of ones.
 *   Nonlinear fits get none: with every non-intercept parameter at 0 others
 *   are often unidentified (b of a·exp(−b·x) + c), so the test is not valid.
 * - Goodness of fit: χ² = Σ((yᵢ − ŷᵢ)/σᵢ)² against χ²(n − p), reduced
 *   χ² = χ²/(n − p), p = P(χ²ₙ₋ₚ > χ²) (Bevington & Robinson, *Data
 *   Reduction and Error Analysis for the Physical Sciences*, 3rd ed., §6.4
 *   and §11.1, from memory for the sections; Press et al., *Numerical
 *   Recipes*, 3rd ed., §15.1).
 *
 * @module
 */
import { chiSquared } from "../../kernel/stats/mod.ts";

/** The χ² tests of a known-σ fit; every field null for other fits. */
export interface KnownSigmaTests {
  /** Wald χ² of every parameter but the intercept; null where not given. */
  waldChi2: number | null;
  waldDf: number | null;
  waldPValue: number | null;
  /** Σ((yᵢ − ŷᵢ)/σᵢ)², the weighted RSS. */
  gofChi2: number | null;
  gofDf: number | null;
  gofPValue: number | null;
  /** gofChi2 / gofDf. */
  reducedChi2: number | null;
}

const NONE: KnownSigmaTests = {
  waldChi2: null,
  waldDf: null,
  waldPValue: null,
  gofChi2: null,
  gofDf: null,
  gofPValue: null,
  reducedChi2: null,
};

/**
 * The χ² tests of a fit with known standard deviations.
 *
 * @param fit Weights wᵢ = 1/σᵢ², the weighted RSS, residual df, design
 *   columns (unweighted) and estimates, and whether the Wald test applies
 *   (a linear fit with a constant in the span of its design).
 * @returns The tests; all null when `weights` is null.
 * @example
 * ```ts
 * import { knownSigmaTests } from "./_known_sigma.ts";
 * // Line through (0, 0), (1, 2), (2, 2) with σ = 1: ŷ = 1/3 + x, RSS = 2/3 and
 * // W = b²/Var b = 1²/(1/2) = 2 (hand computation, Var b = 1/Σ(x − x̄)²).
 * const t = knownSigmaTests({
 *   weights: new Float64Array([1, 1, 1]), rss: 2 / 3, df: 1, wald: true,
 *   design: [new Float64Array([1, 1, 1]), new Float64Array([0, 1, 2])],
 *   estimates: new Float64Array([1 / 3, 1]),
 * });
 * if (Math.abs(t.waldChi2! - 2) > 1e-15 || t.waldDf !== 1) throw new Error(String(t.waldChi2));
 * if (Math.abs(t.reducedChi2! - 2 / 3) > 1e-15) throw new Error(String(t.reducedChi2));
 * ```
 */
export function knownSigmaTests(fit: {
  weights: Float64Array | null;
  rss: number;
  df: number;
  wald: boolean;
  design: readonly Float64Array[];
  estimates: Float64Array;
}): KnownSigmaTests {
  const { weights, rss, df, design, estimates } = fit;
  if (weights === null) return NONE;
  const p = estimates.length;
  const gof = df > 0
    ? { gofChi2: rss, gofDf: df, gofPValue: chiSquared(df).upper(rss), reducedChi2: rss / df }
    : { gofChi2: rss, gofDf: df, gofPValue: null, reducedChi2: null };
  if (!fit.wald || p < 2) return { ...NONE, ...gof };
  const w = waldStatistic(weights, design, estimates);
  return {
    waldChi2: w,
    waldDf: p - 1,
    waldPValue: w === null ? null : chiSquared(p - 1).upper(w),
    ...gof,
  };
}

/** Σwᵢ(mᵢ − m̄_w)² with mᵢ = Σⱼ Xᵢⱼβ̂ⱼ (two passes: the weighted mean, then the sum). */
function waldStatistic(
  w: Float64Array,
  design: readonly Float64Array[],
  beta: Float64Array,
): number | null {
  const n = w.length;
  const m = new Float64Array(n);
  design.forEach((col, j) => {
    for (let i = 0; i < n; i++) m[i] += col[i] * beta[j];
  });
  let sw = 0, swm = 0;
  for (let i = 0; i < n; i++) {
    sw += w[i];
    swm += w[i] * m[i];
  }
  const mean = swm / sw;
  let s = 0;
  for (let i = 0; i < n; i++) s += w[i] * (m[i] - mean) * (m[i] - mean);
  return Number.isFinite(s) ? s : null;
}
