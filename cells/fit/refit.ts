/**
 * Refitting a fit on a subset of its rows (cross-validation folds), with
 * the same model, weights and solver, starting from the full-data estimates.
 *
 * ```
 *  Fit + row subset ──refitProblem──▶ FitProblem ──┬─ solveLinear    (method "linear")
 *                                                  └─ solveNonlinear (method "nonlinear",
 *                                                     start = full-data estimates)
 * ```
 *
 * The problem carries no decimal corrections (the Fit keeps none), so a
 * nonlinear refit polishes on double residuals, and no `within` ranges (the
 * Fit keeps none either): a refit may leave a range the full fit kept.
 *
 * @module
 */
import type { Fit } from "./fit.ts";
import type { FitProblem, FitSolution } from "./problem.ts";
import { solveLinear } from "./solve_linear.ts";
import { solveNonlinear } from "./solve_nonlinear.ts";

/**
 * The problem of `fit` restricted to some of its rows.
 *
 * @param fit The full fit.
 * @param keep Indexes (0-based, into the fit's rows used) of the rows to keep.
 * @param seed Seed for a multi-start search, should one be needed.
 * @returns The problem; start values are the fit's estimates.
 * @throws {RangeError} For an index outside the fit's rows.
 * @example
 * ```ts
 * import { parseModel } from "../../kernel/expr/mod.ts";
 * import { refitProblem } from "./refit.ts";
 * import type { Fit } from "./fit.ts";
 * const fit = { model: parseModel("y = a + b*x", ["x", "y"]), parameters: ["a", "b"],
 *   estimates: Float64Array.from([1, 2]), columns: [Float64Array.from([0, 1, 2])],
 *   y: Float64Array.from([1, 3, 5]), rows: Int32Array.from([4, 5, 6]), weights: null } as unknown as Fit;
 * const p = refitProblem(fit, [0, 2]);
 * if (p.n !== 2 || p.rows[1] !== 6 || p.start.b !== 2) throw new Error(JSON.stringify(p));
 * ```
 */
export function refitProblem(fit: Fit, keep: ArrayLike<number>, seed = 1): FitProblem {
  const n = fit.y.length;
  const idx = Array.from(keep);
  for (const i of idx) {
    if (!Number.isInteger(i) || i < 0 || i >= n) {
      throw new RangeError(`Cannot refit: row index "${i}" is outside 0…${n - 1}`);
    }
  }
  const pick = (v: Float64Array) => Float64Array.from(idx, (i) => v[i]);
  const start: Record<string, number> = {};
  fit.parameters.forEach((p, j) => (start[p] = fit.estimates[j]));
  return {
    name: fit.model.text,
    model: fit.model,
    n: idx.length,
    columns: fit.columns.map(pick),
    y: pick(fit.y),
    rows: Int32Array.from(idx, (i) => fit.rows[i]),
    start,
    seed,
    weights: fit.weights === null ? null : pick(fit.weights),
  };
}

/**
 * Refits `fit` on some of its rows with the solver it was fitted with.
 *
 * @param fit The full fit.
 * @param keep Indexes (0-based) of the rows to keep.
 * @param seed Seed for a multi-start search, should one be needed.
 * @returns The solution on those rows.
 * @throws {CellError} When the solver fails on the subset (aliased terms,
 *   no convergence), as the solvers do.
 * @throws {RangeError} For an index outside the fit's rows.
 */
export function refit(fit: Fit, keep: ArrayLike<number>, seed = 1): FitSolution {
  const problem = refitProblem(fit, keep, seed);
  return fit.method === "linear" ? solveLinear(problem) : solveNonlinear(problem);
}
