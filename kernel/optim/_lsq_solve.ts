/**
 * Linear least squares for the solver's small internal problems: δ
 * minimising ‖Aδ − b‖ by MINPACK's pivoted QR (`qrfac`) of the column-
 * equilibrated A, with the basic solution when A is rank-deficient (zero
 * columns get δ = 0).
 *
 * @module
 */
import { qrfac, type QRFacWork, qrfacWork } from "./qrfac.ts";

/** Arrays {@link lsqSolve} writes into, for a caller that solves many times. */
export interface LsqWork {
  qr: QRFacWork;
  /** Column norms (n). */
  e: Float64Array;
  /** Qᵀr (m). */
  w: Float64Array;
  /** The solution in pivoted order (n). */
  z: Float64Array;
  /** The solution (n): what lsqSolve returns. */
  delta: Float64Array;
}

/** Fresh arrays for {@link lsqSolve} on m rows and n columns. */
export function lsqWork(m: number, n: number): LsqWork {
  return {
    qr: qrfacWork(n),
    e: new Float64Array(n),
    w: new Float64Array(m),
    z: new Float64Array(n),
    delta: new Float64Array(n),
  };
}

/**
 * δ minimising ‖Aδ − b‖; `a` (m×n, column-major) is overwritten; null if not finite.
 * With `work`, δ is `work.delta` (overwritten by the next call).
 */
export function lsqSolve(
  m: number,
  n: number,
  fjac: Float64Array,
  r: Float64Array,
  work: LsqWork = lsqWork(m, n),
): Float64Array | null {
  // Unit columns first, so that the rank cut does not depend on the parameters' units.
  const { e, w, z, delta } = work;
  for (let j = 0; j < n; j++) {
    let s = 0;
    for (let i = 0; i < m; i++) s += fjac[i + j * m] ** 2;
    e[j] = Math.sqrt(s);
    for (let i = 0; i < m; i++) fjac[i + j * m] = e[j] === 0 ? 0 : fjac[i + j * m] / e[j];
  }
  const { ipvt, rdiag } = qrfac(m, n, fjac, true, work.qr);
  w.set(r);
  // Qᵀr, column by column (the reflectors are stored as in qrfac).
  for (let j = 0; j < n; j++) {
    const cj = j * m, ajj = fjac[j + cj];
    if (ajj === 0) continue;
    let s = 0;
    for (let i = j; i < m; i++) s += fjac[i + cj] * w[i];
    const t = -s / ajj;
    for (let i = j; i < m; i++) w[i] += fjac[i + cj] * t;
  }
  const r0 = Math.abs(rdiag[0]);
  let rank = 0;
  while (rank < n && Math.abs(rdiag[rank]) > 10 * Math.max(m, n) * 2.220446049250313e-16 * r0) {
    rank++;
  }
  z.fill(0);
  for (let j = rank - 1; j >= 0; j--) {
    let s = w[j];
    for (let i = j + 1; i < rank; i++) s -= fjac[j + i * m] * z[i];
    z[j] = s / rdiag[j];
  }
  for (let j = 0; j < n; j++) delta[ipvt[j]] = e[ipvt[j]] === 0 ? 0 : z[j] / e[ipvt[j]];
  return delta.every(Number.isFinite) ? delta : null;
}
