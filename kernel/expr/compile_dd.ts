/**
 * Evaluating an expression row-wise in double-double arithmetic.
 *
 * Signature (kept stable; the nonlinear solver relies on it):
 *
 * ```text
 * compileDD(e: Expr, columns: readonly string[], params: readonly string[]): (
 *   colsHi: readonly ArrayLike<number>[], colsLo: readonly (ArrayLike<number> | null)[],
 *   paramsHi: ArrayLike<number>, paramsLo: ArrayLike<number> | null,
 *   n: number, outHi?: Float64Array, outLo?: Float64Array,
 * ) => { hi: Float64Array; lo: Float64Array }
 * ```
 *
 * Method: each value is hi + lo, two doubles (about 32 significant digits);
 * the scalar routines are in `_dd_math.ts` (Dekker 1971; Hida, Li & Bailey
 * 2001, the QD library). The tree is evaluated one node at a time over all
 * rows (column-at-a-time), not compiled to source: each node becomes a pair
 * of Float64Arrays, or one double-double when it does not depend on the row
 * (numbers, parameters, `pi`, `e`), and repeated subtrees are evaluated once.
 *
 * ```
 *  b1*exp(-b2*x)            x: (hi[], lo[])   b1, b2: (hi, lo)
 *
 *   neg b2 ─▶ scalar    × x ─▶ rows    exp ─▶ rows    b1 × ─▶ rows ─▶ out
 * ```
 *
 * Semantics follow {@link compile}: `x^k` with an integer k is binary
 * powering in double-double (exact products, so `x^3` is x·x·x to 32
 * digits); other powers are e^(k·ln x), NaN for negative x; `log` of a
 * negative number is NaN; the internal `powlog` and `zmul` keep the limits
 * of functions.ts (0 at u = 0, 0 where the first factor is 0); nothing
 * throws. Number literals are taken as the
 * double they parse to (exact for integers and binary fractions such as 0.5;
 * `0.1` carries the 1e−17 error of its double).
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { ExprError } from "./expr_error.ts";
import * as D from "./_dd_math.ts";
import { makeInterner } from "./_interner.ts";

/** A function evaluated in double-double (see the module header). */
export type CompiledDD = (
  colsHi: readonly ArrayLike<number>[],
  colsLo: readonly (ArrayLike<number> | null)[],
  paramsHi: ArrayLike<number>,
  paramsLo: ArrayLike<number> | null,
  n: number,
  outHi?: Float64Array,
  outLo?: Float64Array,
) => { hi: Float64Array; lo: Float64Array };

/** A node's value: one double-double (`c`) or one per row (`v`). */
type Val =
  | { c: true; h: number; l: number }
  | { c: false; h: ArrayLike<number>; l: ArrayLike<number> | null };

type Unary = (ah: number, al: number, r: Float64Array) => void;
type Binary = (ah: number, al: number, bh: number, bl: number, r: Float64Array) => void;

const R = new Float64Array(2);

const UNARY: Record<string, Unary> = {
  exp: D.exp,
  log: D.log,
  log10: (h, l, r) => (D.log(h, l, r), D.div(r[0], r[1], D.LN10[0], D.LN10[1], r)),
  sqrt: D.sqrt,
  abs: (h, l, r) => (h < 0 || (h === 0 && l < 0) ? (r[0] = -h, r[1] = -l) : (r[0] = h, r[1] = l)),
  sin: D.sin,
  cos: D.cos,
  tan: D.tan,
  atan: D.atan,
  tanh: D.tanh,
  sign: (h, _l, r) => (r[0] = Math.sign(h), r[1] = 0),
};

const less = (ah: number, al: number, bh: number, bl: number) => ah < bh || (ah === bh && al < bl);
const pick = (r: Float64Array, h: number, l: number) => (r[0] = h, r[1] = l);
const nan = (r: Float64Array) => (r[0] = NaN, r[1] = 0);

const P = new Float64Array(2);

/** uᵛ·ln u, 0 at u = 0 for v > 0 (its limit; see derivative.ts). */
function powlog(uh: number, ul: number, vh: number, vl: number, r: Float64Array): void {
  if (uh === 0 && (vh > 0 || (vh === 0 && vl > 0))) return void (r[0] = 0, r[1] = 0);
  D.pow(uh, ul, vh, vl, P);
  const ph = P[0], pl = P[1];
  D.log(uh, ul, P);
  D.mul(ph, pl, P[0], P[1], r);
}

const BINARY: Record<string, Binary> = {
  "+": D.add,
  "-": (ah, al, bh, bl, r) => D.add(ah, al, -bh, -bl, r),
  "*": D.mul,
  "/": D.div,
  "^": D.pow,
  pow: D.pow,
  powlog,
  zmul: (ah, al, bh, bl, r) => (ah === 0 ? (r[0] = 0, r[1] = 0) : D.mul(ah, al, bh, bl, r)),
  min: (ah, al, bh, bl, r) =>
    Number.isNaN(ah) || Number.isNaN(bh)
      ? nan(r)
      : less(bh, bl, ah, al)
      ? pick(r, bh, bl)
      : pick(r, ah, al),
  max: (ah, al, bh, bl, r) =>
    Number.isNaN(ah) || Number.isNaN(bh)
      ? nan(r)
      : less(ah, al, bh, bl)
      ? pick(r, bh, bl)
      : pick(r, ah, al),
};

/**
 * Compiles `e` for evaluation in double-double: rows `0 … n-1` of the columns
 * given as hi and lo parts (a null lo means the column is exact doubles), with
 * parameter values hi + lo (null lo: zeros). Results go to `outHi`/`outLo`
 * (new arrays when omitted) and are returned.
 *
 * @param e The tree; `pi` and `e` are always the constants (to 32 digits).
 * @param columns Column names, in the order the columns will be passed.
 * @param params Parameter names, in the order their values will be passed.
 * @returns The evaluator. It throws a `RangeError` when given the wrong
 *   number of columns or parameters, or arrays shorter than `n`.
 * @throws {ExprError} If `e` uses a name that is neither a column nor a
 *   parameter, or an unknown function.
 * @example
 * ```ts
 * import { compileDD, parseExpression } from "./mod.ts";
 * const f = compileDD(parseExpression("x/3"), ["x"], []);
 * const { hi, lo } = f([[1]], [null], [], null, 1);
 * // fl(1/3) = 1/3 − 2^−54/3, so the low part is 2^−54/3 (to 1e−33)
 * if (hi[0] !== 1 / 3 || Math.abs(lo[0] - 2 ** -54 / 3) > 1e-33) throw new Error("1/3");
 * ```
 */
export function compileDD(
  e: Expr,
  columns: readonly string[],
  params: readonly string[],
): CompiledDD {
  check(e, columns, params);
  const keyOf = structuralKeys();
  const nc = columns.length, np = params.length;
  return (colsHi, colsLo, paramsHi, paramsLo, n, outHi, outLo) => {
    if (colsHi.length !== nc || colsLo.length !== nc) {
      throw new RangeError(`Expected ${nc} columns, got ${colsHi.length}`);
    }
    if (paramsHi.length !== np || (paramsLo !== null && paramsLo.length !== np)) {
      throw new RangeError(`Expected ${np} parameters, got ${paramsHi.length}`);
    }
    if (!Number.isInteger(n) || n < 0) {
      throw new RangeError(`Row count "${n}" is not a whole number`);
    }
    for (let j = 0; j < nc; j++) {
      const lo = colsLo[j];
      if (colsHi[j].length < n || (lo !== null && lo.length < n)) {
        throw new RangeError(`Column "${columns[j]}" has ${colsHi[j].length} rows: ${n} needed`);
      }
    }
    const hi = outHi ?? new Float64Array(n), lo = outLo ?? new Float64Array(n);
    if (hi.length < n || lo.length < n) {
      throw new RangeError(`Output has ${Math.min(hi.length, lo.length)} rows: ${n} needed`);
    }
    const ctx: Ctx = {
      columns,
      params,
      colsHi,
      colsLo,
      paramsHi,
      paramsLo,
      n,
      memo: new Map(),
      keyOf,
    };
    const v = evaluate(e, ctx);
    for (let i = 0; i < n; i++) {
      hi[i] = v.c ? v.h : v.h[i];
      lo[i] = v.c ? v.l : v.l === null ? 0 : v.l[i];
    }
    return { hi, lo };
  };
}

interface Ctx {
  columns: readonly string[];
  params: readonly string[];
  colsHi: readonly ArrayLike<number>[];
  colsLo: readonly (ArrayLike<number> | null)[];
  paramsHi: ArrayLike<number>;
  paramsLo: ArrayLike<number> | null;
  n: number;
  memo: Map<string, Val>;
  keyOf: (e: Expr) => string;
}

/** Throws the errors {@link compile} would, before any row is seen. */
function check(e: Expr, columns: readonly string[], params: readonly string[]): void {
  if (e.op === "id") {
    const known = e.name === "pi" || e.name === "e" || columns.includes(e.name) ||
      params.includes(e.name);
    if (!known) {
      throw new ExprError(
        `Unknown name "${e.name}": it is neither a column nor a parameter`,
        e.start,
        e.end - e.start,
      );
    }
  } else if (e.op === "neg") check(e.arg, columns, params);
  else if (e.op === "call") {
    const ok = Object.hasOwn(UNARY, e.fn)
      ? e.args.length === 1
      : Object.hasOwn(BINARY, e.fn)
      ? e.args.length === 2
      : e.fn === "ifpos" && e.args.length === 3;
    if (!ok) throw new ExprError(`Unknown function "${e.fn}"`, e.start, e.end - e.start);
    for (const a of e.args) check(a, columns, params);
  } else if (e.op !== "num") {
    check(e.left, columns, params);
    check(e.right, columns, params);
  }
}

/**
 * Structural keys of a tree's nodes, made once per compiled function: equal
 * subtrees get equal keys and are evaluated once (`_interner.ts`).
 */
function structuralKeys(): (e: Expr) => string {
  const intern = makeInterner();
  const byNode = new Map<Expr, string>();
  const keyOf = (e: Expr): string => {
    let k = byNode.get(e);
    if (k !== undefined) return k;
    switch (e.op) {
      case "num":
        k = `n${e.value}`;
        break;
      case "id":
        k = `i${e.name}`;
        break;
      case "neg":
        k = intern(`(-${keyOf(e.arg)})`);
        break;
      case "call":
        k = intern(`${e.fn}(${e.args.map(keyOf).join(",")})`);
        break;
      default:
        k = intern(`(${keyOf(e.left)}${e.op}${keyOf(e.right)})`);
    }
    byNode.set(e, k);
    return k;
  };
  return keyOf;
}

function evaluate(e: Expr, ctx: Ctx): Val {
  const key = ctx.keyOf(e);
  const done = ctx.memo.get(key);
  if (done !== undefined) return done;
  const v = evaluateNode(e, ctx);
  ctx.memo.set(key, v);
  return v;
}

function evaluateNode(e: Expr, ctx: Ctx): Val {
  switch (e.op) {
    case "num":
      return { c: true, h: e.value, l: 0 };
    case "id":
      return leaf(e.name, ctx);
    case "neg": {
      const a = evaluate(e.arg, ctx);
      if (a.c) return { c: true, h: -a.h, l: -a.l };
      return { c: false, h: Float64Array.from(a.h, (x) => -x), l: negated(a.l, ctx.n) };
    }
    case "call": {
      const args = e.args.map((a) => evaluate(a, ctx));
      if (e.fn === "ifpos") return choose(args, ctx.n);
      if (args.length === 1) return unary(UNARY[e.fn], args[0], ctx.n);
      return binary(BINARY[e.fn], args[0], args[1], ctx.n);
    }
    default:
      return binary(BINARY[e.op], evaluate(e.left, ctx), evaluate(e.right, ctx), ctx.n);
  }
}

function leaf(name: string, ctx: Ctx): Val {
  if (name === "pi") return { c: true, h: D.PI[0], l: D.PI[1] };
  if (name === "e") return { c: true, h: D.E[0], l: D.E[1] };
  const c = ctx.columns.indexOf(name);
  if (c >= 0) return { c: false, h: ctx.colsHi[c], l: ctx.colsLo[c] };
  const p = ctx.params.indexOf(name);
  return { c: true, h: ctx.paramsHi[p], l: ctx.paramsLo === null ? 0 : ctx.paramsLo[p] };
}

function negated(l: ArrayLike<number> | null, n: number): Float64Array | null {
  if (l === null) return null;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = -l[i];
  return out;
}

function unary(f: Unary, a: Val, n: number): Val {
  if (a.c) {
    f(a.h, a.l, R);
    return { c: true, h: R[0], l: R[1] };
  }
  const H = new Float64Array(n), L = new Float64Array(n);
  const ah = a.h, al = a.l;
  for (let i = 0; i < n; i++) {
    f(ah[i], al === null ? 0 : al[i], R);
    H[i] = R[0];
    L[i] = R[1];
  }
  return { c: false, h: H, l: L };
}

function binary(f: Binary, a: Val, b: Val, n: number): Val {
  if (a.c && b.c) {
    f(a.h, a.l, b.h, b.l, R);
    return { c: true, h: R[0], l: R[1] };
  }
  const H = new Float64Array(n), L = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const ah = a.c ? a.h : a.h[i], al = a.c ? a.l : a.l === null ? 0 : a.l[i];
    const bh = b.c ? b.h : b.h[i], bl = b.c ? b.l : b.l === null ? 0 : b.l[i];
    f(ah, al, bh, bl, R);
    H[i] = R[0];
    L[i] = R[1];
  }
  return { c: false, h: H, l: L };
}

/** `ifpos(c, t, f)`: t where c > 0, otherwise f (also where c is NaN). */
function choose(args: Val[], n: number): Val {
  const [c, t, f] = args;
  const at = (v: Val, i: number): [number, number] =>
    v.c ? [v.h, v.l] : [v.h[i], v.l === null ? 0 : v.l[i]];
  if (c.c) return c.h > 0 ? t : f;
  const H = new Float64Array(n), L = new Float64Array(n);
  for (let i = 0; i < n; i++) [H[i], L[i]] = at(c.h[i] > 0 ? t : f, i);
  return { c: false, h: H, l: L };
}
