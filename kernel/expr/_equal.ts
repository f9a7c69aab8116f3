/**
 * Structural equality of expression trees, ignoring spans.
 *
 * @module
 */
import type { Expr } from "./expr.ts";

/** True when `a` and `b` are the same tree (numbers compared with `Object.is`). */
export function exprEquals(a: Expr, b: Expr): boolean {
  if (a === b) return true;
  switch (a.op) {
    case "num":
      return b.op === "num" && Object.is(a.value, b.value);
    case "id":
      return b.op === "id" && a.name === b.name;
    case "neg":
      return b.op === "neg" && exprEquals(a.arg, b.arg);
    case "call":
      return b.op === "call" && a.fn === b.fn && a.args.length === b.args.length &&
        a.args.every((x, i) => exprEquals(x, b.args[i]));
    default:
      return b.op === a.op && exprEquals(a.left, b.left) && exprEquals(a.right, b.right);
  }
}

/** True when `name` occurs as an identifier in `e`. */
export function mentions(e: Expr, name: string): boolean {
  switch (e.op) {
    case "num":
      return false;
    case "id":
      return e.name === name;
    case "neg":
      return mentions(e.arg, name);
    case "call":
      return e.args.some((x) => mentions(x, name));
    default:
      return mentions(e.left, name) || mentions(e.right, name);
  }
}
