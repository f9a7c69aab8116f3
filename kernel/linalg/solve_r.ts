/**
 * Triangular solves and inverse with the R factor of a packed QR.
 *
 * Method: back substitution (Golub & Van Loan, *Matrix Computations*, 4th ed.,
 * §3.1.2, Algorithm 3.1.2 "column-oriented back substitution"), as LAPACK
 * DTRTRS ('U', 'N', 'N'); the inverse column by column as DTRTRI / DTRTI2
 * (unblocked). Only the leading k×k block R₁₁ is used, so a rank-r
 * factorization can be solved on its well-conditioned part.
 *
 * @module
 */
import type { QRFactorization } from "./householder_qr.ts";

function checkOrder(f: QRFactorization, k: number): void {
  if (!Number.isInteger(k) || k < 1 || k > Math.min(f.m, f.n)) {
    throw new RangeError(`Cannot use a leading block of order "${k}": R is ${f.m}×${f.n}`);
  }
  for (let i = 0; i < k; i++) {
    if (f.qr[i + i * f.m] === 0) {
      throw new RangeError(`Cannot solve with R: diagonal entry ${i} is zero`);
    }
  }
}

/**
 * Solves R₁₁·x = b for the leading k×k block of R (DTRTRS).
 *
 * @param f A factorization from `householderQR`.
 * @param b Right-hand side; its first k entries are used.
 * @param k Order of the block (default `f.rank`).
 * @returns x, k long, in pivoted column order.
 * @throws {RangeError} For a bad order or a zero on the diagonal.
 * @example
 * ```ts
 * import { householderQR } from "./householder_qr.ts";
 * import { solveR } from "./solve_r.ts";
 * const f = householderQR(new Float64Array([2, 0, 0, 3]), 2, 2, { pivot: false });
 * const x = solveR(f, [f.rDiag[0], f.rDiag[1]]);
 * if (Math.abs(x[0] - 1) > 1e-15 || Math.abs(x[1] - 1) > 1e-15) throw new Error("unexpected");
 * ```
 */
export function solveR(f: QRFactorization, b: ArrayLike<number>, k: number = f.rank): Float64Array {
  checkOrder(f, k);
  if (b.length < k) {
    throw new RangeError(`Cannot solve with R: right-hand side has ${b.length} entries, need ${k}`);
  }
  const { qr, m } = f;
  const x = Float64Array.from({ length: k }, (_, i) => b[i]);
  // Column-oriented: once x_j is known, remove its contribution from the rows above.
  for (let j = k - 1; j >= 0; j--) {
    x[j] /= qr[j + j * m];
    const xj = x[j], col = j * m;
    for (let i = 0; i < j; i++) x[i] -= xj * qr[i + col];
  }
  return x;
}

/**
 * Inverts the leading k×k block of R (DTRTRI); the result is upper triangular.
 *
 * @param f A factorization from `householderQR`.
 * @param k Order of the block (default `f.rank`).
 * @returns R₁₁⁻¹ as a column-major k×k array (zeros below the diagonal).
 * @throws {RangeError} For a bad order or a zero on the diagonal.
 * @example
 * ```ts
 * import { householderQR } from "./householder_qr.ts";
 * import { invertR } from "./solve_r.ts";
 * const f = householderQR(new Float64Array([4]), 1, 1);
 * if (Math.abs(invertR(f)[0] * f.rDiag[0] - 1) > 1e-15) throw new Error("unexpected");
 * ```
 */
export function invertR(f: QRFactorization, k: number = f.rank): Float64Array {
  checkOrder(f, k);
  const { qr, m } = f;
  const inv = new Float64Array(k * k);
  // Column j of R⁻¹ solves R·x = e_j; only rows 0..j are non-zero.
  for (let j = 0; j < k; j++) {
    const col = j * k;
    inv[j + col] = 1 / qr[j + j * m];
    for (let i = j - 1; i >= 0; i--) {
      let s = 0;
      for (let l = i + 1; l <= j; l++) s += qr[i + l * m] * inv[l + col];
      inv[i + col] = -s / qr[i + i * m];
    }
  }
  return inv;
}
