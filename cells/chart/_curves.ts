/**
 * Fitted curves and the confidence band of the mean on a grid of x values.
 *
 * Method: the curve is the fitted model f(x; θ̂) evaluated on the grid. The
 * band is the delta method (Draper & Smith, *Applied Regression Analysis*,
 * 3rd ed., §3.2 for the straight line, ch. 24 for nonlinear models; from
 * memory for the sections): with g = ∂f/∂θ at (x, θ̂) and Cov(θ̂) the fit's
 * covariance, se_fit(x) = √(gᵀ Cov(θ̂) g), and the band is
 * f ± q·se_fit with q the t quantile t_{(1+c)/2; n−p} (the normal quantile
 * for fits with known standard deviations). For a linear model g is the
 * design row and this is the exact interval of the mean. A transformed
 * response is back-transformed end by end (monotone steps, `responseInverse`
 * of kernel/expr).
 *
 * @module
 */
import { compile, derivative, type ResponseInverse } from "../../kernel/expr/mod.ts";
import { standardNormal, studentT } from "../../kernel/stats/mod.ts";
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
  const f = compile(fit.model.rhs, fit.model.columns, fit.parameters);
  const v = f(fit.model.columns.map(() => grid), fit.estimates, grid.length);
  return v.map(inverse);
}

/**
 * The half width q·se_fit of the mean's interval on the fitted scale, per grid point.
 *
 * @param fit The fit.
 * @param grid x values.
 * @param confidence Confidence level in (0, 1).
 * @returns Half widths, the quantile used, and whether a held parameter (NaN covariance) was left out.
 */
export function halfWidthOn(
  fit: Fit,
  grid: Float64Array,
  confidence: number,
): { half: Float64Array; q: number; held: boolean } {
  const { model, parameters: names, estimates } = fit;
  const p = names.length, n = grid.length;
  const cols = model.columns.map(() => grid);
  const g = names.map((name) =>
    compile(derivative(model.rhs, name), model.columns, names)(cols, estimates, n)
  );
  const cov = fit.statistics.covariance;
  let held = false;
  const half = new Float64Array(n);
  const s = fit.statistics;
  const ref = s.inference === "normal" ? standardNormal : studentT(s.dfResidual);
  const q = ref.upperQuantile((1 - confidence) / 2);
  for (let i = 0; i < n; i++) {
    let v = 0;
    for (let j = 0; j < p; j++) {
      for (let k = 0; k < p; k++) {
        const c = cov[j + k * p];
        // A parameter held at a bound has NaN covariance: it adds no uncertainty.
        if (Number.isNaN(c)) held = true;
        else v += g[j][i] * c * g[k][i];
      }
    }
    half[i] = q * Math.sqrt(Math.max(v, 0));
  }
  return { half, q, held };
}

/**
 * The confidence band of the mean on the grid, on the response column's scale.
 *
 * @param fit The fit.
 * @param grid x values.
 * @param confidence Confidence level in (0, 1).
 * @param inverse Back-transform of the response.
 * @returns Lower and upper ends, and whether a held parameter was left out.
 */
export function bandOn(
  fit: Fit,
  grid: Float64Array,
  confidence: number,
  inverse: ResponseInverse,
): { lo: Float64Array; hi: Float64Array; held: boolean } {
  const f = compile(fit.model.rhs, fit.model.columns, fit.parameters);
  const mean = f(fit.model.columns.map(() => grid), fit.estimates, grid.length);
  const { half, held } = halfWidthOn(fit, grid, confidence);
  const lo = new Float64Array(grid.length), hi = new Float64Array(grid.length);
  for (let i = 0; i < grid.length; i++) {
    const a = inverse(mean[i] - half[i]), b = inverse(mean[i] + half[i]);
    lo[i] = Math.min(a, b);
    hi[i] = Math.max(a, b);
  }
  return { lo, hi, held };
}
