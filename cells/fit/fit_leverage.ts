/**
 * The leverage of a fit's rows, computed once per fit output: compare (PRESS
 * for the leave-one-out RMSE) and check (studentized residuals, Cook's
 * distance) both need the hat values of the same fit, and the worker keeps
 * one fit output per content key, so a WeakMap keyed by that object shares
 * the one Householder QR between them.
 *
 * Method: the hat values themselves are kernel/stats `hatValues` (Belsley,
 * Kuh & Welsch, *Regression Diagnostics* (1980), §2.1, by thin QR); this file
 * only remembers them.
 *
 * @module
 */
import { checkDesign, hatValuesOf } from "../../kernel/stats/leverage.ts";
import { orthonormalBasis } from "../../kernel/stats/_orthonormal_basis.ts";
import { applyQ, type QRFactorization } from "../../kernel/linalg/mod.ts";
import type { Fit } from "./fit.ts";

const remembered = new WeakMap<object, Float64Array>();
const bases = new WeakMap<object, Float64Array[]>();

/**
 * An orthonormal basis Q₁ of a fit's (√w-scaled) design column space,
 * remembered per fit object: its leverage, the Durbin–Watson moments and
 * compare's nesting checks all project onto it (one pivoted Householder QR
 * per fit instead of one for each; for a linear fit, the QR its solver made,
 * `designQR`: column scaling does not change the span). The arrays are
 * shared: do not modify.
 *
 * @param fit The fit output.
 * @returns As kernel/stats `orthonormalBasis(fit.design, fit.weights)`.
 */
export function fitBasis(fit: Pick<Fit, "design" | "weights" | "designQR">): Float64Array[] {
  let q = bases.get(fit);
  if (q === undefined) {
    checkDesign(fit.design, fit.weights);
    const f = fit.designQR;
    q = f !== undefined && f.rank === fit.design.length && f.m === fit.design[0].length
      ? basisOf(f)
      : orthonormalBasis(fit.design, fit.weights);
    bases.set(fit, q);
  }
  return q;
}

/**
 * The hat values hᵢ of a fit's (weighted) design, remembered per fit object.
 * The array is shared: callers must not modify it.
 *
 * @param fit The fit output (its design, or Jacobian at the solution, and weights).
 * @returns hᵢ per row, as `hatValues(fit.design, fit.weights)`.
 * @throws {RangeError} As `hatValues`, for an inconsistent design or weights.
 * @example
 * ```ts
 * import { fitLeverage } from "./fit_leverage.ts";
 * // Straight line through x = 1, 2, 3: h = 5/6, 1/3, 5/6 (hand computation).
 * const fit = { design: [new Float64Array([1, 1, 1]), new Float64Array([1, 2, 3])], weights: null };
 * const h = fitLeverage(fit);
 * if (Math.abs(h[1] - 1 / 3) > 1e-14 || fitLeverage(fit) !== h) throw new Error(String(h));
 * ```
 */
export function fitLeverage(fit: Pick<Fit, "design" | "weights" | "designQR">): Float64Array {
  let h = remembered.get(fit);
  if (h === undefined) {
    const q = fitBasis(fit);
    h = hatValuesOf(q, fit.design[0].length);
    remembered.set(fit, h);
  }
  return h;
}

/** The first `rank` columns of Q, Q·eₖ (Golub & Van Loan, *Matrix Computations*, 4th ed., §5.2). */
function basisOf(f: QRFactorization): Float64Array[] {
  const e = new Float64Array(f.m);
  const out: Float64Array[] = [];
  for (let k = 0; k < f.rank; k++) {
    e.fill(0);
    e[k] = 1;
    out.push(applyQ(f, e));
  }
  return out;
}
