/**
 * JavaScript source for an expression tree, shared by {@link compile} and
 * {@link compileScalar}.
 *
 * Each subtree gets a structural key; a subtree that occurs more than once
 * is computed once into a `const`, and (inside a row loop) a subtree that
 * does not depend on the row is hoisted in front of the loop:
 *
 * ```
 *  a*exp(-b*x) + c*exp(-b*x)     (x a column; a, b, c parameters)
 *
 *  const h0 = (- p1);                  hoisted: no column inside
 *  for (...) {
 *    const x0 = c0[i];
 *    const t1 = (h0 * x0);              shared by both terms,
 *    const t2 = Math.exp(t1);           computed once per row
 *    out[i] = ((p0 * t2) + (p2 * t2));
 *  }
 * ```
 *
 * User text never reaches the source: names become generated variables and
 * numbers are written with `String`, so the generated code is safe to eval.
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { ExprError } from "./expr_error.ts";
import { FUNCTIONS } from "./functions.ts";
import { makeInterner } from "./_interner.ts";

/** How an identifier appears in the source and whether it changes per row. */
export interface Resolved {
  code: string;
  varies: boolean;
}

/** Generated statements and the result expression. */
export interface Generated {
  /** Statements to run once, before any loop. */
  pre: string[];
  /** Statements to run for every evaluation (every row). */
  body: string[];
  /** JavaScript expression for the value. */
  result: string;
}

/** Generated statements and one result expression per tree (see {@link generateAll}). */
export interface GeneratedAll {
  pre: string[];
  body: string[];
  results: string[];
}

type IdNode = Extract<Expr, { op: "id" }>;

function fn(n: Extract<Expr, { op: "call" }>) {
  const info = FUNCTIONS.get(n.fn);
  if (info === undefined) {
    throw new ExprError(`Unknown function "${n.fn}"`, n.start, n.end - n.start);
  }
  return info;
}

/** A double as JavaScript source that reads back as the same double (−0 included). */
export function literal(v: number): string {
  if (Number.isNaN(v)) return "NaN";
  if (v === Infinity) return "Infinity";
  if (v === -Infinity) return "(-Infinity)";
  if (v < 0 || Object.is(v, -0)) return `(-${String(-v)})`;
  return String(v);
}

function children(e: Expr): Expr[] {
  if (e.op === "num" || e.op === "id") return [];
  if (e.op === "neg") return [e.arg];
  if (e.op === "call") return e.args;
  return [e.left, e.right];
}

/**
 * Generates source for `e`.
 *
 * @param e The tree.
 * @param resolve Source and row-dependence of each identifier.
 * @param hoist True inside a row loop: put row-independent work in `pre`.
 */
export function generate(e: Expr, resolve: (node: IdNode) => Resolved, hoist: boolean): Generated {
  const g = generateAll([e], resolve, hoist);
  return { pre: g.pre, body: g.body, result: g.results[0] };
}

/**
 * Generates source for several trees evaluated together (a model's partial
 * derivatives): a subtree that occurs in more than one of them is computed
 * once, as a repeated subtree of one tree is. Each value is the same double
 * as the tree compiled alone gives (the same operations on the same inputs).
 *
 * @param es The trees.
 * @param resolve Source and row-dependence of each identifier.
 * @param hoist True inside a row loop: put row-independent work in `pre`.
 */
export function generateAll(
  es: readonly Expr[],
  resolve: (node: IdNode) => Resolved,
  hoist: boolean,
): GeneratedAll {
  const key = new Map<Expr, string>();
  const count = new Map<string, number>();
  const varies = new Map<Expr, boolean>();
  const ids = new Map<Expr, string>();
  const intern = makeInterner();

  const analyse = (n: Expr): string => {
    const known = key.get(n); // a subtree shared by reference (derivatives share them)
    if (known !== undefined) {
      count.set(known, count.get(known)! + 1);
      return known;
    }
    const kids = children(n);
    const ks = kids.map(analyse);
    let k: string;
    let v = kids.some((c) => varies.get(c));
    if (n.op === "num") k = `n${literal(n.value)}`;
    else if (n.op === "id") {
      const r = resolve(n);
      ids.set(n, r.code);
      k = `i${r.code}`;
      v = r.varies;
    } else if (n.op === "neg") k = intern(`(-${ks[0]})`);
    else if (n.op === "call") k = intern(`${n.fn}(${ks.join(",")})`);
    else k = intern(`(${ks[0]}${n.op}${ks[1]})`);
    key.set(n, k);
    varies.set(n, v);
    count.set(k, (count.get(k) ?? 0) + 1);
    return k;
  };
  for (const e of es) analyse(e);

  const pre: string[] = [], body: string[] = [];
  const named = new Map<string, string>();
  const emit = (n: Expr): string => {
    if (n.op === "num") return literal(n.value);
    if (n.op === "id") return ids.get(n)!;
    const k = key.get(n)!;
    const done = named.get(k);
    if (done !== undefined) return done;
    const a = children(n).map(emit);
    let code: string;
    if (n.op === "neg") code = `(- ${a[0]})`;
    else if (n.op === "call") {
      const info = fn(n);
      code = info.js(info.namedArgs ? a.map((c, i) => bind(n.args[i], c)) : a);
    } else if (n.op === "^") code = `Math.pow(${a[0]}, ${a[1]})`;
    else code = `(${a[0]} ${n.op} ${a[1]})`;
    const invariant = hoist && !varies.get(n);
    if (count.get(k)! < 2 && !invariant) return code;
    const name = `${invariant ? "h" : "t"}${named.size}`;
    (invariant ? pre : body).push(`const ${name} = ${code};`);
    named.set(k, name);
    return name;
  };
  /** A name for the value of `n` (whose code is `code`), so code that repeats it computes it once. */
  const bind = (n: Expr, code: string): string => {
    if (/^[\w$.]+$/.test(code) || /^\(-[\w.+-]+\)$/.test(code)) return code; // a name or a number
    const invariant = hoist && !varies.get(n);
    const name = `${invariant ? "h" : "t"}${named.size}`;
    (invariant ? pre : body).push(`const ${name} = ${code};`);
    named.set(key.get(n)!, name);
    return name;
  };
  const results = es.map(emit);
  return { pre, body, results };
}
