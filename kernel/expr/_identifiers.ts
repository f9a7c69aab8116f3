/**
 * Identifier nodes in source order, and the check shared by the callers that
 * resolve them.
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { ExprError } from "./expr_error.ts";
import { FUNCTIONS } from "./functions.ts";
import { nearest } from "../suggest.ts";

/** An identifier node. */
export type IdNode = Extract<Expr, { op: "id" }>;

/** Every identifier node of `e`, left to right as written. */
export function identifiers(e: Expr, out: IdNode[] = []): IdNode[] {
  switch (e.op) {
    case "num":
      break;
    case "id":
      out.push(e);
      break;
    case "neg":
      identifiers(e.arg, out);
      break;
    case "call":
      for (const a of e.args) identifiers(a, out);
      break;
    default:
      identifiers(e.left, out);
      identifiers(e.right, out);
  }
  return out;
}

/**
 * Throws when a function name is written without its parentheses.
 *
 * @param node An identifier that is not a column.
 * @throws {ExprError} `Function "exp" needs its argument in parentheses, as in exp(x)`.
 */
export function rejectBareFunction(node: IdNode): void {
  const info = FUNCTIONS.get(node.name);
  if (info === undefined) return;
  const example = `${info.name}(${["x", "y", "z"].slice(0, info.arity).join(", ")})`;
  const noun = info.arity === 1 ? "its argument" : "its arguments";
  throw new ExprError(
    `Function "${info.name}" needs ${noun} in parentheses, as in ${example}`,
    node.start,
    node.end - node.start,
  );
}

/**
 * Shortest name checked for being a misspelt column: names of one or two
 * characters are one edit from every short column name (`k` and `y`).
 */
export const MIN_TYPO_LENGTH = 3;

/**
 * The column `name` is probably a typo of, if any.
 *
 * @param name What was written.
 * @param columns The columns.
 * @param maxDistance Largest edit distance (default as in kernel/suggest.ts).
 */
export function likelyColumn(
  name: string,
  columns: readonly string[],
  maxDistance?: number,
): string | undefined {
  return name.length < MIN_TYPO_LENGTH ? undefined : nearest(name, columns, maxDistance);
}
