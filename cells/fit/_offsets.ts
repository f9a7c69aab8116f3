/**
 * Where a name appears in a model's text, for errors placed on the identifier.
 *
 * @module
 */
import type { Expr } from "../../kernel/expr/mod.ts";

/** Offset of the first identifier `name` in `e` (left to right), or undefined. */
export function identifierOffset(e: Expr, name: string): number | undefined {
  switch (e.op) {
    case "num":
      return undefined;
    case "id":
      return e.name === name ? e.start : undefined;
    case "neg":
      return identifierOffset(e.arg, name);
    case "call":
      for (const a of e.args) {
        const at = identifierOffset(a, name);
        if (at !== undefined) return at;
      }
      return undefined;
    default:
      return identifierOffset(e.left, name) ?? identifierOffset(e.right, name);
  }
}

/** `1 row` / `3 rows`. */
export function countRows(k: number): string {
  return `${k} ${k === 1 ? "row" : "rows"}`;
}
