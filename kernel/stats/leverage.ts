/**
 * Leverage: the diagonal of the hat matrix H = X(XᵀX)⁻¹Xᵀ, and PRESS.
 *
 * Method: Belsley, Kuh & Welsch, *Regression Diagnostics* (1980), §2.1, and
 * Cook & Weisberg, *Residuals and Influence in Regression* (1982), §2.1: with
 * the thin QR factorization X·P = Q₁·R, H = Q₁·Q₁ᵀ, so hᵢ = Σₖ Q₁[i, k]², the
 * squared length of row i of Q₁ = X·P·R⁻¹, i.e. hᵢ = ‖R⁻ᵀ·Pᵀxᵢ‖²: one
 * forward substitution per row through the triangular factor
 * (kernel/linalg `inverseGramForms`), never (XᵀX)⁻¹ formed explicitly.
 * The factorization is Householder QR with column pivoting
 * (kernel/linalg `householderQR`); only its leading `rank` block enters, so
 * an aliased column does not count twice. (`hatValuesOf` still sums the
 * squares of given columns of Q₁, for a caller that has them.)
 *
 * Weighted fits use √W·X (Cook & Weisberg 1982, §2.3 from memory for the
 * section): hᵢ is then the leverage of row i in the weighted problem, and
 * Σhᵢ = p still holds.
 *
 * Columns are scaled to unit length before factoring: H does not change
 * under column scaling, and the rank decision no longer depends on units.
 *
 * PRESS (Allen 1974, "The relationship between variable selection and data
 * augmentation and a method for prediction", Technometrics 16, from memory):
 * the leave-one-out residual of row i is eᵢ/(1 − hᵢ), so
 * PRESS = Σ(eᵢ/(1 − hᵢ))² without refitting; for a weighted fit eᵢ is the
 * weighted residual √wᵢ·eᵢ.
 *
 * @module
 */
import { factorOfQR, householderQR, inverseGramForms } from "../linalg/mod.ts";

/** 1 − h below this counts as a leverage of exactly 1 (common practice, no source). */
export const LEVERAGE_ONE_TOLERANCE = 1e-10;

/**
 * Diagonal of the hat matrix of a (weighted) design.
 *
 * @param design The p design columns (or Jacobian columns of a nonlinear fit at its solution), each n long; not modified.
 * @param weights wᵢ per row (rows are scaled by √wᵢ), or null for an unweighted fit.
 * @returns hᵢ per row, each in [0, 1] up to rounding, summing to the rank of the design.
 * @throws {RangeError} For no columns, columns of unequal length, weights of the wrong length,
 *   a negative or non-finite weight, or a non-finite design entry.
 * @example
 * ```ts
 * import { hatValues } from "./leverage.ts";
 * // Straight line through x = 1, 2, 3: h = 1/n + (x − x̄)²/Sxx = 5/6, 1/3, 5/6 (hand computation).
 * const h = hatValues([new Float64Array([1, 1, 1]), new Float64Array([1, 2, 3])], null);
 * if (Math.abs(h[0] - 5 / 6) > 1e-14 || Math.abs(h[1] - 1 / 3) > 1e-14) throw new Error(String(h));
 * ```
 */
export function hatValues(
  design: readonly Float64Array[],
  weights: Float64Array | null,
): Float64Array {
  const n = checkDesign(design, weights);
  const p = design.length;
  // √W·X with unit-length columns (H does not change with column scales; the rank decision
  // then does not depend on units), factored with pivoting.
  const root = weights === null ? null : weights.map(Math.sqrt);
  const scale = new Float64Array(p), a = new Float64Array(n * p);
  design.forEach((c, j) => {
    let ss = 0;
    for (let i = 0; i < n; i++) {
      a[i + j * n] = root === null ? c[i] : c[i] * root[i];
      ss += a[i + j * n] ** 2;
    }
    const norm = Math.sqrt(ss);
    scale[j] = norm > 0 && Number.isFinite(norm) ? 1 / norm : 1;
    for (let i = 0; i < n; i++) a[i + j * n] *= scale[j];
  });
  const factor = factorOfQR(householderQR(a, n, p), scale);
  return inverseGramForms(factor, design.map((hi) => ({ hi, lo: null })), n, root);
}

/**
 * The hat values from an orthonormal basis Q₁ of the (√w-scaled) design's
 * column space: hᵢ = Σₖ Q₁[i, k]² (as {@link hatValues}, for a caller that
 * keeps the basis, such as one fit's leverage, Durbin–Watson and nesting
 * checks sharing it).
 *
 * @param basis Orthonormal columns (from `orthonormalBasis`).
 * @param n Rows.
 * @returns hᵢ per row.
 * @example
 * ```ts
 * import { hatValuesOf } from "./leverage.ts";
 * const h = hatValuesOf([new Float64Array([0.6, 0.8])], 2);
 * if (Math.abs(h[0] - 0.36) > 1e-15 || Math.abs(h[1] - 0.64) > 1e-15) throw new Error("h");
 * ```
 */
export function hatValuesOf(basis: readonly Float64Array[], n: number): Float64Array {
  const h = new Float64Array(n);
  for (const q of basis) {
    for (let i = 0; i < n; i++) h[i] += q[i] * q[i];
  }
  return h;
}

/**
 * Checks a design and weights as {@link hatValues} does.
 *
 * @param design Columns.
 * @param weights wᵢ per row, or null.
 * @returns The number of rows.
 * @throws {RangeError} For no columns, unequal columns, or a weight not finite and ≥ 0.
 */
export function checkDesign(design: readonly Float64Array[], weights: Float64Array | null): number {
  if (design.length === 0) {
    throw new RangeError("Cannot compute hat values: the design has no columns");
  }
  const n = design[0].length;
  design.forEach((c, j) => {
    if (c.length !== n) {
      throw new RangeError(
        `Cannot compute hat values: column ${j} has ${c.length} rows, expected ${n}`,
      );
    }
  });
  if (weights) {
    if (weights.length !== n) {
      throw new RangeError(
        `Cannot compute hat values: ${weights.length} weights for ${n} rows`,
      );
    }
    weights.forEach((w, i) => {
      if (!(w >= 0) || !Number.isFinite(w)) {
        throw new RangeError(
          `Cannot compute hat values: weight "${w}" in row ${i + 1} is not a finite number ≥ 0`,
        );
      }
    });
  }
  return n;
}

/** PRESS and the leave-one-out root mean square error, or null where a leverage is 1. */
export interface Press {
  /** Σ(eᵢ/(1 − hᵢ))²; null when some hᵢ = 1 (that row's leave-one-out prediction does not exist). */
  press: number | null;
  /** √(PRESS/n); null with `press`. */
  looRmse: number | null;
}

/**
 * The prediction sum of squares from residuals and hat values.
 *
 * @param residuals eᵢ per row (yᵢ − ŷᵢ, unweighted).
 * @param hat hᵢ per row, from {@link hatValues} with the same weights.
 * @param weights wᵢ per row for a weighted fit (eᵢ becomes √wᵢ·eᵢ), or null (the default).
 * @returns PRESS and √(PRESS/n); both null when any 1 − hᵢ < 1e-10.
 * @throws {RangeError} When the lengths differ or there are no rows.
 * @example
 * ```ts
 * import { press } from "./leverage.ts";
 * // e = (1, −2, 1), h = (5/6, 1/3, 5/6): PRESS = 36 + 9 + 36 = 81 (hand computation).
 * const r = press(new Float64Array([1, -2, 1]), new Float64Array([5 / 6, 1 / 3, 5 / 6]));
 * if (Math.abs(r.press! - 81) > 1e-12 || Math.abs(r.looRmse! - Math.sqrt(27)) > 1e-12) throw new Error();
 * ```
 */
export function press(
  residuals: Float64Array,
  hat: Float64Array,
  weights: Float64Array | null = null,
): Press {
  const n = residuals.length;
  if (n === 0) throw new RangeError("Cannot compute PRESS: there are no rows");
  if (hat.length !== n || (weights && weights.length !== n)) {
    throw new RangeError(
      `Cannot compute PRESS: ${n} residuals, ${hat.length} hat values${
        weights ? ` and ${weights.length} weights` : ""
      }`,
    );
  }
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const gap = 1 - hat[i];
    if (gap < LEVERAGE_ONE_TOLERANCE) return { press: null, looRmse: null };
    const e = weights ? Math.sqrt(weights[i]) * residuals[i] : residuals[i];
    sum += (e / gap) ** 2;
  }
  return { press: sum, looRmse: Math.sqrt(sum / n) };
}
