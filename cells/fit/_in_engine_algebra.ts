/**
 * The small dense algebra of an in-engine fit (cells/fit/_in_engine.ts):
 * Cholesky's factor of a Gram matrix, the inverse of a triangular factor,
 * and Breusch–Pagan's statistic from sums.
 *
 * - Cholesky: the inner-product form, row by row (Golub & Van Loan,
 *   *Matrix Computations*, 4th ed., §4.2.5, Algorithm 4.2.1 transposed to
 *   give the upper factor R with RᵀR = A). Only ever applied to the
 *   (p+1)×(p+1) Gram matrix of centred, power-of-two scaled columns, and
 *   only when its condition number is small (KAPPA_LIMIT).
 * - R⁻¹ by back substitution column by column (Higham, *Accuracy and
 *   Stability of Numerical Algorithms*, 2nd ed., §8.1: the computed inverse
 *   of a triangular matrix is as accurate as its condition allows).
 * - Breusch–Pagan (kernel/stats/breusch_pagan.ts for the test and its
 *   sources): the auxiliary regression of fᵢ = wᵢeᵢ² on 1 and the varying
 *   terms, from centred sums; ESS = gᵀC⁻¹g summed through C's Cholesky
 *   factor (‖R⁻ᵀg‖², no cancellation), R² = ESS/TSS as the in-memory test
 *   sums it.
 *
 * @module
 */
import { chiSquared, fisherF } from "../../kernel/stats/mod.ts";
import type { BreuschPagan, BreuschPaganVariant } from "../../kernel/stats/mod.ts";

/**
 * The upper Cholesky factor of a symmetric k×k matrix (row-major).
 *
 * @param a The matrix, row-major (only the upper triangle is read).
 * @param k Its order.
 * @param lastMayVanish Accept a last pivot of 0 (an augmented Gram matrix whose response
 *   lies in the span of the terms: an exact fit).
 * @returns R, row-major with zeros below the diagonal; null when a pivot is not positive.
 * @example
 * ```ts
 * import { choleskyUpper } from "./_in_engine_algebra.ts";
 * // [[4, 2], [2, 5]] = RᵀR with R = [[2, 1], [0, 2]] (hand computation)
 * const r = choleskyUpper(new Float64Array([4, 2, 2, 5]), 2)!;
 * if (r[0] !== 2 || r[1] !== 1 || r[3] !== 2) throw new Error(String(r));
 * ```
 */
export function choleskyUpper(
  a: Float64Array,
  k: number,
  lastMayVanish = false,
): Float64Array | null {
  const r = new Float64Array(k * k);
  for (let j = 0; j < k; j++) {
    let s = a[j * k + j];
    for (let i = 0; i < j; i++) s -= r[i * k + j] * r[i * k + j];
    if (!(s > 0) && !(lastMayVanish && j === k - 1 && s >= -Math.abs(a[j * k + j]) * 1e-14)) {
      return null;
    }
    const d = Math.sqrt(Math.max(s, 0));
    r[j * k + j] = d;
    for (let c = j + 1; c < k; c++) {
      let t = a[j * k + c];
      for (let i = 0; i < j; i++) t -= r[i * k + j] * r[i * k + c];
      r[j * k + c] = t / d;
    }
  }
  return r;
}

/**
 * The inverse of the leading m×m block of an upper triangular matrix.
 *
 * @param r Row-major, `stride` columns a row.
 * @param m The block's order.
 * @param stride Columns of `r` a row.
 * @returns R⁻¹ (m×m, row-major, upper triangular).
 * @example
 * ```ts
 * import { invertUpper } from "./_in_engine_algebra.ts";
 * const v = invertUpper(new Float64Array([2, 1, 0, 4]), 2, 2); // [[0.5, -0.125], [0, 0.25]]
 * if (v[0] !== 0.5 || v[1] !== -0.125 || v[3] !== 0.25) throw new Error(String(v));
 * ```
 */
export function invertUpper(r: ArrayLike<number>, m: number, stride: number): Float64Array {
  const v = new Float64Array(m * m);
  for (let j = 0; j < m; j++) {
    v[j * m + j] = 1 / r[j * stride + j];
    for (let i = j - 1; i >= 0; i--) {
      let s = 0;
      for (let t = i + 1; t <= j; t++) s += r[i * stride + t] * v[t * m + j];
      v[i * m + j] = -s / r[i * stride + i];
    }
  }
  return v;
}

/** Centred sums of Breusch–Pagan's auxiliary regression of f = w·e² on 1 and q terms. */
export interface BreuschPaganSums {
  /** Rows. */
  n: number;
  /** Σ(z_a − z̄_a)(z_b − z̄_b), q×q row-major (unweighted). */
  cross: Float64Array;
  /** Σ(z_a − z̄_a)(fᵢ − f̄), q long. */
  g: Float64Array;
  /** Σ(fᵢ − f̄)². */
  tss: number;
  /** Σfᵢ = Σwᵢeᵢ². */
  sumF: number;
  variant: BreuschPaganVariant;
}

/**
 * Breusch–Pagan's statistic from centred sums, as kernel/stats `breuschPagan` computes it from
 * rows: Koenker's n·R², or the original ESS·(n/Σf)²/2, against χ²(q); the auxiliary F with it.
 *
 * @param s The sums.
 * @returns The test; null where the in-memory test gives none (no term, too few rows, every
 *   residual 0, a constant f, or a singular auxiliary design).
 */
export function breuschPaganOfSums(s: BreuschPaganSums): BreuschPagan | null {
  const q = s.g.length, n = s.n;
  if (q < 1 || n <= q + 1 || !(s.sumF > 0) || !(s.tss > 0)) return null;
  const r = choleskyUpper(s.cross, q);
  if (r === null) return null;
  // v = R⁻ᵀg by forward substitution; ESS = ‖v‖².
  const v = new Float64Array(q);
  let ess = 0;
  for (let i = 0; i < q; i++) {
    let t = s.g[i];
    for (let j = 0; j < i; j++) t -= r[j * q + i] * v[j];
    v[i] = t / r[i * q + i];
    ess += v[i] * v[i];
  }
  const r2 = ess / s.tss;
  const statistic = s.variant === "koenker" ? n * r2 : ess * (n / s.sumF) ** 2 / 2;
  const f = (r2 / q) / ((1 - r2) / (n - q - 1));
  return {
    variant: s.variant,
    statistic,
    df: q,
    p_value: chiSquared(q).upper(statistic),
    f: Number.isFinite(f) ? f : null,
    f_p_value: Number.isFinite(f) ? fisherF(q, n - q - 1).upper(f) : null,
  };
}
