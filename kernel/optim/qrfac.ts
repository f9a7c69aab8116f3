/**
 * Householder QR with column pivoting of an m×n matrix in place: MINPACK's
 * `qrfac` (Moré, Garbow & Hillstrom 1980, *User Guide for MINPACK-1*,
 * ANL-80-74, transcribed step by step; column-major, 0-based).
 *
 * On return the upper triangle of `a`'s first n rows holds R except its
 * diagonal (in `rdiag`), and the lower trapezoid holds the Householder
 * vectors u_j scaled so that Q_j = I − u_j u_jᵀ / u_j[j]. Column norms are
 * downdated as in LINPACK's `dqrdc`, recomputed when cancellation is likely.
 *
 * ```
 *   a (m×n, column-major)        after qrfac
 *   ┌ x x x ┐                 ┌ u . R R ┐   R's diagonal in rdiag
 *   │ x x x │                 │ u u . R │   u = Householder vectors
 *   │ x x x │      ──▶        │ u u u   │   column j of R is column
 *   └ x x x ┘                 └ u u u   ┘   ipvt[j] of the original
 * ```
 *
 * @module
 */
import { enorm } from "./enorm.ts";

const EPSMCH = 2.220446049250313e-16;

/** The factorization's by-products. */
export interface QRFac {
  /** Column j of R corresponds to column `ipvt[j]` of the input. */
  ipvt: Int32Array;
  /** The diagonal of R. */
  rdiag: Float64Array;
  /** Norms of the input's columns. */
  acnorm: Float64Array;
}

/** Arrays of n values for {@link qrfac} to write into, as MINPACK's caller passes them. */
export interface QRFacWork extends QRFac {
  /** Scratch (MINPACK's `wa`). */
  wa: Float64Array;
}

/**
 * Arrays for {@link qrfac} on n columns, for a caller that factors many times
 * (allocating a typed array costs about as much as a Householder step on 100 rows).
 *
 * @param n Columns.
 * @returns Fresh arrays.
 */
export function qrfacWork(n: number): QRFacWork {
  return {
    ipvt: new Int32Array(n),
    rdiag: new Float64Array(n),
    acnorm: new Float64Array(n),
    wa: new Float64Array(n),
  };
}

/**
 * Factors `a` (m×n, m ≥ n, column-major, leading dimension m) in place.
 *
 * @param m Rows.
 * @param n Columns.
 * @param a The matrix; overwritten (see the module doc).
 * @param pivot Whether to pivot columns by largest remaining norm.
 * @param work Arrays to write into (from {@link qrfacWork}); fresh ones when omitted.
 * @returns Pivots, R's diagonal and the original column norms (`work`'s arrays when given).
 * @example
 * ```ts
 * import { qrfac } from "./qrfac.ts";
 * const a = new Float64Array([3, 4, 0, 0, 0, 2]); // columns (3,4,0), (0,0,2)
 * const { ipvt, rdiag } = qrfac(3, 2, a, true);
 * if (ipvt[0] !== 0 || Math.abs(Math.abs(rdiag[0]) - 5) > 1e-15) throw new Error("pivot");
 * ```
 */
export function qrfac(
  m: number,
  n: number,
  a: Float64Array,
  pivot: boolean,
  work: QRFacWork = qrfacWork(n),
): QRFac {
  const { ipvt, rdiag, acnorm, wa } = work;
  for (let j = 0; j < n; j++) {
    acnorm[j] = enorm(a, j * m, j * m + m);
    rdiag[j] = acnorm[j];
    wa[j] = rdiag[j];
    ipvt[j] = j;
  }
  const minmn = Math.min(m, n);
  for (let j = 0; j < minmn; j++) {
    const cj = j * m;
    if (pivot) {
      let kmax = j;
      for (let k = j; k < n; k++) if (rdiag[k] > rdiag[kmax]) kmax = k;
      if (kmax !== j) {
        const ck = kmax * m;
        for (let i = 0; i < m; i++) {
          const t = a[i + cj];
          a[i + cj] = a[i + ck];
          a[i + ck] = t;
        }
        rdiag[kmax] = rdiag[j];
        wa[kmax] = wa[j];
        const k = ipvt[j];
        ipvt[j] = ipvt[kmax];
        ipvt[kmax] = k;
      }
    }
    // The Householder transformation that reduces column j to a multiple of e_j.
    let ajnorm = enorm(a, cj + j, cj + m);
    if (ajnorm !== 0) {
      if (a[j + cj] < 0) ajnorm = -ajnorm;
      for (let i = j; i < m; i++) a[i + cj] /= ajnorm;
      a[j + cj] += 1;
      // Apply it to the remaining columns and update their norms.
      for (let k = j + 1; k < n; k++) {
        const ck = k * m;
        let sum = 0;
        for (let i = j; i < m; i++) sum += a[i + cj] * a[i + ck];
        const temp = sum / a[j + cj];
        for (let i = j; i < m; i++) a[i + ck] -= temp * a[i + cj];
        if (pivot && rdiag[k] !== 0) {
          const t = a[j + ck] / rdiag[k];
          rdiag[k] *= Math.sqrt(Math.max(0, 1 - t * t));
          const r = rdiag[k] / wa[k];
          if (0.05 * r * r <= EPSMCH) {
            rdiag[k] = enorm(a, ck + j + 1, ck + m);
            wa[k] = rdiag[k];
          }
        }
      }
    }
    rdiag[j] = -ajnorm;
  }
  return work;
}
