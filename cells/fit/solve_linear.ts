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
 * returned; otherwise the double solution is refined against the same data
 * (Björck 1967; `solveRefined`), and its estimates, residuals, RSS and TSS
 * returned with the double covariance. Either way the solution keeps its
 * triangular factor (`designQR.triangular`), through which prediction
 * variances and leverages are read (fit_leverage.ts), and the estimates' low
 * parts. The parameter-free part f(x; 0) is not evaluated when every term of
 * the model has a parameter factor (it is then 0).
 *
 * ```
 *  capacity = q0 - a*sqrt(cycle)      X = [ 1 | -sqrt(cycle) ],  offset = 0
 *  y = 2*x + a                        X = [ 1 ],                 offset = 2*x
 * ```
 *
 * @module
 */
import { compile, compileDD, derivative, type Expr, format } from "../../kernel/expr/mod.ts";
import { CellError } from "../../kernel/errors.ts";
import {
  factorOfQR,
  inColumnSpace,
  leastSquares,
  type LeastSquaresFit,
  scaledConditionNumber,
} from "../../kernel/linalg/mod.ts";
import type { DesignFactor, FitProblem, FitSolution } from "./problem.ts";
import { identifierOffset } from "./_offsets.ts";
import { aliased } from "./_aliased_terms.ts";
import { rowList } from "../shared/rows.ts";
import { notFinite } from "./_data.ts";
import { rootWeights, unwhiten, whiten } from "./_weights.ts";
import {
  type DDResponse,
  type PreciseLinear,
  solvePrecise,
  solveRefined,
  usePrecise,
} from "./_precise_linear.ts";
import { type DDColumn, ddDesign, printedColumns, printedResponse } from "./_dd_design.ts";
import { ddRows } from "./_dd_rows.ts";

/** Options of {@link solveLinear}. */
export interface SolveLinearOptions {
  /**
   * Refine the double path's solution against the data as printed (default
   * true). False gives the plain double path, for comparison in
   * `deno task bench`; the double-double path is taken either way.
   */
  refine?: boolean;
}

/**
 * Fits a linear-in-parameters model by QR least squares.
 *
 * @param problem The rows used, the transformed response and the model; the
 *   model must be linear in its parameters (`isLinearIn`).
 * @param options Whether the double path is refined (default: it is).
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
export function solveLinear(problem: FitProblem, options: SolveLinearOptions = {}): FitSolution {
  const { model } = problem;
  const params = model.parameters;
  const terms = params.map((p) => derivative(model.rhs, p));
  const design = terms.map((t, j) =>
    checked(
      problem,
      evaluate(problem, t),
      `term "${format(t)}" of parameter "${params[j]}"`,
      params[j],
    )
  );
  const offset = offsetOf(problem);
  const target = offset ? problem.y.map((v, i) => v - offset[i]) : problem.y;
  // Weighted: the whitened problem √W·X, √W·y (see FitProblem.weights).
  const root = rootWeights(problem.weights);
  const ls = root
    ? leastSquares(whiten(design, root), whiten([target], root)[0], params)
    : leastSquares(design, target, params);
  if (!ls.fullRank) throw aliased(problem, ls.aliasing, terms);
  const hasIntercept = interceptIn(design, ls, root);
  const kappa = scaledConditionNumber(ls.qr);
  warnCollinear(problem, kappa);
  // Small problems, and ill-conditioned medium ones, are solved again in double-double from the
  // data as printed; the others are refined against the same data (the rule: _precise_linear.ts).
  const cols = printedColumns(problem);
  let dd: DDColumn[] | null = null, precise: PreciseLinear | null = null, spent = false;
  if (usePrecise(problem.n, params.length, kappa)) {
    dd = ddDesign(problem, terms, cols);
    precise = solvePrecise(dd, ddResponse(problem, cols, offset), ls.qr.perm, root, hasIntercept);
  } else if (options.refine !== false) {
    const rows = ddRows(problem, terms, cols);
    precise = solveRefined(ls, rows, ddResponse(problem, cols, offset), root, hasIntercept);
    spent = true; // the refinement worked in ls.fitted and ls.residuals
  }
  const common = {
    method: "linear" as const,
    hasIntercept,
    conditionNumber: ls.conditionEstimate,
    converged: true,
    iterations: 1,
    design,
    offset,
  };
  if (precise !== null) {
    const { factor, estimatesLo, ...rest } = precise;
    const designQR: DesignFactor = {
      ...ls.qr,
      triangular: factor,
      estimatesLo,
      ...(factor.rLo !== null && dd !== null ? { designDD: dd } : {}),
    };
    return { ...common, ...rest, designQR };
  }
  const part = spent
    ? product(design, ls.coefficients)
    : root
    ? unwhiten(ls.fitted, root)
    : ls.fitted;
  const fitted = offset ? part.map((v, i) => v + offset[i]) : part;
  const residuals = spent
    ? target.map((v, i) => v - part[i])
    : root
    ? unwhiten(ls.residuals, root)
    : ls.residuals;
  return {
    ...common,
    designQR: { ...ls.qr, triangular: factorOfQR(ls.qr, ls.scale) },
    estimates: ls.coefficients,
    unscaledCovariance: ls.unscaledCovariance,
    fitted,
    residuals,
    rss: ls.rss,
  };
}

/** X·β on the original scale (the double solution's fitted values less any offset). */
function product(design: readonly Float64Array[], beta: Float64Array): Float64Array {
  const out = new Float64Array(design[0].length);
  design.forEach((c, j) => {
    for (let i = 0; i < out.length; i++) out[i] += beta[j] * c[i];
  });
  return out;
}

/**
 * A term evaluated in double on the rows used; a term that is a bare column
 * is that column, read in place (no copy: see `_data.ts`).
 */
function evaluate(problem: FitProblem, e: Expr): Float64Array {
  const { model, n } = problem;
  if (e.op === "id") {
    const c = model.columns.indexOf(e.name);
    if (c >= 0) return problem.columns[c];
  }
  const zeros = new Float64Array(model.parameters.length);
  return compile(e, model.columns, model.parameters)(problem.columns, zeros, n);
}

/** The response and the target y − f(x; 0) in double-double. */
function ddResponse(
  problem: FitProblem,
  cols: readonly DDColumn[],
  offset: Float64Array | null,
): DDResponse {
  const { model, n } = problem;
  const y = printedResponse(problem);
  if (offset === null) return { y, target: y };
  const zeros = new Float64Array(model.parameters.length);
  const f0 = compileDD(model.rhs, model.columns, model.parameters)(
    cols.map((c) => c.hi),
    cols.map((c) => c.lo),
    zeros,
    null,
    n,
  );
  const target = { hi: new Float64Array(n), lo: new Float64Array(n) };
  for (let i = 0; i < n; i++) {
    const s = y.hi[i] - f0.hi[i];
    const l = (y.hi[i] - (s + f0.hi[i])) + ((y.lo === null ? 0 : y.lo[i]) - f0.lo[i]);
    target.hi[i] = s + l;
    target.lo[i] = l - (target.hi[i] - s);
  }
  return { y, target };
}

/**
 * Whether a constant lies in the span of the design (R² is then centred):
 * at once when a term is constant, else from the QR (a constant is in the
 * span of X exactly when √w is in the span of √W·X).
 */
function interceptIn(
  design: readonly Float64Array[],
  ls: LeastSquaresFit,
  root: Float64Array | null,
): boolean {
  const constant = (c: Float64Array) => c[0] !== 0 && c.every((v) => v === c[0]);
  if (design.some(constant)) return true;
  return inColumnSpace(ls.qr, root ?? new Float64Array(ls.n).fill(1));
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

/**
 * The offset f(x; 0), or null when it is zero on every row: at once, without
 * evaluating, when every additive term of the model has a parameter as a
 * factor (as `polynomial()` and `linear()` expand to).
 */
function offsetOf(problem: FitProblem): Float64Array | null {
  const { model } = problem;
  if (vanishesAtZero(model.rhs, model.parameters)) return null;
  const v = evaluate(problem, model.rhs);
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

/** Whether e is 0 when every parameter is 0, by its form (every term has a parameter factor). */
function vanishesAtZero(e: Expr, params: readonly string[]): boolean {
  switch (e.op) {
    case "+":
    case "-":
      return vanishesAtZero(e.left, params) && vanishesAtZero(e.right, params);
    case "neg":
      return vanishesAtZero(e.arg, params);
    case "*":
      return vanishesAtZero(e.left, params) || vanishesAtZero(e.right, params);
    case "/":
      return vanishesAtZero(e.left, params);
    case "id":
      return params.includes(e.name);
    default:
      return false;
  }
}
