/**
 * Test helpers: a seeded generator, a reference tree-walking evaluator,
 * span-free views of trees and random expressions.
 *
 * The evaluator is deliberately the plainest possible reading of the
 * language, independent of the code generator, so compiled results can be
 * checked against it.
 *
 * @module
 */
import type { Expr } from "./expr.ts";

/** Mulberry32, a small seeded generator (common practice, no source). */
export function rng(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const REF_FUNCTIONS: Record<string, (...a: number[]) => number> = {
  exp: Math.exp,
  log: Math.log,
  log10: Math.log10,
  sqrt: Math.sqrt,
  abs: Math.abs,
  sin: Math.sin,
  cos: Math.cos,
  tan: Math.tan,
  atan: Math.atan,
  tanh: Math.tanh,
  pow: Math.pow,
  min: Math.min,
  max: Math.max,
  sign: Math.sign,
  ifpos: (c, t, f) => (c > 0 ? t : f),
  powlog: (u, v) => (u === 0 && v > 0 ? 0 : u ** v * Math.log(u)),
  zmul: (a, b) => (a === 0 ? 0 : a * b),
};

/** Evaluates `e` by walking the tree; `env` gives every identifier but `pi` and `e`. */
export function evaluate(e: Expr, env: Record<string, number>): number {
  switch (e.op) {
    case "num":
      return e.value;
    case "id":
      if (e.name === "pi") return Math.PI;
      if (e.name === "e") return Math.E;
      if (!(e.name in env)) throw new Error(`no value for ${e.name}`);
      return env[e.name];
    case "neg":
      return -evaluate(e.arg, env);
    case "call":
      return REF_FUNCTIONS[e.fn](...e.args.map((a) => evaluate(a, env)));
    case "+":
      return evaluate(e.left, env) + evaluate(e.right, env);
    case "-":
      return evaluate(e.left, env) - evaluate(e.right, env);
    case "*":
      return evaluate(e.left, env) * evaluate(e.right, env);
    case "/":
      return evaluate(e.left, env) / evaluate(e.right, env);
    case "^":
      return Math.pow(evaluate(e.left, env), evaluate(e.right, env));
  }
}

/**
 * `evaluate`, but NaN when any subexpression is NaN or infinite: the value of
 * `e` where it is defined in real arithmetic, and NaN elsewhere.
 */
export function evaluateDefined(e: Expr, env: Record<string, number>): number {
  let defined = true;
  const walk = (n: Expr): void => {
    if (n.op === "neg") walk(n.arg);
    else if (n.op === "call") n.args.forEach(walk);
    else if (n.op !== "num" && n.op !== "id") {
      walk(n.left);
      walk(n.right);
    }
    if (!Number.isFinite(evaluate(n, env))) defined = false;
  };
  walk(e);
  return defined ? evaluate(e, env) : NaN;
}

/** A span-free, fully parenthesised rendering: `(+ a (* b c))`. */
export function show(e: Expr): string {
  switch (e.op) {
    case "num":
      return Object.is(e.value, -0) ? "-0" : String(e.value);
    case "id":
      return e.name;
    case "neg":
      return `(neg ${show(e.arg)})`;
    case "call":
      return `(${e.fn} ${e.args.map(show).join(" ")})`;
    default:
      return `(${e.op} ${show(e.left)} ${show(e.right)})`;
  }
}

const UNARY = ["exp", "log", "log10", "sqrt", "abs", "sin", "cos", "tan", "atan", "tanh"];
const BINARY = ["pow", "min", "max"];
const OPS = ["+", "-", "*", "/", "^"] as const;
const NUMS = [0, 1, 2, 0.5, 3, -1, -2.5, 1e-3, 10];

/** A random tree of depth at most `depth` over `names`, shaped as the parser would build it. */
export function randomExpr(next: () => number, names: readonly string[], depth: number): Expr {
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(next() * xs.length)];
  const at = { start: 0, end: 0 };
  const r = next();
  if (depth <= 0 || r < 0.2) {
    if (next() < 0.35) return { op: "num", value: pick(NUMS), ...at };
    return { op: "id", name: pick([...names, "pi", "e"]), ...at };
  }
  const sub = () => randomExpr(next, names, depth - 1);
  if (r < 0.3) {
    // The parser folds a minus into a number literal; so does the generator.
    const arg = sub();
    return arg.op === "num" ? { ...arg, value: -arg.value } : { op: "neg", arg, ...at };
  }
  if (r < 0.45) return { op: "call", fn: pick(UNARY), args: [sub()], ...at };
  if (r < 0.5) return { op: "call", fn: pick(BINARY), args: [sub(), sub()], ...at };
  return { op: pick(OPS), left: sub(), right: sub(), ...at };
}

/** True when two numbers agree to a relative tolerance (NaN equals NaN). */
export function close(a: number, b: number, rel: number, abs = 0): boolean {
  if (Number.isNaN(a) || Number.isNaN(b)) return Number.isNaN(a) && Number.isNaN(b);
  if (!Number.isFinite(a) || !Number.isFinite(b)) return a === b;
  return Math.abs(a - b) <= Math.max(abs, rel * Math.max(Math.abs(a), Math.abs(b)));
}
