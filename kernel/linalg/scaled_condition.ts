/**
 * The scaled condition number of a design: σ_max/σ_min after every column is
 * scaled to unit Euclidean length, the collinearity measure of Belsley, Kuh &
 * Welsch (1980), *Regression Diagnostics*, ch. 3 (their condition indexes;
 * the largest is this number). Unlike the raw condition number it does not
 * change with the units of the columns.
 *
 * It is read off the R factor of a pivoted QR already computed: Q is
 * orthogonal, so column j of R has the length of column j of the design, and
 * R·D⁻¹ (D the column lengths) has the singular values of the unit-length
 * design. Only a p×p problem is left, whatever the number of rows.
 *
 * @module
 */
import type { QRFactorization } from "./householder_qr.ts";
import { singularValues } from "./singular_values.ts";

/**
 * σ_max/σ_min of the design with unit-length columns, from its QR factorization.
 *
 * @param f A QR factorization of the design (any column scaling: it cancels).
 * @returns The scaled condition number (≥ 1); Infinity for a rank-deficient
 *   design; NaN when the singular values do not converge.
 * @example
 * ```ts
 * import { householderQR } from "./householder_qr.ts";
 * import { scaledConditionNumber } from "./scaled_condition.ts";
 * // Orthogonal columns of any lengths have scaled condition number 1.
 * const f = householderQR(new Float64Array([1, 0, 0, 0, 500, 0]), 3, 2);
 * if (Math.abs(scaledConditionNumber(f) - 1) > 1e-12) throw new Error();
 * ```
 */
export function scaledConditionNumber(f: QRFactorization): number {
  const { m, n, qr } = f;
  if (n === 0) return 1;
  if (f.rank < n) return Infinity;
  const r = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    let norm = 0;
    for (let i = 0; i <= j; i++) norm += qr[i + j * m] ** 2;
    norm = Math.sqrt(norm);
    for (let i = 0; i <= j; i++) r[i + j * n] = qr[i + j * m] / norm;
  }
  try {
    const s = singularValues(r, n, n);
    return s[0] / s[n - 1];
  } catch {
    return NaN;
  }
}
