/**
 * Model shorthands: calls on the right side of a model that expand into
 * explicit terms with readable parameter names, before anything else sees
 * the tree.
 *
 * ```
 *  polynomial(x, 3)      ─▶  b0 + b1*x + b2*x^2 + b3*x^3
 *  linear(x1, x2, x3)    ─▶  b0 + b_x1*x1 + b_x2*x2 + b_x3*x3
 *  y = polynomial(x, 2) + c*exp(-k*x)   the shorthand is one operand like any other
 * ```
 *
 * Names: a shorthand's parameters share one prefix letter, `b` first. When
 * any of them would clash with a column, a constant, another name written in
 * the model or a name an earlier shorthand took, the whole shorthand moves to
 * the next free letter (`c0, c1, …` or `c0, c_x1, …`), then `d`, `f`, `g`, …
 * (`e` is the constant; `i`, `l` and `o` are skipped as easy to misread).
 * Every generated node carries the span of the shorthand call (columns keep
 * their own), so errors point at the call.
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { ExprError } from "./expr_error.ts";
import { CONSTANTS, FUNCTIONS } from "./functions.ts";
import { identifiers } from "./_identifiers.ts";
import { nearest } from "../suggest.ts";

type Call = Extract<Expr, { op: "call" }>;

/** Largest polynomial degree accepted (a guard against typos such as 200). */
export const MAX_DEGREE = 30;

const LETTERS = "bcdfghjkmnpqrstuvwxyza";

/**
 * Expands every shorthand call in `rhs`.
 *
 * @param rhs The right side as parsed with shorthands allowed.
 * @param columns The table's column names.
 * @param text The text the tree was parsed from (for quoting arguments).
 * @returns The expanded tree and the parameter names it generated.
 * @throws {ExprError} For a degree that is not a whole-number literal, an
 *   argument that is not a column, an unknown column (with "did you mean"),
 *   a repeated column or a wrong number of arguments.
 */
export function expandShorthands(
  rhs: Expr,
  columns: readonly string[],
  text: string,
): { rhs: Expr; generated: Set<string> } {
  const taken = new Set<string>([...columns, ...CONSTANTS.keys()]);
  for (const id of identifiers(rhs)) taken.add(id.name);
  const generated = new Set<string>();
  const walk = (e: Expr): Expr => {
    switch (e.op) {
      case "num":
      case "id":
        return e;
      case "neg":
        return { ...e, arg: walk(e.arg) };
      case "call":
        if (e.fn === "polynomial") return polynomial(e, columns, taken, generated, text);
        if (e.fn === "linear") return linear(e, columns, taken, generated);
        return { ...e, args: e.args.map(walk) };
      default:
        return { ...e, left: walk(e.left), right: walk(e.right) };
    }
  };
  return { rhs: walk(rhs), generated };
}

function polynomial(
  e: Call,
  columns: readonly string[],
  taken: Set<string>,
  generated: Set<string>,
  text: string,
): Expr {
  if (e.args.length !== 2) {
    throw new ExprError(
      `Shorthand "polynomial" takes 2 arguments, a column and a degree, got ${e.args.length}`,
      e.start,
      e.end - e.start,
    );
  }
  const x = columnArg(e, 0, columns);
  const d = e.args[1];
  if (d.op !== "num" || !Number.isInteger(d.value) || d.value < 0 || d.value > MAX_DEGREE) {
    const shown = text.slice(d.start, d.end);
    throw new ExprError(
      `Degree "${shown}" of polynomial() is not a whole number from 0 to ${MAX_DEGREE}: write it as a number, as in polynomial(${x.name}, 3)`,
      d.start,
      d.end - d.start,
    );
  }
  const suffixes = Array.from({ length: d.value + 1 }, (_, k) => String(k));
  const names = claim(suffixes, taken, generated, e);
  const span = { start: e.start, end: e.end };
  const terms = names.map((name, k): Expr => {
    const b: Expr = { op: "id", name, ...span };
    if (k === 0) return b;
    const power: Expr = k === 1
      ? x
      : { op: "^", left: x, right: { op: "num", value: k, ...span }, ...span };
    return { op: "*", left: b, right: power, ...span };
  });
  return sum(terms, span);
}

function linear(
  e: Call,
  columns: readonly string[],
  taken: Set<string>,
  generated: Set<string>,
): Expr {
  if (e.args.length === 0) {
    throw new ExprError(
      'Shorthand "linear" needs at least one column, as in linear(x1, x2)',
      e.start,
      e.end - e.start,
    );
  }
  const xs = e.args.map((_, k) => columnArg(e, k, columns));
  xs.forEach((x, k) => {
    const first = xs.findIndex((y) => y.name === x.name);
    if (first !== k) {
      throw new ExprError(
        `Column "${x.name}" appears twice in linear()`,
        x.start,
        x.end - x.start,
      );
    }
  });
  const names = claim(["0", ...xs.map((x) => `_${x.name}`)], taken, generated, e);
  const span = { start: e.start, end: e.end };
  const terms = names.map((name, k): Expr => {
    const b: Expr = { op: "id", name, ...span };
    return k === 0 ? b : { op: "*", left: b, right: xs[k - 1], ...span };
  });
  return sum(terms, span);
}

/** Argument k of a shorthand, which must name a column. */
function columnArg(e: Call, k: number, columns: readonly string[]): Extract<Expr, { op: "id" }> {
  const a = e.args[k];
  if (a.op === "id" && columns.includes(a.name) && !CONSTANTS.has(a.name)) return a;
  if (a.op === "id" && !CONSTANTS.has(a.name) && !FUNCTIONS.has(a.name)) {
    const near = nearest(a.name, columns);
    const tail = near === undefined
      ? `: the columns are ${columns.map((c) => `"${c}"`).join(", ")}`
      : `: did you mean "${near}"?`;
    throw new ExprError(
      `Unknown column "${a.name}" in ${e.fn}()${tail}`,
      a.start,
      a.end - a.start,
    );
  }
  throw new ExprError(
    `Argument ${k + 1} of ${e.fn}() is not a column: ${e.fn}() takes column names`,
    a.start,
    a.end - a.start,
  );
}

/** `${letter}${suffix}` for the first letter whose every name is free; marks them taken. */
function claim(
  suffixes: readonly string[],
  taken: Set<string>,
  generated: Set<string>,
  e: Call,
): string[] {
  for (const letter of LETTERS) {
    const names = suffixes.map((s) => letter + s);
    if (names.some((n) => taken.has(n) || FUNCTIONS.has(n))) continue;
    for (const n of names) {
      taken.add(n);
      generated.add(n);
    }
    return names;
  }
  throw new ExprError(
    `Cannot name the parameters of ${e.fn}(): every prefix letter is taken`,
    e.start,
    e.end - e.start,
  );
}

function sum(terms: Expr[], span: { start: number; end: number }): Expr {
  return terms.reduce((acc, t) => ({ op: "+", left: acc, right: t, ...span }));
}
