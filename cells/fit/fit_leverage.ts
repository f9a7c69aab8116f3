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
import { hatValues } from "../../kernel/stats/leverage.ts";
import type { Fit } from "./fit.ts";

const remembered = new WeakMap<object, Float64Array>();

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
export function fitLeverage(fit: Pick<Fit, "design" | "weights">): Float64Array {
  let h = remembered.get(fit);
  if (h === undefined) {
    h = hatValues(fit.design, fit.weights);
    remembered.set(fit, h);
  }
  return h;
}
