/**
 * Finding where an expression uses a name (for errors that point at it).
 *
 * @module
 */
import type { Expr } from "../../kernel/expr/mod.ts";

/**
 * The first identifier node named `name` in `e`, in source order.
 *
 * @param e An expression tree.
 * @param name The identifier to look for.
 * @returns The node (with its `start` offset), or null.
 */
export function findId(e: Expr, name: string): Expr | null {
  if (e.op === "id") return e.name === name ? e : null;
  if (e.op === "num") return null;
  if (e.op === "neg") return findId(e.arg, name);
  if (e.op === "call") {
    for (const a of e.args) {
      const f = findId(a, name);
      if (f) return f;
    }
    return null;
  }
  return findId(e.left, name) ?? findId(e.right, name);
}
