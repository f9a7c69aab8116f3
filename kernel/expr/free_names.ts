/**
 * The identifiers an expression uses.
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { CONSTANTS } from "./functions.ts";

/**
 * Identifiers used in `e` (columns and parameters), excluding the constants
 * `pi` and `e`. Function names are not identifiers.
 *
 * @param e Any tree.
 * @returns The names, in first-appearance (source) order.
 * @example
 * ```ts
 * import { freeNames, parseExpression } from "./mod.ts";
 * const names = [...freeNames(parseExpression("a*exp(-b*x) + pi"))];
 * if (names.join() !== "a,b,x") throw new Error(names.join());
 * ```
 */
export function freeNames(e: Expr): Set<string> {
  const out = new Set<string>();
  collect(e, out);
  return out;
}

function collect(e: Expr, out: Set<string>): void {
  switch (e.op) {
    case "num":
      return;
    case "id":
      if (!CONSTANTS.has(e.name)) out.add(e.name);
      return;
    case "neg":
      return collect(e.arg, out);
    case "call":
      for (const a of e.args) collect(a, out);
      return;
    default:
      collect(e.left, out);
      collect(e.right, out);
  }
}
