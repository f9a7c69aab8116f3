/**
 * The slot for nonlinear least squares.
 *
 * The numerical core will fill this with damped Gauss–Newton
 * (Levenberg–Marquardt with a trust region and scaling; Moré 1978, "The
 * Levenberg–Marquardt algorithm: implementation and theory") using exact
 * derivatives of the model (`derivative` in kernel/expr) and `problem.start`.
 * It must return a {@link FitSolution} with `method: "nonlinear"`, the
 * unscaled covariance (JᵀJ)⁻¹ at the solution, `converged`, `iterations`,
 * and the Jacobian columns as `design`; every statistic is then derived by
 * the cell exactly as for linear fits.
 *
 * Until then a nonlinear model is refused, naming the parameters it is
 * nonlinear in.
 *
 * @module
 */
import { derivative, freeNames } from "../../kernel/expr/mod.ts";
import { CellError } from "../../kernel/errors.ts";
import { quotedList } from "../../kernel/linalg/mod.ts";
import type { FitProblem, FitSolution } from "./problem.ts";
import { identifierOffset } from "./_offsets.ts";

/**
 * Fits a model that is nonlinear in its parameters (not available yet).
 *
 * @param problem The rows used, the transformed response, the model and start values.
 * @returns Never, for now.
 * @throws {CellError} Always, at the model: `Model of "power" is nonlinear in "b"; …`.
 * @example
 * ```ts
 * import { parseModel } from "../../kernel/expr/mod.ts";
 * import { solveNonlinear } from "./solve_nonlinear.ts";
 * const model = parseModel("y = a*x^b", ["x", "y"]);
 * try {
 *   solveNonlinear({ name: "power", model, n: 0, columns: [], y: new Float64Array(), rows: new Int32Array(), start: {} });
 *   throw new Error("expected a refusal");
 * } catch (e) {
 *   if (!(e as Error).message.startsWith('Model of "power" is nonlinear in "b"')) throw e;
 * }
 * ```
 */
export function solveNonlinear(problem: FitProblem): FitSolution {
  const names = nonlinearParameters(problem);
  throw new CellError(
    `Model of "${problem.name}" is nonlinear in ${
      quotedList(names)
    }; nonlinear fitting arrives with the numerical core`,
    ["model"],
    identifierOffset(problem.model.rhs, names[0]),
  );
}

/**
 * Parameters θ whose own derivative ∂f/∂θ still contains θ (f is curved in θ);
 * when there are none (as in a*b*x, linear in each alone), those whose
 * derivative contains another parameter.
 */
export function nonlinearParameters(problem: FitProblem): string[] {
  const params = problem.model.parameters;
  const deps = params.map((p) => freeNames(derivative(problem.model.rhs, p)));
  const curved = params.filter((p, j) => deps[j].has(p));
  if (curved.length > 0) return curved;
  return params.filter((_, j) => params.some((q) => deps[j].has(q)));
}
