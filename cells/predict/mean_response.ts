/**
 * The mean response of a fit at new predictor values, its standard error,
 * and the confidence and prediction intervals there.
 *
 * Method (Draper & Smith, *Applied Regression Analysis*, 3rd ed., §1.4 and
 * §5.3 for the straight line and the matrix form; Seber & Wild, *Nonlinear
 * Regression*, 1989, §5.1 for the linearised nonlinear case; section numbers
 * from memory):
 *
 * - ŷ₀ = f(x₀; θ̂).
 * - se_fit² = g₀ᵀ·Cov(θ̂)·g₀ with g₀ = ∂f/∂θ at (x₀, θ̂), from the symbolic
 *   derivative of the model. For a model linear in θ, g₀ is the design row
 *   x₀ and this is the exact s²·x₀ᵀ(XᵀX)⁻¹x₀; for a nonlinear model it is
 *   the delta method (first-order), so the intervals are approximate.
 *   Cov(θ̂) is the fit's covariance: s²(XᵀWX)⁻¹, or (XᵀWX)⁻¹ unscaled with
 *   known standard deviations. A parameter held at a bound (NaN covariance
 *   row) contributes no variance: it is treated as fixed.
 * - Mean response: ŷ₀ ± q·se_fit. New observation: ŷ₀ ± q·√(se_fit² + s₀²),
 *   where s₀² is the variance of the new observation (see
 *   `interval_settings.ts`).
 * - q = t(1 − α/2; n − p), or the normal quantile z(1 − α/2) when the fit
 *   used known standard deviations.
 *
 * @module
 */
import { compile, derivative, simplify } from "../../kernel/expr/mod.ts";
import type { Fit } from "../fit/mod.ts";

/** f(x; θ̂) and ∂f/∂θ at θ̂ over columns of points (one array per model column). */
export interface ModelAtEstimates {
  /** f at each of the `n` points. */
  value(cols: readonly ArrayLike<number>[], n: number): Float64Array;
  /** ∂f/∂θ_j at each point, one array per parameter. */
  gradient(cols: readonly ArrayLike<number>[], n: number): Float64Array[];
}

/**
 * Compiles a fit's right side and its parameter derivatives, bound to the estimates.
 *
 * @param fit The fit.
 * @returns The model and its gradient at θ̂.
 * @example
 * ```ts
 * import { parseModel } from "../../kernel/expr/mod.ts";
 * import { modelAtEstimates } from "./mean_response.ts";
 * import type { Fit } from "../fit/mod.ts";
 * const model = parseModel("y = a + b*x", ["x", "y"]);
 * const fit = { model, parameters: model.parameters, estimates: Float64Array.of(1, 2) } as Fit;
 * const m = modelAtEstimates(fit);
 * if (m.value([[3]], 1)[0] !== 7) throw new Error("1 + 2·3");
 * if (m.gradient([[3]], 1)[1][0] !== 3) throw new Error("∂f/∂b = x");
 * ```
 */
export function modelAtEstimates(fit: Fit): ModelAtEstimates {
  const { model } = fit;
  const f = compile(model.rhs, model.columns, model.parameters);
  const d = model.parameters.map((q) =>
    compile(simplify(derivative(model.rhs, q)), model.columns, model.parameters)
  );
  return {
    value: (cols, n) => f(cols, fit.estimates, n),
    gradient: (cols, n) => d.map((g) => g(cols, fit.estimates, n)),
  };
}

/** ŷ and se_fit at each point; non-finite where the model or its gradient is not finite. */
export interface MeanResponse {
  estimate: Float64Array;
  seFit: Float64Array;
}

/**
 * Mean response and its standard error at `n` points.
 *
 * @param fit The fit (its covariance is `statistics.covariance`).
 * @param model The compiled model (see {@link modelAtEstimates}).
 * @param cols The points, one array per column of `fit.model.columns`.
 * @param n The number of points.
 * @returns ŷ₀ and √(g₀ᵀ Cov g₀) per point.
 * @example
 * ```ts
 * import { parseModel } from "../../kernel/expr/mod.ts";
 * import { meanResponse, modelAtEstimates } from "./mean_response.ts";
 * import type { Fit } from "../fit/mod.ts";
 * const model = parseModel("y = a + b*x", ["x", "y"]);
 * const fit = {
 *   model, parameters: model.parameters, estimates: Float64Array.of(1, 2),
 *   statistics: { covariance: Float64Array.of(1, 0, 0, 4) },
 * } as unknown as Fit;
 * const r = meanResponse(fit, modelAtEstimates(fit), [[1]], 1);
 * if (r.seFit[0] !== Math.sqrt(5)) throw new Error("1 + 1²·4");
 * ```
 */
export function meanResponse(
  fit: Fit,
  model: ModelAtEstimates,
  cols: readonly ArrayLike<number>[],
  n: number,
): MeanResponse {
  const estimate = model.value(cols, n);
  const g = model.gradient(cols, n);
  const cov = fit.statistics.covariance, p = fit.parameters.length;
  // Held parameters (NaN variance) are fixed: they add nothing to the variance.
  const free = fit.parameters.map((_, j) => Number.isFinite(cov[j + j * p]))
    .map((ok, j) => (ok ? j : -1)).filter((j) => j >= 0);
  const seFit = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let v = 0;
    for (const j of free) {
      let row = 0;
      for (const k of free) row += cov[j + k * p] * g[k][i];
      v += g[j][i] * row;
    }
    // Rounding can leave a tiny negative quadratic form at a point where the variance is ~0.
    seFit[i] = Math.sqrt(Math.max(0, v));
    if (free.some((j) => !Number.isFinite(g[j][i]))) seFit[i] = NaN;
  }
  return { estimate, seFit };
}
