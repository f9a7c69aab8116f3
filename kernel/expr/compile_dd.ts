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
 * 2001, the QD library). The tree is compiled to one row loop (as
 * {@link compile} does for doubles) that calls those routines node by node
 * on pairs of locals: a node that does not depend on the row (numbers,
 * parameters, `pi`, `e`) is computed once before the loop, and repeated
 * subtrees once per row. Nothing is allocated per node or per row (the
 * node-by-node evaluation over whole columns it replaced made two arrays
 * per node and call, and took about 1.2× as long on 100 rows); the values
 * are the same, operation for operation.
 *
 * ```
 *  b1*exp(-b2*x)            x: (hi[i], lo[i])   b1, b2: (hi, lo)
 *
 *   neg b2 ─▶ before the loop    per row: × x ─▶ exp ─▶ b1 × ─▶ out[i]
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
import { cachedFunction } from "./_kernel_cache.ts";
import { literal } from "./_codegen.ts";

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
  const nc = columns.length, np = params.length;
  // One generated loop per pattern of columns without low parts (usually one pattern).
  const kernels = new Map<string, Kernel>();
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
    let exact = "";
    for (let j = 0; j < nc; j++) {
      const lo = colsLo[j];
      if (colsHi[j].length < n || (lo !== null && lo.length < n)) {
        throw new RangeError(`Column "${columns[j]}" has ${colsHi[j].length} rows: ${n} needed`);
      }
      exact += lo === null ? "1" : "0";
    }
    const hi = outHi ?? new Float64Array(n), lo = outLo ?? new Float64Array(n);
    if (hi.length < n || lo.length < n) {
      throw new RangeError(`Output has ${Math.min(hi.length, lo.length)} rows: ${n} needed`);
    }
    let kernel = kernels.get(exact);
    if (kernel === undefined) {
      kernel = rowLoop(e, columns, params, [...exact].map((c) => c === "1"));
      kernels.set(exact, kernel);
    }
    kernel(colsHi, colsLo, paramsHi, paramsLo, n, hi, lo, UNARY, BINARY, R);
    return { hi, lo };
  };
}

type Kernel = (
  colsHi: readonly ArrayLike<number>[],
  colsLo: readonly (ArrayLike<number> | null)[],
  paramsHi: ArrayLike<number>,
  paramsLo: ArrayLike<number> | null,
  n: number,
  hi: Float64Array,
  lo: Float64Array,
  unary: Record<string, Unary>,
  binary: Record<string, Binary>,
  r: Float64Array,
) => void;

/** A node's value in the generated code: its hi and lo as source, and whether it varies by row. */
interface Code {
  h: string;
  l: string;
  row: boolean;
}

/**
 * One row loop evaluating the whole tree in double-double, as JavaScript
 * source (built with `new Function` and kept by its text, `_kernel_cache.ts`).
 * Each distinct subtree (by structural key) is computed once: before the loop
 * when it does not depend on the row, else once per row. Every node calls
 * the routine of `UNARY`/`BINARY` on the same operands a node-by-node
 * evaluation over whole columns would, so the values are the same; a column
 * without low parts (`exact`) reads as low part 0, as does its negation.
 *
 * ```
 *  b1*exp(-b2*x)          x exact: its low part is the literal 0
 *
 *  const p1h = paramsHi[1], p1l = …;          pre: the row-independent nodes
 *  const v0h = (- p1h), v0l = (- p1l);
 *  for (let i = 0; i < n; i++) {
 *    const c0h = ch0[i];
 *    f_mul(v0h, v0l, c0h, 0, r); const v1h = r[0], v1l = r[1];
 *    f_exp(v1h, v1l, r); const v2h = r[0], v2l = r[1];
 *    …
 *    hi[i] = v3h; lo[i] = v3l;
 *  }
 * ```
 */
function rowLoop(
  e: Expr,
  columns: readonly string[],
  params: readonly string[],
  exact: readonly boolean[],
): Kernel {
  const keyOf = structuralKeys();
  const done = new Map<string, Code>();
  const pre: string[] = [], body: string[] = [], fns = new Map<string, string>();
  const fn = (table: "unary" | "binary", name: string) => {
    const k = `${table}:${name}`;
    let v = fns.get(k);
    if (v === undefined) {
      v = `f${fns.size}`;
      fns.set(k, v);
      pre.push(`const ${v} = ${table}[${JSON.stringify(name)}];`);
    }
    return v;
  };
  let count = 0;
  /** Binds the routine's result (in r) to new names, before the loop or in it. */
  const result = (call: string, row: boolean): Code => {
    const v = `v${count++}`;
    (row ? body : pre).push(`${call}; const ${v}h = r[0], ${v}l = r[1];`);
    return { h: `${v}h`, l: `${v}l`, row };
  };
  const bind = (h: string, l: string, row: boolean): Code => {
    const v = `v${count++}`;
    (row ? body : pre).push(`const ${v}h = ${h}, ${v}l = ${l};`);
    return { h: `${v}h`, l: `${v}l`, row };
  };
  const gen = (n: Expr): Code => {
    const key = keyOf(n);
    let c = done.get(key);
    if (c === undefined) {
      c = genNode(n);
      done.set(key, c);
    }
    return c;
  };
  const genNode = (n: Expr): Code => {
    switch (n.op) {
      case "num":
        return { h: literal(n.value), l: "0", row: false };
      case "id":
        return leafCode(n.name);
      case "neg": {
        const a = gen(n.arg);
        // A column's missing low part stays 0 under negation (not −0).
        return bind(`(- ${a.h})`, a.row && a.l === "0" ? "0" : `(- ${a.l})`, a.row);
      }
      case "call": {
        const args = n.args.map(gen);
        const row = args.some((a) => a.row);
        if (n.fn === "ifpos") {
          const [c, t, f] = args;
          return bind(`(${c.h} > 0 ? ${t.h} : ${f.h})`, `(${c.h} > 0 ? ${t.l} : ${f.l})`, row);
        }
        if (args.length === 1) {
          return result(`${fn("unary", n.fn)}(${args[0].h}, ${args[0].l}, r)`, row);
        }
        return result(`${fn("binary", n.fn)}(${operands(args)}, r)`, row);
      }
      default: {
        const a = gen(n.left), b = gen(n.right);
        return result(`${fn("binary", n.op)}(${operands([a, b])}, r)`, a.row || b.row);
      }
    }
  };
  const reads: string[] = [];
  const leafCode = (name: string): Code => {
    if (name === "pi") return { h: literal(D.PI[0]), l: literal(D.PI[1]), row: false };
    if (name === "e") return { h: literal(D.E[0]), l: literal(D.E[1]), row: false };
    const c = columns.indexOf(name);
    if (c >= 0) {
      if (!done.has(`column ${c}`)) {
        done.set(`column ${c}`, { h: "", l: "", row: true });
        pre.push(`const ch${c} = colsHi[${c}]${exact[c] ? "" : `, cl${c} = colsLo[${c}]`};`);
        reads.push(`const c${c}h = ch${c}[i]${exact[c] ? "" : `, c${c}l = cl${c}[i]`};`);
      }
      return { h: `c${c}h`, l: exact[c] ? "0" : `c${c}l`, row: true };
    }
    const p = params.indexOf(name);
    if (!done.has(`param ${p}`)) {
      done.set(`param ${p}`, { h: "", l: "", row: false });
      pre.push(`const p${p}h = paramsHi[${p}], p${p}l = paramsLo === null ? 0 : paramsLo[${p}];`);
    }
    return { h: `p${p}h`, l: `p${p}l`, row: false };
  };
  const out = gen(e);
  const src = [
    '"use strict";',
    ...pre,
    "for (let i = 0; i < n; i++) {",
    ...reads.map((s) => `  ${s}`),
    ...body.map((s) => `  ${s}`),
    `  hi[i] = ${out.h}; lo[i] = ${out.l};`,
    "}",
  ].join("\n");
  return cachedFunction(
    ["colsHi", "colsLo", "paramsHi", "paramsLo", "n", "hi", "lo", "unary", "binary", "r"],
    src,
  ) as Kernel;
}

function operands(args: readonly Code[]): string {
  return args.map((a) => `${a.h}, ${a.l}`).join(", ");
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
