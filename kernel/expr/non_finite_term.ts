/**
 * Which part of an expression is not finite, and at which rows: for messages
 * that name the term (`log(t) is not finite at rows 1, 12`) instead of
 * blaming the whole model.
 *
 * Method: evaluate the tree's operands over all rows and descend into the
 * first operand that is not finite at some of the rows where its parent is
 * not, keeping only those rows; stop at the node whose operands are all
 * finite there: that node made the NaN or infinity (`log(0)`, `exp(1000)`,
 * `1/0`). Common practice, no source. Meant for the error path only: each
 * node visited is compiled once.
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { compile } from "./compile.ts";
import { freeNames } from "./free_names.ts";

/** The innermost subexpression that is not finite, and where. */
export interface NonFiniteTerm {
  /** The subexpression (a node of the tree given). */
  term: Expr;
  /** Row indexes (0-based, ascending) where it is not finite. */
  rows: number[];
  /** The columns and parameters it uses. */
  names: Set<string>;
}

function operands(e: Expr): Expr[] {
  if (e.op === "num" || e.op === "id") return [];
  if (e.op === "neg") return [e.arg];
  if (e.op === "call") return e.args;
  return [e.left, e.right];
}

/**
 * Finds the innermost subexpression of `e` that is not finite at rows where `e` is not.
 *
 * @param e The tree.
 * @param columns Column names, in the order of `cols`.
 * @param params Parameter names, in the order of `values`.
 * @param cols Column values.
 * @param values Parameter values.
 * @param n Number of rows.
 * @returns The term, or null when `e` is finite at every row.
 * @example
 * ```ts
 * import { format, nonFiniteTerm, parseExpression } from "./mod.ts";
 * const e = parseExpression("a + b*log(t)");
 * const bad = nonFiniteTerm(e, ["t"], ["a", "b"], [[0, 1, 2]], [1, 2], 3);
 * if (bad === null || format(bad.term) !== "log(t)" || bad.rows.join() !== "0") throw new Error();
 * ```
 */
export function nonFiniteTerm(
  e: Expr,
  columns: readonly string[],
  params: readonly string[],
  cols: readonly ArrayLike<number>[],
  values: ArrayLike<number>,
  n: number,
): NonFiniteTerm | null {
  const at = (node: Expr) => compile(node, columns, params)(cols, values, n);
  const rows = notFinite(at(e), Array.from({ length: n }, (_, i) => i));
  if (rows.length === 0) return null;
  let node = e, where = rows;
  for (;;) {
    const next = operands(node).map((o) => ({ o, bad: notFinite(at(o), where) }))
      .find((c) => c.bad.length > 0);
    if (next === undefined) break;
    node = next.o;
    where = next.bad;
  }
  return { term: node, rows: where, names: freeNames(node) };
}

function notFinite(v: Float64Array, rows: readonly number[]): number[] {
  return rows.filter((i) => !Number.isFinite(v[i]));
}
