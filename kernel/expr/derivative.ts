/**
 * Exact symbolic differentiation.
 *
 * Method: the textbook rules of differential calculus (sum, product,
 * quotient, chain and general power rules), applied recursively and built
 * through the simplifying constructors so results stay readable. Common
 * practice, no source.
 *
 * Non-smooth functions use one-sided choices at their kinks:
 *
 * - `abs(u)`: `sign(u) * u'` (so 0 at `u = 0`).
 * - `min(u, v)`: `ifpos(u - v, v', u')`, the slope of whichever argument is
 *   smaller; at a tie, `u'`.
 * - `max(u, v)`: `ifpos(u - v, u', v')`, the slope of whichever argument is
 *   larger; at a tie, `v'`.
 * - `sign(u)` has derivative 0 and `ifpos(c, t, f)` has `ifpos(c, t', f')`.
 *
 * `sign` and `ifpos` are internal functions of the table in functions.ts, so
 * derivative trees can be formatted, parsed back and compiled.
 *
 * Limits where the textbook form is 0·∞ but the derivative is finite (a
 * predictor that includes 0, as t in `exp(-k*t^n)`):
 *
 * - ∂(uᵛ)/∂v = uᵛ·ln u is written `powlog(u, v)`, which is 0 at u = 0 for
 *   v > 0: the limit of uᵛ·ln u as u → 0⁺ (uᵛ vanishes faster than ln u
 *   grows; common practice, no source).
 * - ∂(uᵛ)/∂u·u' = v·u^(v−1)·u' (never v·uᵛ/u, which is 0/0 at u = 0), and
 *   u' times a factor that may be infinite where u' = 0 is written
 *   `zmul(u', …)`, which is 0 there: the chain rule's term vanishes with u'
 *   (ForwardDiff.jl's NaN-safe mode, "Advanced usage" of its documentation,
 *   applies the same rule to zero partials). So ∂/∂l of `(t/l)^k` is 0 at
 *   t = 0 for 0 < k < 1, where u^(k−1) is infinite, and ∂/∂a of `sqrt(a*t)`
 *   is 0 there too.
 * - exp(u)·u' where u' can be infinite (a division or logarithm inside) is
 *   `zmul(exp(u), u')`: 0 where exp(u) is 0, so ∂/∂b of `exp(-b/t)` is 0 at
 *   t = 0 (e^(−b/t)/t → 0 as t → 0⁺) and ∂/∂n of `exp(n*log(t))` too.
 *
 * Second derivatives of `powlog` and `zmul` are the plain product rules,
 * without these limits (nothing in Plumb takes second derivatives).
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { add, call, div, mul, negate, num, pow, sub } from "./_build.ts";
import { mentions } from "./_equal.ts";
import { CONSTANTS } from "./functions.ts";
import { simplify } from "./simplify.ts";

type Rule = (args: Expr[], d: Expr[]) => Expr;

const one = (at: Expr) => num(1, at);
const chain = (outer: Expr, du: Expr) => mul(outer, du);
const isNum = (e: Expr) => e.op === "num";

/** du·g, written `zmul(du, g)` (0 where du is 0) unless du is a number. */
function vanishing(du: Expr, g: Expr): Expr {
  return isNum(du) ? mul(g, du) : call("zmul", [du, g]);
}

/** True when `e` may be infinite at finite arguments: a division, logarithm, tangent or power. */
function maySingular(e: Expr): boolean {
  switch (e.op) {
    case "num":
    case "id":
      return false;
    case "neg":
      return maySingular(e.arg);
    case "/":
      return true;
    case "^":
      return !(isNum(e.right) && (e.right as { value: number }).value >= 0) ||
        maySingular(e.left);
    case "call":
      return ["log", "log10", "tan", "pow", "powlog"].includes(e.fn) || e.args.some(maySingular);
    default:
      return maySingular(e.left) || maySingular(e.right);
  }
}

/** d f(args) in terms of the arguments and their derivatives `d`. */
const RULES: Record<string, Rule> = {
  exp: ([u], [du]) =>
    maySingular(du) ? call("zmul", [call("exp", [u]), du]) : chain(call("exp", [u]), du),
  log: ([u], [du]) => div(du, u),
  log10: ([u], [du]) => div(du, mul(u, call("log", [num(10, u)]))),
  sqrt: ([u], [du]) =>
    isNum(du)
      ? div(du, mul(num(2, u), call("sqrt", [u])))
      : vanishing(du, div(one(u), mul(num(2, u), call("sqrt", [u])))),
  abs: ([u], [du]) => chain(call("sign", [u]), du),
  sin: ([u], [du]) => chain(call("cos", [u]), du),
  cos: ([u], [du]) => chain(negate(call("sin", [u])), du),
  tan: ([u], [du]) => div(du, pow(call("cos", [u]), num(2, u))),
  atan: ([u], [du]) => div(du, add(one(u), pow(u, num(2, u)))),
  tanh: ([u], [du]) => chain(sub(one(u), pow(call("tanh", [u]), num(2, u))), du),
  pow: ([u, v], [du, dv]) => power(u, v, du, dv),
  min: ([u, v], [du, dv]) => call("ifpos", [sub(u, v), dv, du]),
  max: ([u, v], [du, dv]) => call("ifpos", [sub(u, v), du, dv]),
  sign: ([u]) => num(0, u),
  ifpos: ([c, _t, _f], [_dc, dt, df]) => call("ifpos", [c, dt, df]),
  // d(uᵛ·ln u) = v'·uᵛ·(ln u)² + u'·u^(v−1)·(v·ln u + 1), plain (see the module notes).
  powlog: ([u, v], [du, dv]) =>
    add(
      mul(mul(call("powlog", [u, v]), call("log", [u])), dv),
      mul(mul(pow(u, sub(v, one(v))), add(mul(v, call("log", [u])), one(u))), du),
    ),
  zmul: ([a, b], [da, db]) => add(call("zmul", [da, b]), call("zmul", [a, db])),
};

/** d(u^v) by the general power rule, with the two common special cases (limits as in the module notes). */
function power(u: Expr, v: Expr, du: Expr, dv: Expr): Expr {
  const uv = pow(u, v);
  // v·u^(v−1)·u': plain when u^(v−1) cannot be infinite (v a number ≥ 1) or u' is a number.
  const dBase = () => {
    const wholeStep = isNum(v) && (v as { value: number }).value >= 1;
    const g = pow(u, sub(v, one(v)));
    return mul(v, wholeStep ? mul(g, du) : vanishing(du, g));
  };
  if (dv.op === "num" && dv.value === 0) return dBase(); // v constant
  if (du.op === "num" && du.value === 0) {
    // u constant: u^v·log(u)·v'; log(e) = 1; for a positive number u the log is finite.
    if (u.op === "num" || (u.op === "id" && u.name === "e")) {
      const logU = u.op === "num" ? call("log", [u]) : one(u);
      return maySingular(dv) ? call("zmul", [uv, mul(logU, dv)]) : mul(mul(uv, logU), dv);
    }
    return mul(call("powlog", [u, v]), dv);
  }
  // u^v·(v'·log(u) + v·u'/u) = powlog(u, v)·v' + v·u^(v−1)·u'
  return add(mul(call("powlog", [u, v]), dv), dBase());
}

/**
 * The exact derivative of `e` with respect to the identifier `name`,
 * simplified (d/da of `q0 - a*sqrt(cycle)` is `-sqrt(cycle)`).
 *
 * Every identifier other than `name` is held constant; `pi` and `e` are
 * constants. See the module notes for `abs`, `min` and `max` at their kinks.
 *
 * @param e The expression.
 * @param name The variable to differentiate by.
 * @returns The derivative tree (the number 0 when `e` does not use `name`,
 *   or when `name` is a constant).
 * @throws {Error} If `e` calls a function without a derivative rule (none in
 *   the current table).
 * @example
 * ```ts
 * import { derivative, format, parseExpression } from "./mod.ts";
 * const d = derivative(parseExpression("q0 - a*sqrt(cycle)"), "a");
 * if (format(d) !== "-sqrt(cycle)") throw new Error(format(d));
 * ```
 */
export function derivative(e: Expr, name: string): Expr {
  // The rules build simplified nodes; a final pass also tidies the parts of
  // `e` that were copied in unsimplified.
  if (CONSTANTS.has(name)) return num(0, e);
  return simplify(diff(e, name));
}

function diff(e: Expr, name: string): Expr {
  if (!mentions(e, name)) return num(0, e);
  switch (e.op) {
    case "num":
      return num(0, e);
    case "id":
      return num(e.name === name ? 1 : 0, e);
    case "neg":
      return negate(diff(e.arg, name));
    case "+":
      return add(diff(e.left, name), diff(e.right, name));
    case "-":
      return sub(diff(e.left, name), diff(e.right, name));
    case "*":
      return add(
        mul(diff(e.left, name), e.right),
        mul(e.left, diff(e.right, name)),
      );
    case "/":
      return quotient(e.left, e.right, name);
    case "^":
      return power(e.left, e.right, diff(e.left, name), diff(e.right, name));
    case "call": {
      const rule = Object.hasOwn(RULES, e.fn) ? RULES[e.fn] : undefined;
      if (rule === undefined) throw new Error(`No derivative rule for function "${e.fn}"`);
      return rule(e.args, e.args.map((a) => diff(a, name)));
    }
  }
}

/** d(u/v): u'/v when v is constant, otherwise (u'v - uv')/v^2. */
function quotient(u: Expr, v: Expr, name: string): Expr {
  const du = diff(u, name);
  if (!mentions(v, name)) return div(du, v);
  const dv = diff(v, name);
  return div(sub(mul(du, v), mul(u, dv)), pow(v, num(2, v)));
}
