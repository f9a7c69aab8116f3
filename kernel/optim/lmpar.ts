/**
 * The Levenberg–Marquardt parameter for a trust region: MINPACK's `lmpar`
 * (Moré, Garbow & Hillstrom 1980, ANL-80-74), the Hebden–Moré iteration of
 * Moré 1978, "The Levenberg–Marquardt algorithm: implementation and theory",
 * Lecture Notes in Mathematics 630, §5. Transcribed step by step, 0-based.
 *
 * Given A·P = Q·R, a positive diagonal D, Qᵀb and a radius Δ > 0, it finds
 * λ ≥ 0 such that x, the least-squares solution of [A; √λ·D]·x ≈ [b; 0]
 * (solved by `qrsolv`, so (AᵀA + λDᵀD)x = Aᵀb without forming AᵀA),
 * satisfies either λ = 0 and ‖Dx‖ ≤ 1.1Δ, or λ > 0 and |‖Dx‖ − Δ| ≤ 0.1Δ. At most 10 iterations, as
 * in MINPACK; the safeguarded bounds [parl, paru] keep them convergent.
 *
 * @module
 */
import { enorm } from "./enorm.ts";
import { qrsolv } from "./qrsolv.ts";

const DWARF = 2.2250738585072014e-308;

/**
 * Computes λ (returned) and the step `x` (the minimiser of ‖Ax − b‖² + λ‖Dx‖²
 * with the sign MINPACK uses: the caller negates it).
 *
 * @param n Order of R.
 * @param r R in the upper triangle (leading dimension `ldr`); the strict lower
 *   triangle is overwritten by `qrsolv`.
 * @param ldr Leading dimension of `r`.
 * @param ipvt The column permutation.
 * @param diag D's diagonal (positive).
 * @param qtb First n elements of Qᵀb.
 * @param delta The trust-region radius Δ.
 * @param par0 A starting estimate of λ.
 * @param x Out: the step.
 * @param sdiag Out: diagonal of S (see `qrsolv`).
 * @param wa1 Scratch of n values (MINPACK's `wa1`; fresh when omitted).
 * @param wa2 Scratch of n values (MINPACK's `wa2`).
 * @param wa3 Scratch of n values for `qrsolv` (its `wa`).
 * @returns The Levenberg–Marquardt parameter λ.
 * @example
 * ```ts
 * import { lmpar } from "./lmpar.ts";
 * // R = I, b = (3, 4): the Gauss–Newton step has length 5; with Δ = 10 it is taken (λ = 0).
 * const x = new Float64Array(2), s = new Float64Array(2);
 * const par = lmpar(2, new Float64Array([1, 0, 0, 1]), 2, new Int32Array([0, 1]),
 *   new Float64Array([1, 1]), new Float64Array([3, 4]), 10, 0, x, s);
 * if (par !== 0 || x[0] !== 3) throw new Error(String(par));
 * ```
 */
export function lmpar(
  n: number,
  r: Float64Array,
  ldr: number,
  ipvt: Int32Array,
  diag: Float64Array,
  qtb: Float64Array,
  delta: number,
  par0: number,
  x: Float64Array,
  sdiag: Float64Array,
  wa1: Float64Array = new Float64Array(n),
  wa2: Float64Array = new Float64Array(n),
  wa3: Float64Array = new Float64Array(n),
): number {
  const R = (i: number, j: number) => r[i + j * ldr];
  // The Gauss–Newton direction; a least-squares solution if R is singular.
  let nsing = n;
  for (let j = 0; j < n; j++) {
    wa1[j] = qtb[j];
    if (R(j, j) === 0 && nsing === n) nsing = j;
    if (nsing < n) wa1[j] = 0;
  }
  for (let j = nsing - 1; j >= 0; j--) {
    wa1[j] /= R(j, j);
    const temp = wa1[j];
    for (let i = 0; i < j; i++) wa1[i] -= R(i, j) * temp;
  }
  for (let j = 0; j < n; j++) x[ipvt[j]] = wa1[j];
  // Accept λ = 0 when the Gauss–Newton step is inside 1.1Δ.
  for (let j = 0; j < n; j++) wa2[j] = diag[j] * x[j];
  let dxnorm = enorm(wa2);
  let fp = dxnorm - delta;
  if (fp <= 0.1 * delta) return 0;
  // Lower bound parl from the Newton step (zero when the Jacobian is rank-deficient).
  let parl = 0;
  if (nsing >= n) {
    for (let j = 0; j < n; j++) {
      const l = ipvt[j];
      wa1[j] = diag[l] * (wa2[l] / dxnorm);
    }
    for (let j = 0; j < n; j++) {
      let sum = 0;
      for (let i = 0; i < j; i++) sum += R(i, j) * wa1[i];
      wa1[j] = (wa1[j] - sum) / R(j, j);
    }
    const temp = enorm(wa1);
    parl = fp / delta / temp / temp;
  }
  // Upper bound paru.
  for (let j = 0; j < n; j++) {
    let sum = 0;
    for (let i = 0; i <= j; i++) sum += R(i, j) * qtb[i];
    wa1[j] = sum / diag[ipvt[j]];
  }
  const gnorm = enorm(wa1);
  let paru = gnorm / delta;
  if (paru === 0) paru = DWARF / Math.min(delta, 0.1);
  // Start inside [parl, paru].
  let par = Math.min(Math.max(par0, parl), paru);
  if (par === 0) par = gnorm / dxnorm;
  for (let iter = 1;; iter++) {
    if (par === 0) par = Math.max(DWARF, 0.001 * paru);
    const temp = Math.sqrt(par);
    for (let j = 0; j < n; j++) wa1[j] = temp * diag[j];
    qrsolv(n, r, ldr, ipvt, wa1, qtb, x, sdiag, wa3);
    for (let j = 0; j < n; j++) wa2[j] = diag[j] * x[j];
    dxnorm = enorm(wa2);
    const fpOld = fp;
    fp = dxnorm - delta;
    // Done when ‖Dx‖ is within 10% of Δ, or parl = 0 and the function is increasing, or 10 iterations.
    if (Math.abs(fp) <= 0.1 * delta || (parl === 0 && fp <= fpOld && fpOld < 0) || iter === 10) {
      return par;
    }
    // Newton's correction, through Sᵀ (stored transposed in r's lower triangle).
    for (let j = 0; j < n; j++) {
      const l = ipvt[j];
      wa1[j] = diag[l] * (wa2[l] / dxnorm);
    }
    for (let j = 0; j < n; j++) {
      wa1[j] /= sdiag[j];
      const t = wa1[j];
      for (let i = j + 1; i < n; i++) wa1[i] -= R(i, j) * t;
    }
    const t = enorm(wa1);
    const parc = fp / delta / t / t;
    if (fp > 0) parl = Math.max(parl, par);
    if (fp < 0) paru = Math.min(paru, par);
    par = Math.max(parl, par + parc);
  }
}
