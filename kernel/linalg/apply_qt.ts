/**
 * Applying the orthogonal factor of a packed Householder QR to vectors.
 *
 * Method: LAPACK DORMQR (side = left, unblocked, as DORM2R): Qᵀ·y = H_{k−1}⋯H_1·H_0·y
 * and Q·z = H_0·H_1⋯H_{k−1}·z, each reflector applied without forming Q
 * (Golub & Van Loan, *Matrix Computations*, 4th ed., §5.1.6 and §5.2.2 on
 * factored-form representation).
 *
 * @module
 */
import { applyReflector } from "./_householder.ts";
import { kernelsOf, WASM_FROM } from "./_wasm_vectors.ts";
import type { QRFactorization } from "./householder_qr.ts";

function checkLength(f: QRFactorization, y: ArrayLike<number>, what: string): void {
  if (y.length !== f.m) {
    throw new RangeError(`Cannot apply ${what}: vector has ${y.length} entries, expected ${f.m}`);
  }
}

/**
 * Computes Qᵀ·y (DORMQR 'L', 'T').
 *
 * @param f A factorization from `householderQR`.
 * @param y A vector of length m; not modified.
 * @returns A new vector Qᵀ·y of length m.
 * @throws {RangeError} When `y` is not m long.
 * @example
 * ```ts
 * import { householderQR } from "./householder_qr.ts";
 * import { applyQt } from "./apply_qt.ts";
 * const f = householderQR(new Float64Array([3, 4]), 2, 1);
 * const z = applyQt(f, new Float64Array([3, 4])); // (±5, 0)
 * if (Math.abs(Math.abs(z[0]) - 5) > 1e-15 || Math.abs(z[1]) > 1e-15) throw new Error("unexpected");
 * ```
 */
export function applyQt(f: QRFactorization, y: ArrayLike<number>): Float64Array {
  checkLength(f, y, "Qᵀ");
  return applyQtInPlace(f, copy(y));
}

/**
 * Qᵀ·z in place (DORMQR 'L', 'T'), for callers that reuse one buffer: a
 * fresh million-row array costs more to touch the first time than to
 * transform (measured on this project's machines: about 20 ms per 8 MB).
 *
 * @param f A factorization from `householderQR`.
 * @param z A vector of length m; overwritten by Qᵀ·z.
 * @returns z.
 * @throws {RangeError} When `z` is not m long.
 * @example
 * ```ts
 * import { householderQR } from "./householder_qr.ts";
 * import { applyQtInPlace } from "./apply_qt.ts";
 * const z = new Float64Array([3, 4]);
 * applyQtInPlace(householderQR(new Float64Array([3, 4]), 2, 1), z);
 * if (Math.abs(Math.abs(z[0]) - 5) > 1e-15) throw new Error("unexpected");
 * ```
 */
export function applyQtInPlace(f: QRFactorization, z: Float64Array): Float64Array {
  checkLength(f, z, "Qᵀ");
  const { qr, tau, m } = f;
  const w = beside(f, z);
  for (let i = 0; i < tau.length; i++) applyReflector(qr, i + i * m, tau[i], w, i, m - i);
  if (w !== z) z.set(w);
  return z;
}

function copy(v: ArrayLike<number>): Float64Array {
  return v instanceof Float64Array ? v.slice() : Float64Array.from(v);
}

/**
 * Computes Q·z (DORMQR 'L', 'N').
 *
 * @param f A factorization from `householderQR`.
 * @param z A vector of length m; not modified.
 * @returns A new vector Q·z of length m.
 * @throws {RangeError} When `z` is not m long.
 * @example
 * ```ts
 * import { householderQR } from "./householder_qr.ts";
 * import { applyQ, applyQt } from "./apply_qt.ts";
 * const f = householderQR(new Float64Array([1, 2, 2]), 3, 1);
 * const back = applyQ(f, applyQt(f, [1, 0, 0]));
 * if (Math.abs(back[0] - 1) > 1e-15) throw new Error("Q·Qᵀ should be the identity");
 * ```
 */
export function applyQ(f: QRFactorization, z: ArrayLike<number>): Float64Array {
  checkLength(f, z, "Q");
  return applyQInPlace(f, copy(z));
}

/**
 * Q·y in place (DORMQR 'L', 'N'); see {@link applyQtInPlace}.
 *
 * @param f A factorization from `householderQR`.
 * @param y A vector of length m; overwritten by Q·y.
 * @returns y.
 * @throws {RangeError} When `y` is not m long.
 * @example
 * ```ts
 * import { householderQR } from "./householder_qr.ts";
 * import { applyQInPlace, applyQtInPlace } from "./apply_qt.ts";
 * const f = householderQR(new Float64Array([1, 2, 2]), 3, 1);
 * const v = applyQInPlace(f, applyQtInPlace(f, new Float64Array([1, 0, 0])));
 * if (Math.abs(v[0] - 1) > 1e-15) throw new Error("Q·Qᵀ should be the identity");
 * ```
 */
export function applyQInPlace(f: QRFactorization, y: Float64Array): Float64Array {
  checkLength(f, y, "Q");
  const { qr, tau, m } = f;
  const w = beside(f, y);
  for (let i = tau.length - 1; i >= 0; i--) applyReflector(qr, i + i * m, tau[i], w, i, m - i);
  if (w !== y) y.set(w);
  return y;
}

/**
 * Where to transform a vector: the spare vector of the factor's WebAssembly
 * memory (a copy of `z`, so the reflectors run in its kernels;
 * `_wasm_vectors.ts`), or `z` itself.
 */
function beside(f: QRFactorization, z: Float64Array): Float64Array {
  if (z.buffer === f.qr.buffer || f.m <= WASM_FROM) return z;
  const spare = kernelsOf(f.qr)?.spare;
  if (spare === undefined || spare.length !== f.m) return z;
  spare.set(z);
  return spare;
}
