/**
 * Algebraic simplification of expression trees.
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { add, call, div, mul, negate, pow, sub } from "./_build.ts";

/**
 * Rebuilds `e` bottom-up through the simplifying constructors: constant
 * folding (finite, short results only, so `1/3` and `log(2)` stay symbolic),
 * the 0 and 1 identities, `x-x` to 0, `x/x` to 1, `x+x` to `2*x`, `x*x` to
 * `x^2`, signs gathered onto the leftmost factor and numeric factors put
 * first in products.
 *
 * The value is unchanged wherever `e` is defined (in real arithmetic;
 * regrouped products can differ in the last bits). Where `e` is undefined the
 * result may be defined: `x/x` is 1 even at `x = 0`.
 *
 * @param e Any tree.
 * @returns An equivalent tree; `simplify(simplify(e))` equals `simplify(e)`.
 * @example
 * ```ts
 * import { simplify, parseExpression, format } from "./mod.ts";
 * const s = format(simplify(parseExpression("0 + 1*x^1 - (y - y)")));
 * if (s !== "x") throw new Error(s);
 * ```
 */
export function simplify(e: Expr): Expr {
  switch (e.op) {
    case "num":
    case "id":
      return e;
    case "neg":
      return negate(simplify(e.arg));
    case "call":
      return call(e.fn, e.args.map(simplify));
    case "+":
      return add(simplify(e.left), simplify(e.right));
    case "-":
      return sub(simplify(e.left), simplify(e.right));
    case "*":
      return mul(simplify(e.left), simplify(e.right));
    case "/":
      return div(simplify(e.left), simplify(e.right));
    case "^":
      return pow(simplify(e.left), simplify(e.right));
  }
}
