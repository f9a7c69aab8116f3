/**
 * Dense linear algebra for least squares: Householder QR with column pivoting,
 * applying Q, triangular solves, small singular value problems and the
 * least-squares driver that the `fit` cell uses.
 *
 * All matrices are column-major Float64Arrays (element (i, j) of an m×n matrix
 * at `a[i + j*m]`).
 *
 * @example
 * ```ts
 * import { leastSquares } from "./mod.ts";
 * const r = leastSquares([new Float64Array([1, 1, 1])], new Float64Array([1, 2, 3]), ["mean"]);
 * if (!r.fullRank || Math.abs(r.coefficients[0] - 2) > 1e-15) throw new Error("unexpected");
 * ```
 *
 * @module
 */
export {
  factorInPlace,
  householderQR,
  type QRFactorization,
  type QROptions,
} from "./householder_qr.ts";
export { applyQ, applyQInPlace, applyQt, applyQtInPlace } from "./apply_qt.ts";
export { invertR, solveR } from "./solve_r.ts";
export { singularValues } from "./singular_values.ts";
export { scaledConditionNumber } from "./scaled_condition.ts";
export { inColumnSpace } from "./column_space.ts";
export { describeAliased, quotedList } from "./describe_aliased.ts";
export {
  type AliasedColumn,
  leastSquares,
  type LeastSquaresFit,
  type LeastSquaresRefusal,
  type LeastSquaresResult,
} from "./least_squares.ts";
export {
  ddLeastSquares,
  type DDLeastSquaresFit,
  ddSumOfSquares,
  type DDVector,
} from "./dd_least_squares.ts";
export { factorOfQR, inverseGramForms, type TriangularFactor } from "./triangular_factor.ts";
export {
  type DDRows,
  type RefinedLeastSquares,
  refineLeastSquares,
  type RefineOptions,
  ROW_BLOCK,
} from "./refine_least_squares.ts";
// Double-double building blocks live in kernel/dd.ts; offered here as before for the solvers.
export {
  type DD,
  dd,
  ddAdd,
  ddDiv,
  ddMul,
  ddSqrt,
  fastTwoSum,
  split,
  twoProduct,
  twoSum,
} from "../dd.ts";
