/**
 * Solving a model that is linear in its parameters, without start values.
 *
 * Method: the design matrix is the Jacobian of the right side, whose columns
 * ∂f/∂θ_j are free of parameters for a linear model (evaluated on the data;
 * a constant derivative gives a constant column); the part of f free of
 * parameters, f(x; θ = 0), is an offset subtracted from the response. Then
 * min ‖(y − offset) − X·θ‖₂ by Householder QR with column pivoting
 * (kernel/linalg; Golub & Van Loan, *Matrix Computations*, 4th ed., §5.3
 * and §5.4.1). Never the normal equations.
 *
 * Two precisions: the double factorization always runs (it decides rank,
 * aliasing, the pivot order, the intercept and the condition number); when
 * n·p² ≤ 1e4, or n·p² ≤ 2e7 with a scaled condition number above 1e4
 * (`usePrecise` in `_precise_linear.ts`, costs from kernel/linalg/qr_bench.ts),
 * the problem is then solved again in double-double from the data as
 * printed, and those estimates, residuals, RSS, TSS and covariance are
 * returned.
 *
 * ```
 *  capacity = q0 - a*sqrt(cycle)      X = [ 1 | -sqrt(cycle) ],  offset = 0
 *  y = 2*x + a                        X = [ 1 ],                 offset = 2*x
 * ```
 *
 * @module
 */
import { compile, derivative, type Expr, format } from "../../kernel/expr/mod.ts";
import { CellError } from "../../kernel/errors.ts";
import {
  type AliasedColumn,
  inColumnSpace,
  leastSquares,
  quotedList,
  scaledConditionNumber,
} from "../../kernel/linalg/mod.ts";
import type { FitProblem, FitSolution } from "./problem.ts";
import { identifierOffset } from "./_offsets.ts";
import { rowList } from "../shared/rows.ts";
import { notFinite } from "./_data.ts";
import { rootWeights, unwhiten, whiten } from "./_weights.ts";
import { solvePrecise, usePrecise } from "./_precise_linear.ts";

/**
 * Fits a linear-in-parameters model by QR least squares.
 *
 * @param problem The rows used, the transformed response and the model; the
 *   model must be linear in its parameters (`isLinearIn`).
 * @returns Estimates, unscaled covariance (XᵀX)⁻¹, fitted values and residuals.
 * @throws {CellError} At the model when a term is not finite on some rows or
 *   when the terms are linearly dependent (naming the aliased ones).
 * @example
 * ```ts
 * import { parseModel } from "../../kernel/expr/mod.ts";
 * import { solveLinear } from "./solve_linear.ts";
 * const model = parseModel("y = a + b*x", ["x", "y"]);
 * const s = solveLinear({
 *   name: "line", model, n: 3, columns: [new Float64Array([0, 1, 2])],
 *   y: new Float64Array([1, 3, 5]), rows: new Int32Array([1, 2, 3]), start: {},
 * });
 * if (Math.abs(s.estimates[1] - 2) > 1e-14) throw new Error("slope 2");
 * ```
 */
export function solveLinear(problem: FitProblem): FitSolution {
  const { model, n } = problem;
  const params = model.parameters;
  const zeros = new Float64Array(params.length);
  const evalAt = (e: Expr) => compile(e, model.columns, params)(problem.columns, zeros, n);
  const terms = params.map((p) => derivative(model.rhs, p));
  const design = terms.map((t, j) =>
    checked(problem, evalAt(t), `term "${format(t)}" of parameter "${params[j]}"`, params[j])
  );
  const offset = offsetOf(problem, evalAt(model.rhs));
  const target = offset ? problem.y.map((v, i) => v - offset[i]) : problem.y;
  // Weighted: the whitened problem √W·X, √W·y (see FitProblem.weights).
  const root = rootWeights(problem.weights);
  const ls = root
    ? leastSquares(whiten(design, root), whiten([target], root)[0], params)
    : leastSquares(design, target, params);
  if (!ls.fullRank) {
    const first = ls.aliasing[0];
    throw new CellError(
      `Cannot fit "${problem.name}": ${
        ls.aliasing.map((a) => aliasPhrase(a, terms, params)).join("; ")
      }`,
      ["model"],
      identifierOffset(model.rhs, first.name),
    );
  }
  const hasIntercept = inColumnSpace(ls.qr, root ?? new Float64Array(n).fill(1));
  const kappa = scaledConditionNumber(ls.qr);
  warnCollinear(problem, kappa);
  // Small problems, and ill-conditioned medium ones, are solved again in
  // double-double from the data as printed (the rule: _precise_linear.ts).
  const precise = usePrecise(n, params.length, kappa)
    ? solvePrecise(problem, terms, ls.qr.perm, root, hasIntercept)
    : null;
  // What both paths share: the design as evaluated and the double QR of it.
  const common = {
    method: "linear" as const,
    hasIntercept,
    conditionNumber: ls.conditionEstimate,
    converged: true,
    iterations: 1,
    design,
    designQR: ls.qr,
    offset,
  };
  if (precise !== null) return { ...common, ...precise };
  const part = root ? unwhiten(ls.fitted, root) : ls.fitted;
  const fitted = offset ? part.map((v, i) => v + offset[i]) : part;
  return {
    ...common,
    estimates: ls.coefficients,
    unscaledCovariance: ls.unscaledCovariance,
    fitted,
    residuals: root ? unwhiten(ls.residuals, root) : ls.residuals,
    rss: ls.rss,
  };
}

/**
 * Condition index above which the terms are called nearly collinear: Belsley,
 * Kuh & Welsch (1980, ch. 3) read indexes of 30 to 100 as moderate to strong
 * dependencies; we warn from the upper end.
 */
export const COLLINEARITY_WARNING = 100;

function warnCollinear(problem: FitProblem, kappa: number): void {
  if (!(kappa > COLLINEARITY_WARNING) || problem.model.parameters.length < 2) return;
  problem.warn?.(
    `Terms of "${problem.name}" are nearly collinear: condition number ${
      kappa.toPrecision(3)
    } of the design with unit-length columns (> ${COLLINEARITY_WARNING}, Belsley, Kuh & Welsch 1980); ` +
      `estimates and standard errors are sensitive to small changes in the data`,
  );
}

function checked(problem: FitProblem, v: Float64Array, what: string, param: string): Float64Array {
  const bad = notFinite(v, problem.rows);
  if (bad.length > 0) {
    throw new CellError(
      `Cannot fit "${problem.name}": ${what} is not finite in ${rowList(bad)}`,
      ["model"],
      identifierOffset(problem.model.rhs, param),
    );
  }
  return v;
}

/** The offset f(x; 0), or null when it is zero on every row. */
function offsetOf(problem: FitProblem, v: Float64Array): Float64Array | null {
  if (v.every((x) => x === 0)) return null;
  const bad = notFinite(v, problem.rows);
  if (bad.length > 0) {
    throw new CellError(
      `Cannot fit "${problem.name}": the part of the model free of parameters is not finite in ${
        rowList(bad)
      }`,
      ["model"],
      problem.model.rhs.start,
    );
  }
  return v;
}

/** `column "x3" is a linear combination of "x1" and "x2"`, or the same for general terms. */
function aliasPhrase(a: AliasedColumn, terms: Expr[], params: readonly string[]): string {
  const idx = (name: string) => params.indexOf(name);
  const termOf = (name: string) => format(terms[idx(name)]);
  const isColumn = (name: string) => terms[idx(name)].op === "id";
  const all = [a.name, ...a.of];
  const relation = a.of.length === 0
    ? "is zero in every row used"
    : a.of.length === 1
    ? "is a multiple of"
    : "is a linear combination of";
  if (all.every(isColumn)) {
    const list = a.of.length === 0 ? "" : ` ${quotedList(a.of.map(termOf))}`;
    return `column "${
      termOf(a.name)
    }" ${relation}${list}, so parameter "${a.name}" cannot be estimated`;
  }
  const list = a.of.length === 0
    ? ""
    : ` the ${a.of.length === 1 ? "term" : "terms"} of ${
      joinAnd(a.of.map((p) => `"${p}" (${termOf(p)})`))
    }`;
  return `the term of parameter "${a.name}" (${termOf(a.name)}) ${relation}${list}`;
}

function joinAnd(items: string[]): string {
  return items.length <= 1
    ? items.join("")
    : `${items.slice(0, -1).join(", ")} and ${items[items.length - 1]}`;
}
