/**
 * Simplifying node constructors: every node that {@link simplify} and
 * {@link derivative} build goes through these, so results come out in one
 * canonical, readable shape.
 *
 * The canonical shape:
 *
 * - Numbers fold when the result is finite and short (at most
 *   {@link FOLD_MAX_CHARS} characters), so `2*3` becomes `6` but `1/3` and
 *   `log(2)` stay as written, readable and exact.
 * - 0 and 1 identities: `x+0`, `x*1`, `x^1`, `x/1` give `x`; `0*x`, `0/x`
 *   give 0; `x^0`, `1^x`, `x/x` give 1; `x-x` gives 0; `x+x` gives `2*x`;
 *   `x*x` gives `x^2`.
 * - A product is a left-leaning chain with its numeric factor first and its
 *   sign on the leftmost factor: `a*(2*x)` becomes `2*a*x`, `a*-b` becomes
 *   `-a*b`; a sum absorbs a negative term: `a + -b` becomes `a - b`.
 *
 * Values are those of the input in real arithmetic wherever the input is
 * defined. Where it is not (NaN or infinite operands, division by zero),
 * the result may be defined (`0*x` is 0 even for infinite `x`). Regrouping a
 * product may change the last bits of a floating-point result.
 *
 * @module
 */
import type { BinaryOp, Expr } from "./expr.ts";
import { exprEquals } from "./_equal.ts";
import { FUNCTIONS } from "./functions.ts";

/** Longest decimal form a folded number may have. */
export const FOLD_MAX_CHARS = 12;

interface Span {
  start: number;
  end: number;
}

function span(...es: Span[]): Span {
  return { start: Math.min(...es.map((e) => e.start)), end: Math.max(...es.map((e) => e.end)) };
}

function foldable(v: number): boolean {
  return Number.isFinite(v) && String(v).length <= FOLD_MAX_CHARS;
}

function isNum(e: Expr, value?: number): e is Extract<Expr, { op: "num" }> {
  return e.op === "num" && (value === undefined || e.value === value);
}

function raw(op: BinaryOp, left: Expr, right: Expr): Expr {
  return { op, left, right, ...span(left, right) };
}

/** A number node spanning `at`. */
export function num(value: number, at: Span): Expr {
  return { op: "num", value, start: at.start, end: at.end };
}

/** True when `e` reads with a leading minus: a negative number, a negation, or a product led by one. */
export function isNegativeLeading(e: Expr): boolean {
  if (e.op === "num") return e.value < 0;
  if (e.op === "neg") return true;
  if (e.op === "*" || e.op === "/") return isNegativeLeading(e.left);
  return false;
}

/** `-e`, with the sign moved onto a number, into a product's leftmost factor or across a difference. */
export function negate(e: Expr): Expr {
  switch (e.op) {
    case "num":
      return num(-e.value, e);
    case "neg":
      return e.arg;
    case "-":
      return sub(e.right, e.left);
    case "*":
      return mul(negate(e.left), e.right);
    case "/":
      return div(negate(e.left), e.right);
    default:
      return { op: "neg", arg: e, ...span(e) };
  }
}

/** `l + r`. */
export function add(l: Expr, r: Expr): Expr {
  if (isNum(l) && isNum(r) && foldable(l.value + r.value)) {
    return num(l.value + r.value, span(l, r));
  }
  if (isNum(l, 0)) return r;
  if (isNum(r, 0)) return l;
  if (isNegativeLeading(r)) return sub(l, negate(r));
  if (isNegativeLeading(l)) return sub(r, negate(l));
  if (exprEquals(l, r)) return mul(num(2, l), l);
  return raw("+", l, r);
}

/** `l - r`. */
export function sub(l: Expr, r: Expr): Expr {
  if (isNum(l) && isNum(r) && foldable(l.value - r.value)) {
    return num(l.value - r.value, span(l, r));
  }
  if (isNum(r, 0)) return l;
  if (isNum(l, 0)) return negate(r);
  if (isNegativeLeading(r)) return add(l, negate(r));
  if (exprEquals(l, r)) return num(0, span(l, r));
  return raw("-", l, r);
}

/** `l * r`. */
export function mul(l: Expr, r: Expr): Expr {
  if (isNum(l) && isNum(r) && foldable(l.value * r.value)) {
    return num(l.value * r.value, span(l, r));
  }
  if (isNum(l, 0) || isNum(r, 0)) return num(0, span(l, r));
  if (isNum(l, 1)) return r;
  if (isNum(r, 1)) return l;
  if (isNum(l, -1)) return negate(r);
  if (isNum(r, -1)) return negate(l);
  if (isNum(r) && !isNum(l)) return mul(r, l);
  if (isNegativeLeading(r)) return negate(mul(l, negate(r)));
  if (r.op === "*") return mul(mul(l, r.left), r.right);
  if (exprEquals(l, r)) return pow(l, num(2, r));
  return raw("*", l, r);
}

/** `l / r`. */
export function div(l: Expr, r: Expr): Expr {
  if (isNum(l) && isNum(r) && foldable(l.value / r.value)) {
    return num(l.value / r.value, span(l, r));
  }
  if (isNum(r, 1)) return l;
  if (isNum(r, -1)) return negate(l);
  if (isNum(l, 0) && !isNum(r)) return num(0, span(l, r));
  if (isNegativeLeading(r)) return negate(div(l, negate(r)));
  if (exprEquals(l, r)) return num(1, span(l, r));
  return raw("/", l, r);
}

/** `l ^ r`. */
export function pow(l: Expr, r: Expr): Expr {
  if (isNum(l) && isNum(r) && foldable(Math.pow(l.value, r.value))) {
    return num(Math.pow(l.value, r.value), span(l, r));
  }
  if (isNum(r, 1)) return l;
  if (isNum(r, 0) || isNum(l, 1)) return num(1, span(l, r));
  return raw("^", l, r);
}

/** `fn(args…)`; the name must be in the function table. */
export function call(fn: string, args: Expr[]): Expr {
  const info = FUNCTIONS.get(fn);
  if (info !== undefined && args.every((a) => isNum(a))) {
    const v = info.evaluate(...args.map((a) => (a as { value: number }).value));
    if (foldable(v)) return num(v, span(...args));
  }
  if (fn === "ifpos" && isNum(args[0])) return args[0].value > 0 ? args[1] : args[2];
  if (fn === "ifpos" && exprEquals(args[1], args[2])) return args[1];
  if (fn === "abs" && isNegativeLeading(args[0])) return call(fn, [negate(args[0])]);
  return { op: "call", fn, args, ...span(...args) };
}
