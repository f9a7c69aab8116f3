/**
 * Nonlinear least squares: Levenberg–Marquardt with a trust region and
 * scaling after MINPACK-1 (Moré, Garbow & Hillstrom 1980, *User Guide for
 * MINPACK-1*, ANL-80-74; Moré 1978, "The Levenberg–Marquardt algorithm:
 * implementation and theory"), a seeded multi-start search, Gauss–Newton
 * polishing on accurate residuals, and (JᵀJ)⁻¹ from the QR of J.
 *
 * ```
 *  modelFunctions(model, data) ─▶ F, J, accurate residuals, linear projection
 *        │
 *  lmder ─ qrfac ─ lmpar ─ qrsolv        (one step: λ for radius Δ)
 *  multiStart ─ Latin hypercube → screen → race short lmder runs → finish best
 *  polish ─ Gauss–Newton on double-double residuals while RSS decreases
 *  covar ─ (JᵀJ)⁻¹ and rank from the equilibrated pivoted QR
 * ```
 *
 * @example
 * ```ts
 * import { lmder } from "./mod.ts";
 * const t = [0, 1, 2], y = [1, 2, 4]; // y = 2^t exactly
 * const r = lmder({
 *   m: 3, n: 1,
 *   fcn: (x, f) => { for (let i = 0; i < 3; i++) f[i] = x[0] ** t[i] - y[i]; },
 *   jac: (x, j) => { for (let i = 0; i < 3; i++) j[i] = t[i] * x[0] ** (t[i] - 1); },
 * }, [1.5]);
 * if (Math.abs(r.x[0] - 2) > 1e-12) throw new Error(String(r.x[0]));
 * ```
 *
 * @module
 */
export { enorm } from "./enorm.ts";
export { type QRFac, qrfac } from "./qrfac.ts";
export { qrsolv } from "./qrsolv.ts";
export { lmpar } from "./lmpar.ts";
export {
  type LeastSquaresProblem,
  lmder,
  LMDER_DEFAULTS,
  type LmderInfo,
  type LmderOptions,
  type LmderResult,
} from "./lmder.ts";
export { covar, type Covariance } from "./covar.ts";
export { polish, type Polished, type PolishProblem } from "./polish.ts";
export { multiStart, type MultiStartOptions, type MultiStartResult } from "./multi_start.ts";
export {
  type ModelData,
  type ModelFunctions,
  modelFunctions,
  type NotFinite,
} from "./model_functions.ts";
