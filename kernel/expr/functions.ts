/**
 * The table of functions and constants the expression language knows.
 *
 * Each function lists its arity, how to evaluate it on numbers (used for
 * constant folding) and the JavaScript it compiles to. Adding a function is
 * one entry here plus one derivative rule in `derivative.ts`; the parser,
 * formatter and compilers read this table and need no change.
 *
 * Two entries are internal: they are what derivatives are written with, so
 * that derivative trees can be formatted, parsed back and compiled, but they
 * are not offered in suggestions or listed to users.
 *
 * - `sign(x)`: -1, 0 or 1 (`Math.sign`), the derivative of `abs`.
 * - `ifpos(c, t, f)`: `t` when `c > 0`, otherwise `f` (also when `c` is NaN),
 *   the derivative of `min` and `max`.
 * - `powlog(u, v)`: uᵛ·ln u, with its limit 0 at u = 0 for v > 0 (where the
 *   product would be 0·(−∞) = NaN): ∂(uᵛ)/∂v (derivative.ts).
 * - `zmul(a, b)`: a·b, but 0 where a is 0 even when b is infinite or NaN:
 *   the chain rule's product du·g(u) when g is singular where du vanishes,
 *   as `(t/l)^k` at t = 0 (derivative.ts).
 *
 * Semantics are IEEE double arithmetic through `Math`: `log(-1)` is NaN,
 * `exp(1000)` is Infinity; nothing throws.
 *
 * @module
 */

/** What the language knows about one function. */
export interface FunctionInfo {
  /** Name as written in expressions. */
  name: string;
  /** Exact number of arguments. */
  arity: number;
  /** True for functions used only in derivatives (not suggested to users). */
  internal: boolean;
  /** Evaluates the function on numbers (IEEE semantics, never throws). */
  evaluate: (...args: number[]) => number;
  /** JavaScript source for a call, given the source of each argument. */
  js: (args: readonly string[]) => string;
  /** True when `js` repeats an argument: the code generator then computes each argument once. */
  namedArgs?: boolean;
}

function math(name: string, arity: number, fn: (...a: number[]) => number, internal = false) {
  return {
    name,
    arity,
    internal,
    evaluate: fn,
    js: (a: readonly string[]) => `Math.${fn.name}(${a.join(", ")})`,
  };
}

const ifpos = (c: number, t: number, f: number) => (c > 0 ? t : f);
const powlog = (u: number, v: number) => (u === 0 && v > 0 ? 0 : Math.pow(u, v) * Math.log(u));
const zmul = (a: number, b: number) => (a === 0 ? 0 : a * b);

const ENTRIES: FunctionInfo[] = [
  math("exp", 1, Math.exp),
  math("log", 1, Math.log),
  math("log10", 1, Math.log10),
  math("sqrt", 1, Math.sqrt),
  math("abs", 1, Math.abs),
  math("sin", 1, Math.sin),
  math("cos", 1, Math.cos),
  math("tan", 1, Math.tan),
  math("atan", 1, Math.atan),
  math("tanh", 1, Math.tanh),
  math("pow", 2, Math.pow),
  math("min", 2, Math.min),
  math("max", 2, Math.max),
  math("sign", 1, Math.sign, true),
  {
    name: "ifpos",
    arity: 3,
    internal: true,
    evaluate: ifpos,
    js: (a) => `(${a[0]} > 0 ? ${a[1]} : ${a[2]})`,
  },
  {
    name: "powlog",
    arity: 2,
    internal: true,
    evaluate: powlog,
    js: ([u, v]) => `(${u} === 0 && ${v} > 0 ? 0 : Math.pow(${u}, ${v}) * Math.log(${u}))`,
    namedArgs: true,
  },
  {
    name: "zmul",
    arity: 2,
    internal: true,
    evaluate: zmul,
    js: ([a, b]) => `(${a} === 0 ? 0 : ${a} * ${b})`,
    namedArgs: true,
  },
];

/**
 * Every function of the language, internal ones included, by name.
 *
 * @example
 * ```ts
 * import { FUNCTIONS } from "./functions.ts";
 * if (FUNCTIONS.get("pow")?.arity !== 2) throw new Error("pow takes two arguments");
 * ```
 */
export const FUNCTIONS: ReadonlyMap<string, FunctionInfo> = new Map(
  ENTRIES.map((f) => [f.name, f]),
);

/**
 * Names of the functions users may write, in the order the design lists them.
 *
 * @example
 * ```ts
 * import { PUBLIC_FUNCTIONS } from "./functions.ts";
 * if (PUBLIC_FUNCTIONS.includes("sign")) throw new Error("sign is internal");
 * ```
 */
export const PUBLIC_FUNCTIONS: readonly string[] = ENTRIES.filter((f) => !f.internal).map((f) =>
  f.name
);

/**
 * The named constants and their values. Constant names are reserved: `e` is
 * always Euler's number, even when a table has a column called `e`.
 *
 * @example
 * ```ts
 * import { CONSTANTS } from "./functions.ts";
 * if (CONSTANTS.get("pi") !== Math.PI) throw new Error("pi");
 * ```
 */
export const CONSTANTS: ReadonlyMap<string, number> = new Map([["pi", Math.PI], ["e", Math.E]]);
