/**
 * Parsing one expression (no `=`), with no knowledge of columns.
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { tokenize } from "./_lexer.ts";
import { Parser } from "./_parser.ts";

/**
 * Parses an expression such as `q0 - a*sqrt(cycle)` into a tree.
 *
 * Precedence, loosest first: `+ -`, then `* /` (both left-associative), then
 * unary `-` and `+`, then `^` (right-associative, so `-x^2` is `-(x^2)` and
 * `2^3^2` is `2^(3^2)`; `2^-1` is allowed). Function calls are checked for a
 * known name and the right number of arguments. Identifiers are not resolved:
 * that is {@link parseModel} and {@link parseColumnExpression}'s business.
 *
 * @param text The expression text.
 * @returns The tree; spans are offsets into `text`.
 * @throws {ExprError} With the offset and length of the first mistake, e.g.
 *   `Unexpected ")" at column 14` or `Unknown function "sqr": did you mean "sqrt"?`.
 * @example
 * ```ts
 * import { parseExpression } from "./parse_expression.ts";
 * const e = parseExpression("-x^2");
 * if (e.op !== "neg" || e.arg.op !== "^") throw new Error("-x^2 is -(x^2)");
 * ```
 */
export function parseExpression(text: string): Expr {
  const tokens = tokenize(text);
  return new Parser(tokens, 0, tokens.length - 1).parseAll();
}
