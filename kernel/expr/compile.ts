/**
 * Compiling an expression into a row loop.
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { generateAll } from "./_codegen.ts";
import { cachedFunction } from "./_kernel_cache.ts";
import { resolver, sorted, type Used } from "./_resolve.ts";

/**
 * A compiled expression: evaluates rows `0 … n-1` of the given columns with
 * the given parameter values into `out` (a new array when omitted) and
 * returns it.
 */
export type Compiled = (
  cols: readonly ArrayLike<number>[],
  params: ArrayLike<number>,
  n: number,
  out?: Float64Array,
) => Float64Array;

/**
 * Compiles `e` into one JavaScript function (built with `new Function`) that
 * loops over the rows and evaluates the whole tree inline: no per-row
 * interpretation. Repeated subtrees are computed once per row, and subtrees
 * free of columns once per call.
 *
 * Arithmetic is IEEE: `log` of a negative number gives NaN and `exp(1000)`
 * gives Infinity; nothing throws, so callers check finiteness. `^` and `pow`
 * use `Math.pow`.
 *
 * @param e The tree; `pi` and `e` are always the constants.
 * @param columns Column names, in the order the columns will be passed.
 * @param params Parameter names, in the order their values will be passed.
 * @returns The compiled function. It throws a `RangeError` when given the
 *   wrong number of columns or parameters, or arrays shorter than `n`.
 * @throws {ExprError} If `e` uses a name that is neither a column nor a parameter.
 * @example
 * ```ts
 * import { compile, parseExpression } from "./mod.ts";
 * const f = compile(parseExpression("q0 - a*sqrt(cycle)"), ["cycle"], ["q0", "a"]);
 * const y = f([[0, 4, 9]], [10, 2], 3);
 * if (y.join() !== "10,6,4") throw new Error(y.join());
 * ```
 */
export function compile(e: Expr, columns: readonly string[], params: readonly string[]): Compiled {
  const kernel = rowKernel([e], columns, params);
  return (cols, values, n, out) => {
    kernel.check(cols, values, n);
    const o = out ?? new Float64Array(n);
    if (o.length < n) throw new RangeError(`Output has ${o.length} rows: ${n} needed`);
    return kernel.run(cols, values, n, o);
  };
}

/**
 * Several compiled expressions evaluated in one row loop: tree j's value at
 * row i goes to `out[i + j·n]` (column-major, one column per tree), in a
 * new array of n·k values when `out` is omitted.
 */
export type CompiledColumns = Compiled;

/**
 * Compiles several trees into one row loop (a model's partial derivatives,
 * the columns of its Jacobian): subtrees they share, such as the `exp(-b*x)`
 * in both ∂/∂a and ∂/∂b of `a*exp(-b*x)`, are computed once per row. Column
 * j holds exactly what `compile(es[j], …)` gives.
 *
 * @param es The trees, one output column each.
 * @param columns Column names, in the order the columns will be passed.
 * @param params Parameter names, in the order their values will be passed.
 * @returns The compiled function (see {@link CompiledColumns}); it throws a
 *   `RangeError` as {@link compile}'s does, and for an output shorter than n·k.
 * @throws {ExprError} If a tree uses a name that is neither a column nor a parameter.
 * @example
 * ```ts
 * import { compileColumns, parseExpression } from "./mod.ts";
 * const f = compileColumns([parseExpression("2*x"), parseExpression("x + a")], ["x"], ["a"]);
 * const out = f([[1, 2]], [10], 2);
 * if (out.join() !== "2,4,11,12") throw new Error(out.join());
 * ```
 */
export function compileColumns(
  es: readonly Expr[],
  columns: readonly string[],
  params: readonly string[],
): CompiledColumns {
  const kernel = rowKernel(es, columns, params), k = es.length;
  return (cols, values, n, out) => {
    kernel.check(cols, values, n);
    const o = out ?? new Float64Array(n * k);
    if (o.length < n * k) throw new RangeError(`Output has ${o.length} values: ${n * k} needed`);
    return kernel.run(cols, values, n, o);
  };
}

/** The generated row loop for `es` (output column j at offset j·n) and its argument checks. */
function rowKernel(es: readonly Expr[], columns: readonly string[], params: readonly string[]) {
  const used: Used = { columns: new Set(), params: new Set() };
  const g = generateAll(
    es,
    resolver(columns, params, used, "it is neither a column nor a parameter"),
    true,
  );
  const usedList = sorted(used.columns);
  const src = [
    '"use strict";',
    ...usedList.map((c) => `const c${c} = cols[${c}];`),
    ...sorted(used.params).map((p) => `const p${p} = params[${p}];`),
    ...g.results.slice(1).map((_, j) => `const o${j + 1} = ${j + 1} * n;`),
    ...g.pre,
    "for (let i = 0; i < n; i++) {",
    ...usedList.map((c) => `  const x${c} = c${c}[i];`),
    ...g.body.map((s) => `  ${s}`),
    ...g.results.map((r, j) => `  out[${j === 0 ? "i" : `o${j} + i`}] = ${r};`),
    "}",
    "return out;",
  ].join("\n");
  const run = cachedFunction(["cols", "params", "n", "out"], src) as Compiled;
  const nc = columns.length, np = params.length;
  const check = (cols: readonly ArrayLike<number>[], values: ArrayLike<number>, n: number) => {
    if (cols.length !== nc) throw new RangeError(`Expected ${nc} columns, got ${cols.length}`);
    if (values.length !== np) {
      throw new RangeError(`Expected ${np} parameters, got ${values.length}`);
    }
    if (!Number.isInteger(n) || n < 0) {
      throw new RangeError(`Row count "${n}" is not a whole number`);
    }
    for (const c of usedList) {
      if (cols[c].length < n) {
        throw new RangeError(`Column "${columns[c]}" has ${cols[c].length} rows: ${n} needed`);
      }
    }
  };
  return { run, check };
}
