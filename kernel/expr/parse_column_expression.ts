/**
 * Parsing the expression of a derived column.
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { ExprError } from "./expr_error.ts";
import { CONSTANTS } from "./functions.ts";
import { identifiers, likelyColumn, rejectBareFunction } from "./_identifiers.ts";
import { parseExpression } from "./parse_expression.ts";

/**
 * Parses the expression of a derived column, such as `log10(conc)` or
 * `(temp - 273.15) * 1.8 + 32`. Only columns and the constants `pi` and `e`
 * may appear; there are no parameters.
 *
 * @param text The expression text.
 * @param columns Names of the columns available.
 * @returns The tree.
 * @throws {ExprError} On a syntax error (see {@link parseExpression}), or on
 *   an identifier that is no column: `Unknown column "tmep": did you mean "temp"?`.
 * @example
 * ```ts
 * import { parseColumnExpression } from "./mod.ts";
 * const e = parseColumnExpression("log10(conc)", ["conc", "signal"]);
 * if (e.op !== "call") throw new Error("expected a call");
 * ```
 */
export function parseColumnExpression(text: string, columns: readonly string[]): Expr {
  const e = parseExpression(text);
  for (const node of identifiers(e)) {
    if (CONSTANTS.has(node.name) || columns.includes(node.name)) continue;
    rejectBareFunction(node);
    const near = likelyColumn(node.name, columns);
    const tail = near === undefined
      ? ": a derived column may use only columns and the constants pi and e"
      : `: did you mean "${near}"?`;
    throw new ExprError(`Unknown column "${node.name}"${tail}`, node.start, node.end - node.start);
  }
  return e;
}
