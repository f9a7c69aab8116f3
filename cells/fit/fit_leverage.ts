/**
 * The leverage of a fit's rows, computed once per fit output: compare (PRESS
 * for the leave-one-out RMSE) and check (studentized residuals, Cook's
 * distance, DFFITS, HC2/HC3) all read the hat values of the same fit, and
 * the worker keeps one fit output per content key, so a WeakMap keyed by
 * that object shares one computation between them.
 *
 * Method: hᵢ = ‖R̃⁻ᵀx̃ᵢ‖², x̃ᵢ row i of √W·X (Belsley, Kuh & Welsch,
 * *Regression Diagnostics* (1980), §2.1: hᵢ is the squared length of row i
 * of Q₁), through the fit's own triangular factor (`fit_factor.ts`): in
 * double-double from the design as printed when the fit was solved in
 * double-double, so that leverages carry the fit's digits. Computed through
 * the columns of Q, as before, they differed from exact rational arithmetic
 * by 2.6e−7 relative on a degree-5 polynomial in raw calendar years
 * (cells/fit/fit_leverage_test.ts); now by less than 1e−13.
 *
 * `fitBasis` (Q₁ itself, for the Durbin–Watson law and compare's nesting
 * checks) is unchanged: a projection needs Q₁, not its row lengths.
 *
 * @module
 */
import { checkDesign } from "../../kernel/stats/leverage.ts";
import { orthonormalBasis } from "../../kernel/stats/_orthonormal_basis.ts";
import { applyQ, inverseGramForms, type QRFactorization } from "../../kernel/linalg/mod.ts";
import type { Fit } from "./fit.ts";
import { fitFactor } from "./fit_factor.ts";

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
 * @returns hᵢ per row, ‖R̃⁻ᵀx̃ᵢ‖² through the fit's own factor (see the module notes).
 * @throws {RangeError} As kernel/stats `hatValues`, for an inconsistent design or weights.
 * @example
 * ```ts
 * import { fitLeverage } from "./fit_leverage.ts";
 * // Straight line through x = 1, 2, 3: h = 5/6, 1/3, 5/6 (hand computation).
 * const fit = { design: [new Float64Array([1, 1, 1]), new Float64Array([1, 2, 3])], weights: null };
 * const h = fitLeverage(fit);
 * if (Math.abs(h[1] - 1 / 3) > 1e-14 || fitLeverage(fit) !== h) throw new Error(String(h));
 * ```
 */
export function fitLeverage(
  fit: Pick<Fit, "design" | "weights" | "designQR" | "atBound">,
): Float64Array {
  let h = remembered.get(fit);
  if (h === undefined) {
    const n = checkDesign(fit.design, fit.weights);
    const factor = fitFactor(fit);
    const dd = fit.designQR?.designDD;
    const rows = factor.rLo !== null && dd !== undefined
      ? dd
      : fit.design.map((hi) => ({ hi, lo: null }));
    const root = fit.weights === null ? null : fit.weights.map(Math.sqrt);
    h = inverseGramForms(factor, rows, n, root);
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
