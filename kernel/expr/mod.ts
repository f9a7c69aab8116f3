/**
 * Plumb's expression language: model formulas in `fit` cells
 * (`capacity = q0 - a*sqrt(cycle)`) and derived columns in `table` cells.
 *
 * ```
 *  text ──parseModel / parseColumnExpression / parseExpression──▶ Expr
 *  Expr ──simplify / derivative / format / freeNames / isLinearIn
 *  Expr ──compile (row loop) / compileScalar──▶ JavaScript function
 *  Expr ──compileDD──▶ row-wise evaluator in double-double (hi + lo arrays)
 *  response ──responseInverse──▶ y = g⁻¹(z) for a transformed response
 * ```
 *
 * Functions: `exp log log10 sqrt abs sin cos tan atan tanh` (one argument),
 * `pow min max` (two); constants `pi e`; operators `+ - * / ^` with `^`
 * right-associative and binding tighter than unary minus. Derivatives are
 * written with four internal functions, `sign`, `ifpos`, `powlog` and
 * `zmul` (see derivative.ts: the last two keep the limits at a predictor's
 * zero). New functions are added to the table in functions.ts.
 *
 * Shorthands, on the right side of a model only (`_shorthands.ts`), expand
 * into explicit terms in {@link parseModel}:
 *
 * - `polynomial(x, d)`: `b0 + b1*x + … + bd*x^d`, with x a column and d a
 *   whole-number literal from 0 to 30;
 * - `linear(x1, x2, …)`: `b0 + b_x1*x1 + b_x2*x2 + …`, an intercept and one
 *   slope per listed column.
 *
 * A shorthand is one operand like any other (`y = polynomial(x, 2) +
 * c*exp(-k*x)`). Its parameters share one prefix letter, `b` first; if any
 * of its names would clash with a column, a constant, another name in the
 * model or an earlier shorthand's names, the whole shorthand takes the next
 * free letter (`c0, c1, …`, then `d`, `f`, `g`, …; `e`, `i`, `l`, `o` are
 * skipped).
 *
 * @example
 * ```ts
 * import { compile, derivative, format, parseModel } from "./mod.ts";
 * const m = parseModel("capacity = q0 - a*sqrt(cycle)", ["cycle", "capacity"]);
 * if (format(derivative(m.rhs, "q0")) !== "1") throw new Error("d/dq0");
 * const f = compile(m.rhs, m.columns, m.parameters);
 * if (f([[4]], [1, 0.25], 1)[0] !== 0.5) throw new Error("1 - 0.25*2");
 * ```
 *
 * @module
 */
export type { BinaryOp, Expr } from "./expr.ts";
export { ExprError } from "./expr_error.ts";
export { CONSTANTS, type FunctionInfo, FUNCTIONS, PUBLIC_FUNCTIONS } from "./functions.ts";
export { parseExpression } from "./parse_expression.ts";
export { type Model, parseModel } from "./parse_model.ts";
export { parseColumnExpression } from "./parse_column_expression.ts";
export { simplify } from "./simplify.ts";
export { derivative } from "./derivative.ts";
export { format } from "./format.ts";
export { freeNames } from "./free_names.ts";
export { compile, compileColumns, type Compiled, type CompiledColumns } from "./compile.ts";
export { compileScalar } from "./compile_scalar.ts";
export { compileDD, type CompiledDD } from "./compile_dd.ts";
export { isLinearIn } from "./is_linear_in.ts";
export { type NoInverse, type ResponseInverse, responseInverse } from "./response_inverse.ts";
