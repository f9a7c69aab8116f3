/**
 * Fitted curves on a grid of x values, and what every band is built from.
 *
 * Method: the curve is the fitted model f(x; θ̂) evaluated on the grid. The
 * standard error of the fitted mean is the delta method's (Draper & Smith,
 * *Applied Regression Analysis*, 3rd ed., §3.2 for the straight line, ch. 24
 * for nonlinear models; from memory for the sections): with g = ∂f/∂θ at
 * (x, θ̂) from the expression's exact derivatives and Cov(θ̂) the fit's
 * covariance, se_fit(x) = √(gᵀ Cov(θ̂) g). For a linear model g is the
 * design row and f ± t·se_fit is the exact interval of the mean. The
 * multipliers and the band of a new observation are `_bands.ts`'s. A
 * transformed response is back-transformed end by end (monotone steps,
 * `responseInverse` of kernel/expr).
 *
 * @module
 */
import { compile, derivative, type ResponseInverse } from "../../kernel/expr/mod.ts";
import type { Fit } from "../fit/fit.ts";

/**
 * `n` x values from `lo` to `hi`, equally spaced (in log space when `log`).
 *
 * @param lo First value.
 * @param hi Last value.
 * @param n Number of values, at least 2.
 * @param log Space the values equally in log x (lo and hi positive).
 * @returns The grid.
 */
export function gridOver(lo: number, hi: number, n: number, log: boolean): Float64Array {
  const g = new Float64Array(n);
  const a = log ? Math.log(lo) : lo, b = log ? Math.log(hi) : hi;
  for (let i = 0; i < n; i++) {
    const t = a + (b - a) * (i / (n - 1));
    g[i] = log ? Math.exp(t) : t;
  }
  g[0] = lo;
  g[n - 1] = hi;
  return g;
}

/**
 * A one-predictor fit's curve on the grid, on the scale of the response column.
 *
 * @param fit The fit (its model has at most one column).
 * @param grid x values.
 * @param inverse Back-transform of the response.
 * @returns f(x; θ̂) back-transformed, NaN where undefined.
 */
export function curveOn(fit: Fit, grid: Float64Array, inverse: ResponseInverse): Float64Array {
  return meanOn(fit, grid).map(inverse);
}

/**
 * A one-predictor fit's mean on the grid, on the fitted (possibly transformed) scale.
 *
 * @param fit The fit.
 * @param grid x values.
 * @returns f(x; θ̂), NaN where undefined.
 */
export function meanOn(fit: Fit, grid: Float64Array): Float64Array {
  const f = compile(fit.model.rhs, fit.model.columns, fit.parameters);
  return f(fit.model.columns.map(() => grid), fit.estimates, grid.length);
}

/** The delta method's standard error of the fitted mean on a grid. */
export interface SeFit {
  /** se_fit(x) = √(gᵀ Cov(θ̂) g) per grid point, on the fitted scale. */
  se: Float64Array;
  /** g_j(x) = ∂f/∂θ_j at θ̂, one array per parameter. */
  gradient: Float64Array[];
  /** Whether a parameter held at a bound (NaN covariance) was left out. */
  held: boolean;
  /** Parameters with a finite variance: the dimension of the band's direction space. */
  free: number;
}

/**
 * se_fit on the grid by the delta method, with exact derivatives of the model.
 *
 * @param fit The fit.
 * @param grid x values.
 * @returns The standard errors, the gradients, and what was left out.
 */
export function seFitOn(fit: Fit, grid: Float64Array): SeFit {
  const { model, parameters: names, estimates } = fit;
  const p = names.length, n = grid.length;
  const cols = model.columns.map(() => grid);
  const gradient = names.map((name) =>
    compile(derivative(model.rhs, name), model.columns, names)(cols, estimates, n)
  );
  const cov = fit.statistics.covariance;
  let held = false, free = 0;
  for (let j = 0; j < p; j++) if (Number.isFinite(cov[j + j * p])) free++;
  const se = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let v = 0;
    for (let j = 0; j < p; j++) {
      for (let k = 0; k < p; k++) {
        const c = cov[j + k * p];
        // A parameter held at a bound has NaN covariance: it adds no uncertainty.
        if (Number.isNaN(c)) held = true;
        else v += gradient[j][i] * c * gradient[k][i];
      }
    }
    se[i] = Math.sqrt(Math.max(v, 0));
  }
  return { se, gradient, held, free };
}

/**
 * A band's ends on the response column's scale: mean ± half, each end back-transformed.
 *
 * @param mean The fitted mean on the fitted scale.
 * @param half Half widths on the fitted scale (NaN: no band there).
 * @param inverse Back-transform of the response.
 * @returns Lower and upper ends (a decreasing inverse swaps them back).
 */
export function bandEnds(
  mean: Float64Array,
  half: Float64Array,
  inverse: ResponseInverse,
): { lo: Float64Array; hi: Float64Array } {
  const lo = new Float64Array(mean.length), hi = new Float64Array(mean.length);
  for (let i = 0; i < mean.length; i++) {
    const a = inverse(mean[i] - half[i]), b = inverse(mean[i] + half[i]);
    lo[i] = Math.min(a, b);
    hi[i] = Math.max(a, b);
  }
  return { lo, hi };
}
