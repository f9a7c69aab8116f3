/**
 * The mean response of a fit at new predictor values, its standard error,
 * and the confidence and prediction intervals there.
 *
 * Method (Draper & Smith, *Applied Regression Analysis*, 3rd ed., §1.4 and
 * §5.3 for the straight line and the matrix form; Seber & Wild, *Nonlinear
 * Regression*, 1989, §5.1 for the linearised nonlinear case; section numbers
 * from memory):
 *
 * - ŷ₀ = f(x₀; θ̂); for a linear fit solved in double-double (or refined),
 *   in double-double from the estimates' ~32 digits (`preciseAt`,
 *   cells/fit/fit_leverage.ts), since a polynomial in raw calendar years sums
 *   terms some 10¹⁰ times larger than ŷ₀.
 * - se_fit² = s²·g₀ᵀ(XᵀWX)⁻¹g₀ with g₀ = ∂f/∂θ at (x₀, θ̂), from the symbolic
 *   derivative of the model (s² = 1 with known standard deviations). For a
 *   model linear in θ, g₀ is the design row x₀ and this is exact; for a
 *   nonlinear model, with X the Jacobian at the solution, it is the delta
 *   method (first-order), so the intervals are approximate. The form is
 *   read through the fit's own triangular factor as ‖R̃⁻ᵀg̃₀‖² in the
 *   solver's scaled, pivoted coordinates (kernel/linalg `inverseGramForms`;
 *   Björck, *Numerical Methods for Least Squares Problems*, 1996, ch. 1–2,
 *   from memory), in double-double when the fit was solved in double-double:
 *   never as g₀ᵀ·Cov·g₀, whose terms of alternating sign gave a standard
 *   error of 0 at x = 1950 (exact 1.6715) and 150.9 at 2025 (exact 9.318)
 *   for a degree-5 polynomial in raw years (mean_response_test.ts). A
 *   parameter held at a bound is left out of the factor: it contributes no
 *   variance, it is treated as fixed.
 * - A robust (sandwich) variance (`interval_settings.ts`) is read through the
 *   same factor: z̃ᵀ·M·z̃ with R̃ᵀz̃ = g̃₀ and M = Σ ωᵢ·zᵢzᵢᵀ the sandwich's
 *   middle in the factor's orthonormal coordinates (kernel/stats
 *   `robustCovarianceOfFactor`), never g₀ᵀ·C·g₀ with the HC covariance C
 *   formed: on the degree-5 polynomial in raw years that lost all digits
 *   (robust_test.ts). A fit without its design (built by hand) uses C.
 * - Mean response: ŷ₀ ± q·se_fit. New observation: ŷ₀ ± q·√(se_fit² + s₀²),
 *   where s₀² is the variance of the new observation (see
 *   `interval_settings.ts`).
 * - q = t(1 − α/2; n − p), or the normal quantile z(1 − α/2) when the fit
 *   used known standard deviations.
 *
 * @module
 */
import { compile, derivative, simplify } from "../../kernel/expr/mod.ts";
import { inverseGramForms } from "../../kernel/linalg/mod.ts";
import type { Fit } from "../fit/mod.ts";
import { fitFactor, preciseAt } from "../fit/mod.ts";

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
 * @param fit The fit (its factor, or its covariance when it has no design).
 * @param model The compiled model (see {@link modelAtEstimates}).
 * @param cols The points, one array per column of `fit.model.columns`.
 * @param n The number of points.
 * @param covariance Optional covariance C of the estimates (p×p,
 *   column-major like `fit.statistics.covariance`), e.g. a
 *   heteroscedasticity-consistent one; the fit's own `statistics.covariance`
 *   (the same array) counts as not given. Used as g₀ᵀ·C·g₀ only when the
 *   fit has no design or no `middle` is given.
 * @param middle The middle of C in the fit factor's coordinates (see the
 *   module notes), with which a given C is read through the factor.
 * @returns ŷ₀ and se_fit per point (NaN where the model or a used
 *   derivative is not finite).
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
 * const hc = meanResponse(fit, modelAtEstimates(fit), [[1]], 1, Float64Array.of(4, 0, 0, 0));
 * if (hc.seFit[0] !== 2) throw new Error("a given covariance: 1·4");
 * ```
 */
export function meanResponse(
  fit: Fit,
  model: ModelAtEstimates,
  cols: readonly ArrayLike<number>[],
  n: number,
  covariance?: Float64Array,
  middle?: Float64Array | null,
): MeanResponse {
  const given = covariance !== undefined && covariance !== fit.statistics.covariance;
  // A fit without its design (built by hand) has only its covariance to offer.
  if ((given && !middle) || fit.design === undefined || fit.design.length === 0) {
    const estimate = model.value(cols, n);
    return {
      estimate,
      seFit: quadraticForm(covariance ?? fit.statistics.covariance, model.gradient(cols, n), n),
    };
  }
  const precise = preciseAt(fit, cols, n);
  const estimate = precise?.estimate ?? model.value(cols, n);
  const g = precise?.gradient ?? model.gradient(cols, n).map((hi) => ({ hi, lo: null }));
  const forms = inverseGramForms(fitFactor(fit), g, n, null, given ? middle! : null);
  const st = fit.statistics;
  const s2 = given || !st.covarianceScaled ? 1 : (st.sigma ?? NaN) ** 2;
  return { estimate, seFit: forms.map((v) => Math.sqrt(s2 * v)) };
}

/** √(gᵀ·C·g) per point over the parameters with a finite variance (held ones add nothing). */
function quadraticForm(cov: Float64Array, g: Float64Array[], n: number): Float64Array {
  const p = g.length;
  const free = g.map((_, j) => j).filter((j) => Number.isFinite(cov[j + j * p]));
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
  return seFit;
}
