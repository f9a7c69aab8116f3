/**
 * Householder QR factorization with column pivoting, A·P = Q·R.
 *
 * Method: Golub & Van Loan, *Matrix Computations*, 4th ed., §5.2.1 (Householder
 * QR) and §5.4.1 (QR with column pivoting, Businger & Golub 1965), in the form
 * of LAPACK's DGEQP3 / DLAQP2 (unblocked): at step k the remaining column of
 * largest partial norm is swapped into place, reflected onto e_k, and the
 * partial norms of the other columns are downdated.
 *
 * Norm downdating uses the LAPACK ≥ 3.1 safeguard (Drmač & Bujanović 2008,
 * "On the failure of rank-revealing QR factorization software – a case
 * study", ACM TOMS 35(2), from memory): a downdated norm is recomputed from
 * the column when the cancellation estimate temp·(vn1/vn2)² falls below
 * √eps, where vn2 is the norm at the last recomputation.
 *
 * Numerical rank: the number of leading k with |R_kk| > tol·|R_00|,
 * tol = max(m, n)·eps by default (the usual LAPACK-style threshold, GVL
 * §5.4.1 "numerical rank"; common practice, no source for the exact factor).
 * With pivoting |R_kk| is non-increasing, so this is a clean cut.
 *
 * @module
 */
import { applyReflector, columnNorm, makeReflector, swapColumns } from "./_householder.ts";

/** A packed Householder QR factorization of an m×n matrix A with A·P = Q·R. */
export interface QRFactorization {
  /**
   * m×n column-major: R on and above the diagonal; below the diagonal of
   * column k, the Householder vector v_k (its leading 1 implied), as DGEQP3.
   */
  qr: Float64Array;
  /** Reflector scalars, min(m, n) long: H_k = I − tau[k]·v_k·v_kᵀ, Q = H_0·H_1⋯. */
  tau: Float64Array;
  /** perm[k] = the original index of the column at position k (P's columns). */
  perm: Int32Array;
  /** Numerical rank (see the module notes). */
  rank: number;
  m: number;
  n: number;
  /** The diagonal of R, min(m, n) long. */
  rDiag: Float64Array;
  /** The relative tolerance used for the rank. */
  tol: number;
}

/** Options of {@link householderQR}. */
export interface QROptions {
  /** Column pivoting (default true). Without it, `rank` only counts large diagonal entries. */
  pivot?: boolean;
  /** Relative rank tolerance (default max(m, n)·eps). */
  tol?: number;
}

/**
 * Factors a column-major m×n matrix as A·P = Q·R with Householder reflections
 * and (by default) column pivoting.
 *
 * @param a Column-major m×n entries; copied, never modified.
 * @param m Number of rows.
 * @param n Number of columns.
 * @param opts Pivoting and rank tolerance.
 * @returns The packed factorization with permutation, rank and diag(R).
 * @throws {RangeError} For an empty matrix, a size mismatch or a non-finite entry.
 * @example
 * ```ts
 * import { householderQR } from "./householder_qr.ts";
 * // columns (1, 1, 1) and (1, 2, 3): full rank 2, the longer column first
 * const f = householderQR(new Float64Array([1, 1, 1, 1, 2, 3]), 3, 2);
 * if (f.rank !== 2 || f.perm[0] !== 1) throw new Error("unexpected");
 * ```
 */
export function householderQR(
  a: Float64Array,
  m: number,
  n: number,
  opts: QROptions = {},
): QRFactorization {
  if (a.length !== m * n) checkInput(a, m, n);
  return factorInPlace(a.slice(), m, n, opts);
}

/**
 * {@link householderQR} without the copy: overwrites `a` with the packed
 * factors (for callers that own a scratch matrix, such as `leastSquares` on a
 * million rows). No input checks beyond the sizes.
 *
 * @param a Column-major m×n entries; overwritten, becomes the result's `qr`.
 * @param m Number of rows.
 * @param n Number of columns.
 * @param opts Pivoting and rank tolerance.
 * @returns The packed factorization, sharing `a`.
 * @throws {RangeError} For an empty matrix, a size mismatch or a non-finite entry.
 * @example
 * ```ts
 * import { factorInPlace } from "./householder_qr.ts";
 * const a = new Float64Array([3, 4]);
 * const f = factorInPlace(a, 2, 1);
 * if (f.qr !== a || Math.abs(Math.abs(a[0]) - 5) > 1e-15) throw new Error("unexpected");
 * ```
 */
export function factorInPlace(
  qr: Float64Array,
  m: number,
  n: number,
  opts: QROptions = {},
): QRFactorization {
  checkInput(qr, m, n);
  const k = Math.min(m, n);
  const tau = new Float64Array(k);
  const perm = Int32Array.from({ length: n }, (_, j) => j);
  const pivot = opts.pivot ?? true;
  const vn1 = new Float64Array(n), vn2 = new Float64Array(n);
  for (let j = 0; j < n; j++) vn1[j] = vn2[j] = columnNorm(qr, j * m, m);
  for (let i = 0; i < k; i++) {
    if (pivot) pivotStep(qr, m, n, i, perm, vn1, vn2);
    tau[i] = makeReflector(qr, i + i * m, m - i);
    for (let j = i + 1; j < n; j++) applyReflector(qr, i + i * m, tau[i], qr, i + j * m, m - i);
    if (pivot) downdateNorms(qr, m, n, i, vn1, vn2);
  }
  const rDiag = new Float64Array(k);
  for (let i = 0; i < k; i++) rDiag[i] = qr[i + i * m];
  const tol = opts.tol ?? Math.max(m, n) * Number.EPSILON;
  return { qr, tau, perm, rank: numericalRank(rDiag, tol, pivot), m, n, rDiag, tol };
}

function checkInput(a: Float64Array, m: number, n: number): void {
  if (!Number.isInteger(m) || !Number.isInteger(n) || m < 0 || n < 0) {
    throw new RangeError(`Cannot factor a matrix of size "${m}×${n}": sizes must be whole numbers`);
  }
  if (m === 0 || n === 0) {
    throw new RangeError(`Cannot factor an empty matrix: size ${m}×${n}`);
  }
  if (a.length !== m * n) {
    throw new RangeError(
      `Cannot factor a ${m}×${n} matrix: expected ${m * n} entries, got ${a.length}`,
    );
  }
  for (let idx = 0; idx < a.length; idx++) {
    if (!Number.isFinite(a[idx])) {
      const i = idx % m, j = (idx - i) / m;
      throw new RangeError(
        `Cannot factor a matrix with entry (${i}, ${j}) = "${a[idx]}": entries must be finite`,
      );
    }
  }
}

/** DGEQP3 pivot choice: the remaining column of largest partial norm goes to position i. */
function pivotStep(
  qr: Float64Array,
  m: number,
  n: number,
  i: number,
  perm: Int32Array,
  vn1: Float64Array,
  vn2: Float64Array,
): void {
  let p = i;
  for (let j = i + 1; j < n; j++) if (vn1[j] > vn1[p]) p = j;
  if (p === i) return;
  swapColumns(qr, m, i, p);
  [perm[i], perm[p]] = [perm[p], perm[i]];
  vn1[p] = vn1[i];
  vn2[p] = vn2[i];
}

const TOL3Z = Math.sqrt(Number.EPSILON);

/** DLAQP2's update of partial column norms after step i, with recomputation when cancellation looms. */
function downdateNorms(
  qr: Float64Array,
  m: number,
  n: number,
  i: number,
  vn1: Float64Array,
  vn2: Float64Array,
): void {
  for (let j = i + 1; j < n; j++) {
    if (vn1[j] === 0) continue;
    const ratio = Math.abs(qr[i + j * m]) / vn1[j];
    const temp = Math.max(0, 1 - ratio * ratio);
    const temp2 = temp * (vn1[j] / vn2[j]) * (vn1[j] / vn2[j]);
    if (temp2 <= TOL3Z) {
      vn1[j] = vn2[j] = i + 1 < m ? columnNorm(qr, i + 1 + j * m, m - i - 1) : 0;
    } else {
      vn1[j] *= Math.sqrt(temp);
    }
  }
}

/** Leading count of |R_kk| > tol·|R_00| (pivoted), or the count of such entries (unpivoted). */
function numericalRank(rDiag: Float64Array, tol: number, pivoted: boolean): number {
  let big = 0;
  for (const d of rDiag) big = Math.max(big, Math.abs(d));
  if (pivoted) big = Math.abs(rDiag[0]);
  if (big === 0) return 0;
  let r = 0;
  for (let k = 0; k < rDiag.length; k++) {
    if (Math.abs(rDiag[k]) > tol * big) r++;
    else if (pivoted) break;
  }
  return r;
}
