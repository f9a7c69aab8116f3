/**
 * The rows of Q₁ of a least-squares factor, one at a time, without forming
 * Q₁: for a reader that needs each row's vector, not only its length (the
 * Durbin–Watson moments read the differences of neighbouring rows).
 *
 * Method: with X̃·P = Q₁·R̃ (X̃ = √W·X·S, see `triangular_factor.ts`),
 * Q₁ = X̃·P·R̃⁻¹, so row i of Q₁ is zᵢ with R̃ᵀzᵢ = Pᵀx̃ᵢ: one forward
 * substitution with R̃ᵀ per row (Golub & Van Loan, *Matrix Computations*,
 * 4th ed., §3.1.1; LAPACK DTRSV 'U', 'T'), O(p²) a row and one p-long
 * scratch vector, against O(np²) work and p n-long columns to form Q₁ by
 * applying the Householder reflections to unit vectors. ‖zᵢ‖² is the
 * leverage `inverseGramForms` gives. A double-double factor is read through
 * its hi parts.
 *
 * @module
 */
import type { TriangularFactor } from "./triangular_factor.ts";

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
 * @example
 * ```ts
 * import { householderQR } from "./householder_qr.ts";
 * import { factorOfQR } from "./triangular_factor.ts";
 * import { qRows } from "./q_rows.ts";
 * // Straight line through x = 1, 2, 3: ‖zᵢ‖² = h = 5/6, 1/3, 5/6 (hand computation).
 * const one = Float64Array.of(1, 1, 1), x = Float64Array.of(1, 2, 3);
 * const f = factorOfQR(householderQR(Float64Array.of(...one, ...x), 3, 2), Float64Array.of(1, 1));
 * const h: number[] = [];
 * qRows(f, [one, x], 3, null, (_, z) => h.push(z[0] ** 2 + z[1] ** 2));
 * if (Math.abs(h[1] - 1 / 3) > 1e-14 || Math.abs(h[2] - 5 / 6) > 1e-14) throw new Error(String(h));
 * ```
 */
export function qRows(
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
