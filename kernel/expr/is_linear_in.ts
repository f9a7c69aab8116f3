/**
 * Whether a model is linear in its parameters.
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { derivative } from "./derivative.ts";
import { freeNames } from "./free_names.ts";

/**
 * True when `e` is linear in `params`: every partial derivative d e/d p is
 * free of parameters, so `e` is a fixed combination of terms, each a
 * function of the columns times at most one parameter. Such models are solved
 * directly by least squares, without start values.
 *
 * `a + b*log(x)` and `a + b*x + c*x^2` are linear; `a*exp(-b*x)` and `x^p`
 * are not. Piecewise derivatives count by their symbolic form, so
 * `max(a, x)` is not linear in `a`.
 *
 * @param e The model's right side.
 * @param params The parameter names.
 * @returns Whether every derivative is parameter-free.
 * @example
 * ```ts
 * import { isLinearIn, parseExpression } from "./mod.ts";
 * if (!isLinearIn(parseExpression("a + b*log(x)"), ["a", "b"])) throw new Error("linear");
 * if (isLinearIn(parseExpression("a*exp(-b*x)"), ["a", "b"])) throw new Error("nonlinear");
 * ```
 */
export function isLinearIn(e: Expr, params: readonly string[]): boolean {
  return params.every((p) => {
    const names = freeNames(derivative(e, p));
    return params.every((q) => !names.has(q));
  });
}
