/**
 * The cross-product matrix a subset search sweeps: the predictors and the
 * response centred (with an intercept) and scaled to unit length, so the
 * matrix is their correlation matrix, and one elimination step on it.
 *
 * Accuracy, in the order the steps are taken:
 *
 * - means by the corrected two-pass algorithm (Chan, Golub & LeVeque 1983,
 *   "Algorithms for computing the sample variance", Am. Statistician 37;
 *   from memory): the plain mean, then corrected by the mean of the
 *   deviations; an offset such as a year (2024 ± 3) then costs no digits;
 * - the deviations of each column scaled by a power of two near 1/max|x − x̄|
 *   (exact), so no product overflows or underflows whatever the units;
 * - sums of products over blocks of {@link BLOCK} rows, the blocks' sums
 *   added to the totals: rounding grows with BLOCK + n/BLOCK rather than n
 *   (a two-level form of pairwise summation; Higham, *Accuracy and
 *   Stability of Numerical Algorithms*, 2nd ed., §4.2, from memory);
 * - the totals divided by the column lengths, so every diagonal entry is 1
 *   and a pivot reads directly as the share of a column that the columns
 *   swept before it leave unexplained (1/VIF).
 *
 * Without an intercept nothing is centred: the matrix holds uncentred
 * cross-products scaled to unit diagonal.
 *
 * A cross-product matrix squares the condition of the design, so the sweeps
 * built on it rank subsets; the numbers a search reports for the models it
 * keeps come from a QR fit of each (`exact_fit.ts`).
 *
 * Layout: m×m row-major, only the upper triangle (i ≤ j) is kept current.
 *
 * @module
 */

/** Rows summed together before a block's sums join the totals. */
export const BLOCK = 256;

/** The scaled cross-products of some columns. */
export interface CrossProducts {
  /** Order of the matrix (the number of columns). */
  m: number;
  /** m×m row-major; the upper triangle holds Σ zᵢzⱼ/(‖zᵢ‖‖zⱼ‖), z the (centred) columns. */
  a: Float64Array;
  /** ‖zⱼ‖²: the (centred) sum of squares of each column; 0 for a constant column. */
  sumOfSquares: Float64Array;
}

/**
 * The correlation-scale cross-products of `columns`.
 *
 * @param columns The columns, each n long, all finite.
 * @param centred Whether to centre them (a model with an intercept).
 * @returns The matrix and each column's sum of squares. A column with no
 *   spread keeps a zero row and column (its pivot then fails).
 * @example
 * ```ts
 * import { crossProducts } from "./cross_products.ts";
 * // x = 1, 2, 3 and y = 2, 4, 7: r = 5/√(2·12.667) = 0.99339… (hand computation).
 * const c = crossProducts([Float64Array.of(1, 2, 3), Float64Array.of(2, 4, 7)], true);
 * if (Math.abs(c.a[1] - 5 / Math.sqrt(2 * 38 / 3)) > 1e-15 || c.a[0] !== 1) throw new Error(String(c.a));
 * ```
 */
export function crossProducts(columns: readonly Float64Array[], centred: boolean): CrossProducts {
  const m = columns.length, n = m === 0 ? 0 : columns[0].length;
  const mean = new Float64Array(m), unit = new Float64Array(m);
  columns.forEach((x, j) => {
    mean[j] = centred ? correctedMean(x) : 0;
    let big = 0;
    for (let i = 0; i < n; i++) big = Math.max(big, Math.abs(x[i] - mean[j]));
    unit[j] = big > 0 ? 2 ** -Math.ceil(Math.log2(big)) : 1;
  });
  const a = new Float64Array(m * m), z = new Float64Array(m * BLOCK);
  for (let start = 0; start < n; start += BLOCK) {
    const len = Math.min(BLOCK, n - start);
    for (let j = 0; j < m; j++) {
      const x = columns[j], mj = mean[j], uj = unit[j], off = j * BLOCK;
      for (let t = 0; t < len; t++) z[off + t] = (x[start + t] - mj) * uj;
    }
    for (let i = 0; i < m; i++) {
      for (let j = i; j < m; j++) {
        let s = 0;
        for (let t = 0, oi = i * BLOCK, oj = j * BLOCK; t < len; t++) s += z[oi + t] * z[oj + t];
        a[i * m + j] += s;
      }
    }
  }
  const sumOfSquares = new Float64Array(m), norm = new Float64Array(m);
  for (let j = 0; j < m; j++) {
    sumOfSquares[j] = a[j * m + j] / (unit[j] * unit[j]);
    norm[j] = Math.sqrt(a[j * m + j]);
  }
  for (let i = 0; i < m; i++) {
    for (let j = i; j < m; j++) {
      a[i * m + j] = norm[i] > 0 && norm[j] > 0 ? a[i * m + j] / norm[i] / norm[j] : 0;
    }
    if (norm[i] > 0) a[i * m + i] = 1;
  }
  return { m, a, sumOfSquares };
}

/** The mean, corrected by the mean of the deviations from it. */
function correctedMean(x: Float64Array): number {
  const n = x.length;
  let s = 0;
  for (let i = 0; i < n; i++) s += x[i];
  const first = s / n;
  let d = 0;
  for (let i = 0; i < n; i++) d += x[i] - first;
  return first + d / n;
}

/**
 * One sweep step restricted to what later steps read: pivot `l` of `a`
 * eliminated from the trailing block, B[i][j] = A[i][j] − A[l][i]·A[l][j]/A[l][l]
 * for l < i ≤ j < m (upper triangles). This is the Schur complement, the
 * sweep operator's update of the unswept block (Goodnight 1979, "A tutorial
 * on the SWEEP operator", Am. Statistician 33, §3); the swept row and column
 * are not needed by a search and are not written. `b` may be `a` (in place).
 *
 * @param a The matrix (m×m row-major, upper triangle).
 * @param b Where the trailing block is written (may be `a`).
 * @param m Order.
 * @param l The pivot; A[l][l] must be positive.
 * @example
 * ```ts
 * import { eliminate } from "./cross_products.ts";
 * // [[1, 0.5], [0.5, 1]]: after pivot 0 the second diagonal is 1 − 0.25 (exact).
 * const a = Float64Array.of(1, 0.5, 0.5, 1);
 * eliminate(a, a, 2, 0);
 * if (a[3] !== 0.75) throw new Error(String(a));
 * ```
 */
export function eliminate(a: Float64Array, b: Float64Array, m: number, l: number): void {
  const rowL = l * m, inv = 1 / a[rowL + l];
  for (let i = l + 1; i < m; i++) {
    const r = a[rowL + i] * inv, row = i * m;
    for (let j = i; j < m; j++) b[row + j] = a[row + j] - r * a[rowL + j];
  }
}
