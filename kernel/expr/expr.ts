/**
 * The syntax tree of Plumb's expression language.
 *
 * Every node carries `start` and `end`, 0-based character offsets into the
 * text it was parsed from (`end` exclusive), so later stages can point at the
 * place a problem comes from. Nodes built by {@link simplify} or
 * {@link derivative} take the span of the operands they were built from.
 *
 * ```
 *  q0 - a*sqrt(cycle)
 *
 *        "-"
 *       /   \
 *   id q0   "*"
 *          /   \
 *       id a   call sqrt
 *                 |
 *              id cycle
 * ```
 *
 * @module
 */

/** A binary operator of the language. */
export type BinaryOp = "+" | "-" | "*" | "/" | "^";

/** A node of the expression tree. */
export type Expr =
  | { op: "num"; value: number; start: number; end: number }
  /** A column, parameter or constant (`pi`, `e`). */
  | { op: "id"; name: string; start: number; end: number }
  | { op: "neg"; arg: Expr; start: number; end: number }
  | { op: BinaryOp; left: Expr; right: Expr; start: number; end: number }
  | { op: "call"; fn: string; args: Expr[]; start: number; end: number };

/** A binary node. */
export type BinaryExpr = Extract<Expr, { op: BinaryOp }>;

/**
 * Whether a node is a binary operation.
 *
 * @param e Any node.
 * @returns True for `+ - * / ^` nodes.
 * @example
 * ```ts
 * import { isBinary } from "./expr.ts";
 * const n = { op: "num", value: 1, start: 0, end: 1 } as const;
 * if (isBinary(n)) throw new Error("a number is not binary");
 * ```
 */
export function isBinary(e: Expr): e is BinaryExpr {
  return e.op === "+" || e.op === "-" || e.op === "*" || e.op === "/" || e.op === "^";
}
