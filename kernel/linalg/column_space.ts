/**
 * Membership of a vector in the column space of a factored matrix.
 *
 * Method: with A·P = Q·R of rank r, the component of v outside range(A) is
 * (Qᵀv)_{r..m−1} (Golub & Van Loan, *Matrix Computations*, 4th ed., §5.2.1 and
 * §5.4.1: the last m − r columns of Q span range(A)^⊥). Used, for instance, to
 * ask whether a design contains a constant (an intercept) in its span.
 *
 * @module
 */
import { applyQt } from "./apply_qt.ts";
import type { QRFactorization } from "./householder_qr.ts";

/**
 * Whether `v` lies in the column space of the factored matrix, to a relative
 * tolerance.
 *
 * @param f A factorization from `householderQR`.
 * @param v A vector of length m.
 * @param tol Relative tolerance on ‖v − proj(v)‖/‖v‖ (default √eps; common practice, no source).
 * @returns True when the part of `v` outside range(A) is at most tol·‖v‖ (true for v = 0).
 * @throws {RangeError} When `v` is not m long.
 * @example
 * ```ts
 * import { householderQR } from "./householder_qr.ts";
 * import { inColumnSpace } from "./column_space.ts";
 * // columns x and 1 − x span the constants
 * const f = householderQR(new Float64Array([0, 1, 2, 1, 0, -1]), 3, 2);
 * if (!inColumnSpace(f, [1, 1, 1])) throw new Error("the constants should be in the span");
 * ```
 */
export function inColumnSpace(
  f: QRFactorization,
  v: ArrayLike<number>,
  tol: number = Math.sqrt(Number.EPSILON),
): boolean {
  const z = applyQt(f, v);
  let out = 0, all = 0;
  for (let i = 0; i < z.length; i++) {
    all += z[i] * z[i];
    if (i >= f.rank) out += z[i] * z[i];
  }
  return Math.sqrt(out) <= tol * Math.sqrt(all);
}
