/**
 * The regularised least-squares solve inside the Levenberg–Marquardt step:
 * MINPACK's `qrsolv` (Moré, Garbow & Hillstrom 1980, ANL-80-74; Moré 1978,
 * "The Levenberg–Marquardt algorithm: implementation and theory", Lecture
 * Notes in Mathematics 630, §3). Transcribed step by step, 0-based.
 *
 * Given the QR factorization A·P = Q·R, a diagonal D and Qᵀb, it solves
 *
 * ```
 *   min ‖ [ A ] x − [ b ] ‖
 *       ‖ [ D ]     [ 0 ] ‖
 * ```
 *
 * by eliminating D from [R; Pᵀ D P] with Givens rotations, giving the upper
 * triangular S with Sᵀ S = Pᵀ (AᵀA + D D) P, so no normal equations are formed.
 *
 * @module
 */

/**
 * Solves the damped system; see the module doc.
 *
 * @param n Order of R.
 * @param r R in the upper triangle (leading dimension `ldr`); on return its
 *   strict lower triangle holds the strict upper triangle of S, transposed.
 * @param ldr Leading dimension of `r`.
 * @param ipvt The column permutation P.
 * @param diag The diagonal of D.
 * @param qtb The first n elements of Qᵀb.
 * @param x Out: the solution.
 * @param sdiag Out: the diagonal of S.
 * @param wa Scratch of n values (MINPACK's `wa`; fresh when omitted).
 * @returns Nothing (writes `x`, `sdiag` and the lower triangle of `r`).
 * @example
 * ```ts
 * import { qrsolv } from "./qrsolv.ts";
 * // R = I (2×2), D = 0: x = Qᵀb
 * const r = new Float64Array([1, 0, 0, 1]), x = new Float64Array(2), s = new Float64Array(2);
 * qrsolv(2, r, 2, new Int32Array([0, 1]), new Float64Array(2), new Float64Array([3, 4]), x, s);
 * if (x[0] !== 3 || x[1] !== 4) throw new Error(String(x));
 * ```
 */
export function qrsolv(
  n: number,
  r: Float64Array,
  ldr: number,
  ipvt: Int32Array,
  diag: Float64Array,
  qtb: Float64Array,
  x: Float64Array,
  sdiag: Float64Array,
  wa: Float64Array = new Float64Array(n),
): void {
  // Copy R and Qᵀb to preserve input and initialise S; save R's diagonal in x.
  for (let j = 0; j < n; j++) {
    for (let i = j; i < n; i++) r[i + j * ldr] = r[j + i * ldr];
    x[j] = r[j + j * ldr];
    wa[j] = qtb[j];
  }
  // Eliminate the diagonal matrix D with Givens rotations.
  for (let j = 0; j < n; j++) {
    const l = ipvt[j];
    if (diag[l] !== 0) {
      for (let k = j; k < n; k++) sdiag[k] = 0;
      sdiag[j] = diag[l];
      // The transformations that eliminate row j of D modify only one element of Qᵀb beyond n.
      let qtbpj = 0;
      for (let k = j; k < n; k++) {
        if (sdiag[k] === 0) continue;
        const rkk = r[k + k * ldr];
        let cos: number, sin: number;
        if (Math.abs(rkk) < Math.abs(sdiag[k])) {
          const cotan = rkk / sdiag[k];
          sin = 0.5 / Math.sqrt(0.25 + 0.25 * cotan * cotan);
          cos = sin * cotan;
        } else {
          const tan = sdiag[k] / rkk;
          cos = 0.5 / Math.sqrt(0.25 + 0.25 * tan * tan);
          sin = cos * tan;
        }
        r[k + k * ldr] = cos * rkk + sin * sdiag[k];
        const temp = cos * wa[k] + sin * qtbpj;
        qtbpj = -sin * wa[k] + cos * qtbpj;
        wa[k] = temp;
        for (let i = k + 1; i < n; i++) {
          const rik = r[i + k * ldr];
          const t = cos * rik + sin * sdiag[i];
          sdiag[i] = -sin * rik + cos * sdiag[i];
          r[i + k * ldr] = t;
        }
      }
    }
    // Store the diagonal of S and restore that of R.
    sdiag[j] = r[j + j * ldr];
    r[j + j * ldr] = x[j];
  }
  // Solve the triangular system; if singular, a least-squares solution.
  let nsing = n;
  for (let j = 0; j < n; j++) {
    if (sdiag[j] === 0 && nsing === n) nsing = j;
    if (nsing < n) wa[j] = 0;
  }
  for (let j = nsing - 1; j >= 0; j--) {
    let sum = 0;
    for (let i = j + 1; i < nsing; i++) sum += r[i + j * ldr] * wa[i];
    wa[j] = (wa[j] - sum) / sdiag[j];
  }
  for (let j = 0; j < n; j++) x[ipvt[j]] = wa[j];
}
