/**
 * A fit's triangular factor and what is read through it, each computed once
 * per fit output (the worker keeps one fit output per content key, so a
 * WeakMap keyed by that object shares the work): compare (PRESS for the
 * leave-one-out RMSE), check (studentized residuals, Cook's distance,
 * DFFITS, HC2/HC3) and predict (prediction variances) read the same fit.
 *
 * Method: every quadratic form gᵀ(XᵀWX)⁻¹g of the fit is ‖R̃⁻ᵀg̃‖², with R̃
 * the triangular factor of √W·X (or √W·J, J the Jacobian at the solution of
 * a nonlinear fit) in the solver's own scaled, pivoted coordinates
 * (kernel/linalg `inverseGramForms`; Björck, *Numerical Methods for Least
 * Squares Problems*, SIAM 1996, ch. 1–2, from memory for the chapters):
 *
 * - the factor (`fitFactor`): linear fits keep the one of the solve that
 *   gave their estimates (`designQR.triangular`), double-double when the fit
 *   was solved in double-double; nonlinear fits, the pivoted Householder QR
 *   of √W·J over the parameters not held at a bound, in double (Seber &
 *   Wild, *Nonlinear Regression*, 1989, §5.1, the linearised variance; from
 *   memory for the section): a held parameter adds nothing to any variance;
 * - leverage (`fitLeverage`): hᵢ = ‖R̃⁻ᵀx̃ᵢ‖², x̃ᵢ row i of √W·X, the squared
 *   length of row i of Q₁ (Belsley, Kuh & Welsch, *Regression Diagnostics*,
 *   1980, §2.1), in double-double from the design as printed when the fit
 *   was solved in double-double. Computed through the columns of Q, as
 *   before, they differed from exact rational arithmetic by 1.8e−7 relative
 *   on a degree-5 polynomial in raw calendar years (fit_leverage_test.ts);
 *   now by less than 1e−13;
 * - the model at new points (`preciseAt`): for a linear fit whose estimates
 *   carry ~32 digits, f(x₀; θ̂) and the design rows in double-double.
 *
 * `fitBasis` (Q₁ itself, for the Durbin–Watson law and compare's nesting
 * checks) is unchanged: a projection needs Q₁, not its row lengths.
 *
 * @module
 */
import { checkDesign } from "../../kernel/stats/leverage.ts";
import { orthonormalBasis } from "../../kernel/stats/_orthonormal_basis.ts";
import {
  type HCType,
  type RobustCovariance,
  robustCovarianceOfFactor,
} from "../../kernel/stats/robust_covariance.ts";
import { compileDD, derivative } from "../../kernel/expr/mod.ts";
import {
  applyQ,
  type DDVector,
  factorOfQR,
  householderQR,
  inverseGramForms,
  type QRFactorization,
  type TriangularFactor,
} from "../../kernel/linalg/mod.ts";
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

/**
 * Whether {@link fitLeverage} already holds this fit's leverages.
 *
 * @param fit The fit output.
 * @returns True when they are remembered.
 */
export function leverageKnown(fit: object): boolean {
  return remembered.has(fit);
}

/**
 * Remembers leverages computed elsewhere in the way {@link fitLeverage} computes them (the same
 * factor and rows: the check forms Q₁'s rows once for Durbin–Watson's traces and the leverages).
 *
 * @param fit The fit output.
 * @param h hᵢ per row.
 */
export function rememberLeverage(fit: object, h: Float64Array): void {
  remembered.set(fit, h);
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

/** The parts of a fit the factor is read from. */
export type FactorSource = Pick<Fit, "design" | "weights" | "designQR" | "atBound">;

const factors = new WeakMap<object, TriangularFactor>();

/**
 * The fit's triangular factor (see the module notes), remembered per fit.
 *
 * @param fit The fit output (design or Jacobian, weights, the solver's factor).
 * @returns R̃ with its pivot order and column scales; its order lists only
 *   the columns it covers (the free parameters, to the numerical rank).
 * @example
 * ```ts
 * import { fitFactor } from "./fit_leverage.ts";
 * import { inverseGramForms } from "../../kernel/linalg/mod.ts";
 * // Straight line through x = 1, 2, 3: leverage of x = 2 is 1/3 (hand computation).
 * const one = new Float64Array([1, 1, 1]), x = new Float64Array([1, 2, 3]);
 * const f = fitFactor({ design: [one, x], weights: null });
 * const h = inverseGramForms(f, [{ hi: [1], lo: null }, { hi: [2], lo: null }], 1);
 * if (Math.abs(h[0] - 1 / 3) > 1e-15) throw new Error(String(h));
 * ```
 */
export function fitFactor(fit: FactorSource): TriangularFactor {
  let f = factors.get(fit);
  if (f === undefined) {
    const own = fit.designQR;
    f = own !== undefined && own.m === fit.design[0]?.length ? own.triangular : factorOf(fit);
    factors.set(fit, f);
  }
  return f;
}

/** The factor of √W·X over the free columns, each scaled by a power of two (as the solver does). */
function factorOf(fit: FactorSource): TriangularFactor {
  const p = fit.design.length, n = fit.design[0].length;
  const free = fit.design.map((_, j) => j).filter((j) => !(fit.atBound?.[j] ?? false));
  const scale = new Float64Array(p).fill(1);
  const a = new Float64Array(n * free.length);
  free.forEach((j, k) => {
    const c = fit.design[j], o = k * n;
    let ss = 0;
    for (let i = 0; i < n; i++) {
      a[o + i] = fit.weights === null ? c[i] : c[i] * Math.sqrt(fit.weights[i]);
      ss += a[o + i] * a[o + i];
    }
    const norm = Math.sqrt(ss);
    if (norm > 0 && Number.isFinite(norm)) scale[j] = 2 ** -(Math.floor(Math.log2(norm)) + 1);
    for (let i = 0; i < n; i++) a[o + i] *= scale[j];
  });
  const local = factorOfQR(
    householderQR(a, n, free.length),
    Float64Array.from(free, (j) => scale[j]),
  );
  // Back to the design's own column numbers.
  return { ...local, order: local.order.map((k) => free[k]), scale };
}

/** The model at points in double-double: ŷ from the estimates' hi + lo, and the design rows. */
export interface PreciseAt {
  estimate: Float64Array;
  gradient: DDVector[];
}

const compiled = new WeakMap<
  object,
  { rhs: ReturnType<typeof compileDD>; terms: ReturnType<typeof compileDD>[] }
>();

/**
 * For a linear fit whose solve gave its estimates to about 32 digits (the
 * double-double or refined paths), the mean response f(x₀; θ̂) and the
 * design rows ∂f/∂θ at the points, in double-double; null for any other fit.
 * The points are taken as exact doubles.
 *
 * @param fit The fit.
 * @param cols The points, one array per column of `fit.model.columns`.
 * @param n The number of points.
 * @returns ŷ₀ rounded to doubles and the rows as hi + lo, or null.
 */
export function preciseAt(
  fit: Pick<Fit, "method" | "model" | "estimates" | "designQR">,
  cols: readonly ArrayLike<number>[],
  n: number,
): PreciseAt | null {
  const lo = fit.designQR?.estimatesLo;
  if (fit.method !== "linear" || lo === undefined) return null;
  const { model } = fit;
  let c = compiled.get(fit);
  if (c === undefined) {
    const at = (e: Parameters<typeof compileDD>[0]) =>
      compileDD(e, model.columns, model.parameters);
    c = { rhs: at(model.rhs), terms: model.parameters.map((q) => at(derivative(model.rhs, q))) };
    compiled.set(fit, c);
  }
  const nulls = cols.map(() => null);
  const zeros = new Float64Array(model.parameters.length);
  const y = c.rhs(cols, nulls, fit.estimates, lo, n);
  return {
    estimate: y.hi.map((h, i) => h + y.lo[i]),
    gradient: c.terms.map((t) => t(cols, nulls, zeros, null, n)),
  };
}

/**
 * The fit's heteroscedasticity-consistent covariance (HC0–HC3) through its
 * own triangular factor (kernel/stats `robustCovarianceOfFactor`): the
 * design as printed in double-double when the fit was solved so, the free
 * parameters only (held ones get NaN rows and columns). Its `middle` gives
 * robust variances of any gᵀθ̂ through the same factor (`inverseGramForms`).
 *
 * @param fit The fit output.
 * @param type The estimator.
 * @returns The covariance, standard errors and the middle.
 */
export function fitRobust(
  fit: FactorSource & Pick<Fit, "residuals">,
  type: HCType,
): RobustCovariance {
  const factor = fitFactor(fit);
  const dd = factor.rLo !== null ? fit.designQR?.designDD : undefined;
  return robustCovarianceOfFactor({
    factor,
    columns: dd ?? fit.design.map((hi) => ({ hi, lo: null })),
    residuals: fit.residuals,
    weights: fit.weights,
    type,
  });
}
