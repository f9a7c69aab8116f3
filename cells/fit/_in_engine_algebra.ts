/**
 * The small dense algebra of an in-engine fit (cells/fit/_in_engine.ts):
 * Cholesky's factor of a Gram matrix, the inverse of a triangular factor,
 * and Breusch–Pagan's statistic from sums.
 *
 * - Cholesky (kernel/linalg/small_symmetric.ts; Golub & Van Loan, *Matrix
 *   Computations*, 4th ed., §4.2.5) of the terms' block of the augmented
 *   Gram matrix, its last column by forward substitution, so that an exact
 *   fit (ρ = 0) still factors. Only ever applied to the Gram matrix of
 *   centred, power-of-two scaled columns, and only when its condition number
 *   is small (KAPPA_LIMIT).
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
import { cholesky } from "../../kernel/linalg/small_symmetric.ts";
import type { BreuschPagan, BreuschPaganVariant } from "../../kernel/stats/mod.ts";

/**
 * The upper triangular R (RᵀR = G) of an augmented Gram matrix G = [[XᵀX, Xᵀy], [yᵀX, yᵀy]]
 * ((P+1)×(P+1), row-major): Cholesky's factor of XᵀX (kernel/linalg/small_symmetric.ts), its
 * last column r = L⁻¹Xᵀy by forward substitution, and ρ = √(yᵀy − ‖r‖²) (0 for an exact fit;
 * ρ² serves only as a size, the RSS is summed from residuals).
 *
 * @param g The augmented Gram matrix, row-major.
 * @param k Its order, P + 1.
 * @returns R, row-major with zeros below the diagonal (QR's R up to signs); null when XᵀX is
 *   not positive definite.
 * @example
 * ```ts
 * import { augmentedCholesky } from "./_in_engine_algebra.ts";
 * // X = [1, 1]ᵀ, y = [1, 3]ᵀ: XᵀX = 2, Xᵀy = 4, yᵀy = 10; R = [[√2, 2√2], [0, √2]] (hand)
 * const r = augmentedCholesky(new Float64Array([2, 4, 4, 10]), 2)!;
 * if (Math.abs(r[1] - 2 * Math.SQRT2) > 1e-15 || Math.abs(r[3] - Math.SQRT2) > 1e-15) throw new Error();
 * ```
 */
export function augmentedCholesky(g: Float64Array, k: number): Float64Array | null {
  const P = k - 1;
  const a = new Float64Array(P * P);
  for (let i = 0; i < P; i++) for (let j = 0; j < P; j++) a[i * P + j] = g[i * k + j];
  const l = cholesky(a, P);
  if (l === null) return null;
  const r = new Float64Array(k * k);
  let norm = 0;
  for (let i = 0; i < P; i++) {
    for (let j = i; j < P; j++) r[i * k + j] = l[j * P + i];
    let t = g[i * k + P];
    for (let j = 0; j < i; j++) t -= l[i * P + j] * r[j * k + P];
    r[i * k + P] = t / l[i * P + i];
    norm += r[i * k + P] * r[i * k + P];
  }
  r[P * k + P] = Math.sqrt(Math.max(g[P * k + P] - norm, 0));
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
  const l = cholesky(s.cross, q);
  if (l === null) return null;
  // v = L⁻¹g by forward substitution; ESS = ‖v‖².
  const v = new Float64Array(q);
  let ess = 0;
  for (let i = 0; i < q; i++) {
    let t = s.g[i];
    for (let j = 0; j < i; j++) t -= l[i * q + j] * v[j];
    v[i] = t / l[i * q + i];
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
