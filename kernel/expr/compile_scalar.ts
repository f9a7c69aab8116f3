/**
 * Compiling an expression into a function of one set of values.
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { generate } from "./_codegen.ts";
import { resolver, sorted, type Used } from "./_resolve.ts";
import { cachedFunction } from "./_kernel_cache.ts";

/**
 * Compiles `e` into a function of one value per name, `values[k]` being the
 * value of `names[k]`. Repeated subtrees are computed once. Missing values
 * read as `undefined` and so give NaN; IEEE semantics as for {@link compile}.
 *
 * @param e The tree; `pi` and `e` are always the constants.
 * @param names Every identifier `e` uses, in the order values will be passed.
 * @returns The compiled function.
 * @throws {ExprError} If `e` uses a name not in `names`.
 * @example
 * ```ts
 * import { compileScalar, parseExpression } from "./mod.ts";
 * const f = compileScalar(parseExpression("pow(x, 2) + y"), ["x", "y"]);
 * if (f([3, 1]) !== 10) throw new Error("3^2 + 1");
 * ```
 */
export function compileScalar(
  e: Expr,
  names: readonly string[],
): (values: ArrayLike<number>) => number {
  // Every name is a "parameter": read once per call, nothing to hoist.
  const used: Used = { columns: new Set(), params: new Set() };
  const g = generate(e, resolver([], names, used, "it is not among the names given"), false);
  const src = [
    '"use strict";',
    ...sorted(used.params).map((p) => `const p${p} = values[${p}];`),
    ...g.body,
    `return ${g.result};`,
  ].join("\n");
  return cachedFunction(["values"], src) as (values: ArrayLike<number>) => number;
}
