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
 * denominator; Durbin & Watson 1950, §3). Both one-sided p-values are
 * given: P(d ≤ observed) against positive serial correlation (drift in
 * measurements taken in sequence) and P(d ≥ observed) against negative
 * correlation (alternation). Rows are taken in the fit's row order; a
 * weighted fit uses √wᵢ·eᵢ and √W·X.
 *
 * The traces use an orthonormal basis Q₁ of the design (H = Q₁Q₁ᵀ), never
 * an n×n matrix: tr(MA) = tr(A) − tr(HA), tr((MA)²) = tr(A²) − 2·tr(HA²) +
 * tr(HA·HA), with tr(A) = 2(n − 1) and tr(A²) = 6n − 8. With A = DᵀD (D
 * the (n − 1) × n first-difference matrix) the three traces of H are summed
 * in one pass over Q₁'s rows uₜ with O(p²) memory ({@link tracesOfBasis}):
 *
 * ```
 *   G = Q₁ᵀAQ₁ = (DQ₁)ᵀ(DQ₁) = Σₜ δₜδₜᵀ,   δₜ = uₜ₊₁ − uₜ
 *   tr(HA)    = tr G
 *   tr(HA·HA) = ‖G‖²_F
 *   tr(HA²)   = Σₖ‖Aqₖ‖²,   (Aqₖ)[t] = δₜ₋₁,ₖ − δₜ,ₖ   (δ₋₁ = δₙ₋₁ = 0)
 * ```
 *
 * (tr(HA²) = tr(Q₁ᵀA²Q₁) by the cyclic property.) Beyond {@link EXACT_DF}
 * df, where the basis itself is not needed, a caller may give the rows
 * through the fit's factor instead ({@link tracesOfFactor}; 1,000,000 × 11:
 * p n-long columns and O(np²) work saved, issue 16): with X̃·P = Q₁·R̃
 * (X̃ = √W·X·S, kernel/linalg `triangular_factor.ts`), Q₁ = X̃·P·R̃⁻¹, so
 * row i of Q₁ is zᵢ with R̃ᵀzᵢ = Pᵀx̃ᵢ, one forward substitution with R̃ᵀ
 * per row (Golub & Van Loan, *Matrix Computations*, 4th ed., §3.1.1; LAPACK
 * DTRSV 'U', 'T'), O(p²) a row and one p-long scratch vector. ‖zᵢ‖² is the
 * leverage `inverseGramForms` gives. A double-double factor is read through
 * its hi parts.
 *
 * @module
 */
import { orthonormalBasis } from "./_orthonormal_basis.ts";
import { regularizedBeta } from "./incomplete_beta.ts";
import { durbinWatsonCdf } from "./durbin_watson_exact.ts";
import type { TriangularFactor } from "../linalg/mod.ts";

/**
 * What the moments can be read from without the basis: the design's rank and
 * the traces from Q₁'s rows (e.g. {@link tracesOfFactor} through a fit's
 * factor), computed only when asked.
 */
export interface RowTraces {
  rank: number;
  traces(): DesignTraces;
}

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

/**
 * Durbin–Watson d with its exact null mean and variance for this design and
 * both one-sided p-values from its null distribution.
 *
 * @param residuals eᵢ in row order (unweighted).
 * @param design The model's design (or Jacobian) columns.
 * @param weights wᵢ per row, or null.
 * @param basis An orthonormal basis of the (√w-scaled) design's column space
 *   when the caller has one (`orthonormalBasis(design, weights)`), or a function
 *   that makes it when asked; else made here.
 * @param rows The rank and the traces without the basis: used beyond
 *   {@link EXACT_DF} residual df, where the basis is then never made.
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
  basis?: readonly Float64Array[] | (() => readonly Float64Array[]),
  rows?: RowTraces,
): DurbinWatsonTest | null {
  const n = residuals.length;
  const e = weights ? residuals.map((v, i) => v * Math.sqrt(weights[i])) : residuals;
  const d = durbinWatson(e);
  if (d === null) return null;
  let q: readonly Float64Array[] | null = null;
  const made = () =>
    q ??= typeof basis === "function" ? basis() : basis ?? orthonormalBasis(design, weights);
  const m = n - (rows?.rank ?? made().length);
  if (m < 1) return null;
  const exact = m <= EXACT_DF;
  const { trHA, trHA2, trHAHA } = rows !== undefined && !exact
    ? rows.traces()
    : tracesOfBasis(made(), n);
  const P = 2 * (n - 1) - trHA;
  const Q = 6 * n - 8 - 2 * trHA2 + trHAHA;
  const expected = P / m;
  const variance = 2 * (m * Q - P * P) / (m * m * (m + 2));
  const z = variance > 0 ? (d - expected) / Math.sqrt(variance) : 0;
  const below = exact
    ? durbinWatsonCdf(d, made(), n, Q - 2 * d * P + d * d * m)
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

/**
 * P(d ≤ d₀) for d/4 beta-distributed with d's mean and variance (Durbin & Watson 1971, §4).
 *
 * @param d0 The observed d.
 * @param mean E d under the null.
 * @param variance Var d under the null.
 * @returns The lower tail.
 */
export function betaCdf(d0: number, mean: number, variance: number): number {
  const mu = mean / 4, v = variance / 16;
  const common = (mu * (1 - mu)) / v - 1;
  if (!(common > 0)) return d0 < mean ? 0 : 1;
  const x = Math.min(1, Math.max(0, d0 / 4));
  return regularizedBeta(x, mu * common, (1 - mu) * common).lower;
}

/** The three traces. */
export interface DesignTraces {
  /** tr(HA) = Σₖ qₖᵀAqₖ. */
  trHA: number;
  /** tr(HA²) = Σₖ ‖Aqₖ‖². */
  trHA2: number;
  /** tr(HA·HA) = ‖Q₁ᵀAQ₁‖²_F. */
  trHAHA: number;
}

/** Sums rows of Q₁ pushed in order; `done` gives the traces. */
class TraceSums {
  // Plain fields, read into locals once a row (private #fields measured slower in this hot loop).
  readonly g: Float64Array;
  readonly prev: Float64Array;
  readonly delta: Float64Array;
  readonly last: Float64Array;
  rows = 0;
  trHA2 = 0;

  /** @param p The number of basis columns (the length of each row). */
  constructor(readonly p: number) {
    this.g = new Float64Array(p * p);
    this.prev = new Float64Array(p);
    this.delta = new Float64Array(p);
    this.last = new Float64Array(p);
  }

  /** Adds the next row u (p entries; read, not kept). */
  push(u: Float64Array): void {
    const p = this.p, g = this.g, prev = this.prev, delta = this.delta, last = this.last;
    if (this.rows++ > 0) {
      let t = this.trHA2;
      for (let k = 0; k < p; k++) {
        const dk = u[k] - last[k], a = prev[k] - dk; // (Aqₖ) at the row before
        t += a * a;
        delta[k] = dk;
      }
      this.trHA2 = t;
      for (let k = 0; k < p; k++) {
        const c = delta[k], o = k * p;
        for (let l = 0; l <= k; l++) g[o + l] += c * delta[l];
        prev[k] = c;
      }
    }
    for (let k = 0; k < p; k++) last[k] = u[k];
  }

  /** The traces of every row pushed. */
  done(): DesignTraces {
    const p = this.p, g = this.g;
    let trHA2 = this.trHA2;
    for (let k = 0; k < p; k++) trHA2 += this.prev[k] ** 2; // (Aqₖ) at the last row: δₙ₋₂
    let trHA = 0, trHAHA = 0;
    for (let k = 0; k < p; k++) {
      trHA += g[k * p + k];
      trHAHA += g[k * p + k] ** 2;
      for (let l = 0; l < k; l++) trHAHA += 2 * g[k * p + l] ** 2;
    }
    return { trHA, trHA2, trHAHA };
  }
}

/**
 * The traces from basis columns.
 *
 * @param basis Orthonormal columns Q₁, each n long.
 * @param n Rows.
 * @returns The traces.
 * @example
 * ```ts
 * import { tracesOfBasis } from "./durbin_watson.ts";
 * // Mean only, n = 3: q = 1/√3 (1, 1, 1), Aq = 0, so every trace is 0 (hand computation).
 * const t = tracesOfBasis([new Float64Array(3).fill(1 / Math.sqrt(3))], 3);
 * if (Math.abs(t.trHA) + Math.abs(t.trHA2) + Math.abs(t.trHAHA) > 1e-30) throw new Error();
 * ```
 */
export function tracesOfBasis(basis: readonly Float64Array[], n: number): DesignTraces {
  const sums = new TraceSums(basis.length), u = new Float64Array(basis.length);
  for (let t = 0; t < n; t++) {
    for (let k = 0; k < basis.length; k++) u[k] = basis[k][t];
    sums.push(u);
  }
  return sums.done();
}

/**
 * The traces through a fit's factor, Q₁'s rows by forward substitution ({@link qRows}).
 *
 * @param f R̃ of √W·X·S with its pivot order and scales.
 * @param design The design columns it was made from, by its column numbers.
 * @param weights wᵢ per row, or null.
 * @param leverage When given (n long), filled with hᵢ = ‖zᵢ‖² of the same rows: a check needs
 *   both, and forming Q₁'s rows is most of either's cost.
 * @returns The traces for the column space of the columns the factor covers.
 * @example
 * ```ts
 * import { factorOfQR, householderQR } from "../linalg/mod.ts";
 * import { tracesOfBasis, tracesOfFactor } from "./durbin_watson.ts";
 * // Straight line through x = 0, 1, 2: Q₁ = (1, 1, 1)/√3 and (−1, 0, 1)/√2 (hand computation).
 * const one = Float64Array.of(1, 1, 1), x = Float64Array.of(0, 1, 2);
 * const f = factorOfQR(householderQR(Float64Array.of(...one, ...x), 3, 2), Float64Array.of(1, 1));
 * const a = tracesOfFactor(f, [one, x], null);
 * const b = tracesOfBasis([one.map((v) => v / Math.sqrt(3)), Float64Array.of(-1, 0, 1).map((v) => v / Math.SQRT2)], 3);
 * if (Math.abs(a.trHA - b.trHA) + Math.abs(a.trHA2 - b.trHA2) + Math.abs(a.trHAHA - b.trHAHA) > 1e-14) throw new Error();
 * ```
 */
export function tracesOfFactor(
  f: TriangularFactor,
  design: readonly Float64Array[],
  weights: Float64Array | null,
  leverage?: Float64Array,
): DesignTraces {
  const n = design[0].length, sums = new TraceSums(f.p);
  let root: Float64Array | null = null;
  if (weights !== null) {
    root = new Float64Array(n);
    for (let i = 0; i < n; i++) root[i] = Math.sqrt(weights[i]);
  }
  if (leverage === undefined) qRows(f, design, n, root, (_, z) => sums.push(z));
  else {
    // hᵢ = ‖zᵢ‖², summed as kernel/linalg's inverseGramForms sums it (the same bits).
    const p = f.p;
    qRows(f, design, n, root, (i, z) => {
      let ss = 0;
      for (let k = 0; k < p; k++) ss += z[k] * z[k];
      leverage[i] = ss;
      sums.push(z);
    });
  }
  return sums.done();
}

/**
 * Calls `visit(i, z)` with row i of Q₁ for i = 0 … count − 1, in order.
 *
 * @param f The factor.
 * @param columns The design columns (by the design's own numbers; columns outside `f.order`
 *   are not read), at least `count` long.
 * @param count Rows.
 * @param rowScale √wᵢ per row for a weighted fit, or null.
 * @param visit Reads z (f.p entries, in pivot order); the array is reused for the next row.
 * @throws {RangeError} When a used column is shorter than `count`.
 */
function qRows(
  f: TriangularFactor,
  columns: readonly ArrayLike<number>[],
  count: number,
  rowScale: ArrayLike<number> | null,
  visit: (i: number, z: Float64Array) => void,
): void {
  const { p, r, order, scale } = f;
  const cols = Array.from(order, (j) => columns[j]);
  cols.forEach((c, k) => {
    if (c === undefined || c.length < count) {
      throw new RangeError(
        `Cannot form the rows of Q: column ${order[k]} has fewer than ${count} entries`,
      );
    }
  });
  const s = Array.from(order, (j) => scale[j]);
  const z = new Float64Array(p);
  for (let i = 0; i < count; i++) {
    const wi = rowScale === null ? 1 : rowScale[i];
    for (let k = 0; k < p; k++) {
      let v = cols[k][i] * wi * s[k];
      for (let l = 0; l < k; l++) v -= r[l + k * p] * z[l];
      z[k] = v / r[k + k * p];
    }
    visit(i, z);
  }
}
