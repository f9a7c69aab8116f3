/**
 * Durbin–Watson statistic for first-order serial correlation of residuals,
 * with its null distribution under the fit's own design: exact by Imhof's
 * integral up to {@link EXACT_DF} residual degrees of freedom
 * (`durbin_watson_exact.ts`), and beyond that the beta distribution with the
 * exact mean and variance (Durbin & Watson 1971, "Testing for serial
 * correlation in least squares regression III", Biometrika 58:1–19, §4),
 * where the exact integral would cost tens of ms a check and the two agree
 * closely.
 *
 * Method: Durbin & Watson (1950, 1951), "Testing for serial correlation in
 * least squares regression" I and II, Biometrika 37:409–428 and 38:159–178:
 * d = Σ(ẽₜ − ẽₜ₋₁)²/Σẽₜ² = ẽᵀAẽ/ẽᵀẽ with A the tridiagonal differencing
 * matrix. Under independent normal errors d is distributed as Σνₖξₖ²/Σξₖ²,
 * νₖ the m = n − p non-zero eigenvalues of MA (M = I − H), so
 *
 *   E(d) = P/m,  Var(d) = 2(mQ − P²)/(m²(m + 2)),  P = tr(MA), Q = tr((MA)²)
 *
 * (the moments of a ratio of quadratic forms independent of its
 * denominator; Durbin & Watson 1950, §3). The traces use an orthonormal basis
 * Q₁ of the design (H = Q₁Q₁ᵀ), never an n×n matrix:
 * tr(MA) = tr(A) − Σₖ qₖᵀAqₖ and tr((MA)²) = tr(A²) − 2Σₖ‖Aqₖ‖² + ‖Q₁ᵀAQ₁‖²_F,
 * with tr(A) = 2(n − 1), tr(A²) = 6n − 8. Both one-sided p-values are
 * given: P(d ≤ observed) against positive serial correlation (drift in
 * measurements taken in sequence) and P(d ≥ observed) against negative
 * correlation (alternation). Rows are taken in the fit's row order; a
 * weighted fit uses √wᵢ·eᵢ and √W·X.
 *
 * @module
 */
import { orthonormalBasis } from "./_orthonormal_basis.ts";
import { regularizedBeta } from "./incomplete_beta.ts";
import { durbinWatsonCdf } from "./durbin_watson_exact.ts";

/** Residual degrees of freedom up to which the distribution is computed exactly (about 12 ms at 2,000). */
export const EXACT_DF = 2000;

/** d with its null moments and both one-sided p-values. */
export interface DurbinWatsonTest {
  statistic: number;
  expected: number;
  variance: number;
  /** (d − E d)/√Var d, a plain measure of how far d lies from its expectation. */
  z: number;
  /** P(d ≤ observed): small when residuals in sequence are alike (positive correlation). */
  p_value: number;
  /** P(d ≥ observed): small when residuals alternate in sign (negative correlation). */
  p_value_negative: number;
  /** How the p-values were found: "exact" (Imhof 1961) or "beta" (Durbin & Watson 1971). */
  distribution: "exact" | "beta";
}

/**
 * The Durbin–Watson statistic in the given order.
 *
 * @param residuals Residuals in row order (at least 2, not all 0).
 * @returns Σ(eₜ − eₜ₋₁)²/Σeₜ², or null when every residual is 0 or there is one row.
 * @example
 * ```ts
 * import { durbinWatson } from "./durbin_watson.ts";
 * // (1, −1, 1, −1): 3·4/4 = 3 (hand computation).
 * if (durbinWatson(new Float64Array([1, -1, 1, -1])) !== 3) throw new Error();
 * ```
 */
export function durbinWatson(residuals: ArrayLike<number>): number | null {
  let num = 0, den = 0;
  for (let t = 0; t < residuals.length; t++) {
    den += residuals[t] * residuals[t];
    if (t > 0) num += (residuals[t] - residuals[t - 1]) ** 2;
  }
  return residuals.length > 1 && den > 0 ? num / den : null;
}

/** A·q for the differencing matrix A = DᵀD. */
function applyDifference(q: Float64Array): Float64Array {
  const n = q.length, out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let v = 0;
    if (i > 0) v += q[i] - q[i - 1];
    if (i < n - 1) v += q[i] - q[i + 1];
    out[i] = v;
  }
  return out;
}

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

/**
 * Durbin–Watson d with its exact null mean and variance for this design and
 * both one-sided p-values from its null distribution.
 *
 * @param residuals eᵢ in row order (unweighted).
 * @param design The model's design (or Jacobian) columns.
 * @param weights wᵢ per row, or null.
 * @param basis An orthonormal basis of the (√w-scaled) design's column space
 *   when the caller has one (`orthonormalBasis(design, weights)`); else made here.
 * @returns The test, or null when d does not exist or n − p < 1.
 * @example
 * ```ts
 * import { durbinWatsonTest } from "./durbin_watson.ts";
 * const one = new Float64Array(6).fill(1);
 * const t = durbinWatsonTest(new Float64Array([1, 1, 1, -1, -1, -1]), [one], null);
 * // d = 4/6; E d = tr(MA)/5 = (10 − 0)/5 = 2 for a mean-only model (hand computation).
 * if (t === null || Math.abs(t.expected - 2) > 1e-14 || !(t.p_value < 0.05)) throw new Error();
 * if (t.distribution !== "exact" || Math.abs(t.p_value + t.p_value_negative - 1) > 1e-12) throw new Error();
 * ```
 */
export function durbinWatsonTest(
  residuals: Float64Array,
  design: readonly Float64Array[],
  weights: Float64Array | null,
  basis?: readonly Float64Array[],
): DurbinWatsonTest | null {
  const n = residuals.length;
  const e = weights ? residuals.map((v, i) => v * Math.sqrt(weights[i])) : residuals;
  const d = durbinWatson(e);
  if (d === null) return null;
  basis ??= orthonormalBasis(design, weights);
  const m = n - basis.length;
  if (m < 1) return null;
  const aq = basis.map(applyDifference);
  let trHA = 0, trHA2 = 0, trHAHA = 0;
  basis.forEach((qk, k) => {
    trHA += dot(qk, aq[k]);
    trHA2 += dot(aq[k], aq[k]);
    basis.forEach((ql) => trHAHA += dot(ql, aq[k]) ** 2);
  });
  const P = 2 * (n - 1) - trHA;
  const Q = 6 * n - 8 - 2 * trHA2 + trHAHA;
  const expected = P / m;
  const variance = 2 * (m * Q - P * P) / (m * m * (m + 2));
  const z = variance > 0 ? (d - expected) / Math.sqrt(variance) : 0;
  const exact = m <= EXACT_DF;
  const below = exact
    ? durbinWatsonCdf(d, basis, n, Q - 2 * d * P + d * d * m)
    : betaCdf(d, expected, variance);
  return {
    statistic: d,
    expected,
    variance,
    z,
    p_value: below,
    p_value_negative: 1 - below,
    distribution: exact ? "exact" : "beta",
  };
}

/** P(d ≤ d₀) for d/4 beta-distributed with d's mean and variance (Durbin & Watson 1971, §4). */
function betaCdf(d0: number, mean: number, variance: number): number {
  const mu = mean / 4, v = variance / 16;
  const common = (mu * (1 - mu)) / v - 1;
  if (!(common > 0)) return d0 < mean ? 0 : 1;
  const x = Math.min(1, Math.max(0, d0 / 4));
  return regularizedBeta(x, mu * common, (1 - mu) * common).lower;
}
