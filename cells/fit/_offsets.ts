/**
 * Places in a fit's messages: where a name appears in a model's text (for
 * errors placed on the identifier), row counts, and which term is not finite
 * at which rows.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import type { Expr } from "../../kernel/expr/mod.ts";
import type { NotFinite } from "../../kernel/optim/mod.ts";
import { type AliasedColumn, leastSquares, quotedList } from "../../kernel/linalg/mod.ts";
import { rowList } from "../shared/rows.ts";
import type { FitProblem } from "./problem.ts";

/** Offset of the first identifier `name` in `e` (left to right), or undefined. */
export function identifierOffset(e: Expr, name: string): number | undefined {
  switch (e.op) {
    case "num":
      return undefined;
    case "id":
      return e.name === name ? e.start : undefined;
    case "neg":
      return identifierOffset(e.arg, name);
    case "call":
      for (const a of e.args) {
        const at = identifierOffset(a, name);
        if (at !== undefined) return at;
      }
      return undefined;
    default:
      return identifierOffset(e.left, name) ?? identifierOffset(e.right, name);
  }
}

/** `1 row` / `3 rows`. */
export function countRows(k: number): string {
  return `${k} ${k === 1 ? "row" : "rows"}`;
}

/** How many rows a not-finite phrase names (the rest are counted). */
const SHOWN = 5;

/**
 * `log(t) is not finite at rows 1, 12 (t = 0)`: the term, the source rows and
 * the values of the term's columns there.
 *
 * @param nf Where the model or a derivative is not finite (row indexes of the problem).
 * @param problem The problem (source row numbers and column values).
 * @returns The phrase (no final period).
 */
export function notFinitePhrase(nf: NotFinite, problem: FitProblem): string {
  const shown = nf.rows.slice(0, SHOWN);
  const values = nf.columns.map((c) => {
    const col = problem.columns[problem.model.columns.indexOf(c)];
    return { c, vs: [...new Set(shown.map((i) => number(col[i])))] };
  });
  const sep = values.every((v) => v.vs.length === 1) ? ", " : "; ";
  const where = values.length === 0
    ? ""
    : ` (${values.map((v) => `${v.c} = ${v.vs.join(", ")}`).join(sep)})`;
  return `${nf.term} is not finite at ${
    rowList(nf.rows.map((i) => problem.rows[i]), SHOWN)
  }${where}`;
}

/**
 * The refusal of a model (or derivative) that is not finite: the term, its rows and what to
 * do. A term without parameters cannot be mended by start values (`log(t)` at t = 0).
 *
 * @param problem The problem.
 * @param nf Where it is not finite.
 * @param start The start values as text (`k = 1, n = 2`), or null when there were none.
 * @returns The error, on `start` or (for a term without parameters) on `model` at the term.
 */
export function notFiniteError(
  problem: FitProblem,
  nf: NotFinite,
  start: string | null,
): CellError {
  const phrase = notFinitePhrase(nf, problem);
  const advice = nf.usesParameters
    ? "choose other start values"
    : "leave those rows out or change the model";
  const at = start === null ? "" : ` for the start values (${start})`;
  const message = nf.derivativeBy === undefined
    ? `${phrase}${nf.usesParameters ? at : ""}`
    : `the model's derivative by "${nf.derivativeBy}" is not finite${
      nf.usesParameters ? at : ""
    }: ${phrase}`;
  return nf.usesParameters
    ? new CellError(`Cannot fit "${problem.name}": ${message}: ${advice}`, ["start"])
    : new CellError(
      `Cannot fit "${problem.name}": ${message}: ${advice}`,
      ["model"],
      nf.derivativeBy === undefined ? nf.start : undefined,
    );
}

/**
 * The refusal of a Jacobian that is singular at the solution: the parameters not identifiable
 * and, when the in-order aliasing of its columns (kernel/linalg, as for linear terms) finds them,
 * which derivatives they repeat (`the model's derivative by "b" is a multiple of that by "a"`).
 *
 * @param problem The problem.
 * @param idx Indexes of the parameters the covariance found not identifiable.
 * @param wjac The (weighted) Jacobian at the solution, n×p column-major.
 * @returns The error, on `model`.
 */
export function singularError(problem: FitProblem, idx: number[], wjac: Float64Array): CellError {
  const params = problem.model.parameters, n = problem.n;
  const aliasing = aliasedDerivatives(params, n, wjac);
  const names = aliasing.length > 0 ? aliasing.map((a) => a.name) : idx.map((j) => params[j]);
  const why = aliasing.length > 0
    ? aliasing.map(derivativePhrase).join("; ")
    : `${
      names.length === 1 ? "its" : "their"
    } effect on the model is a combination of the other parameters'`;
  return new CellError(
    `Cannot fit "${problem.name}": the Jacobian is singular at the solution: ${quotedList(names)} ${
      names.length === 1 ? "is" : "are"
    } not identifiable from these data: ${why}`,
    ["model"],
  );
}

/** The aliased columns of J in parameter order (none when the linear solver sees full rank). */
function aliasedDerivatives(
  params: readonly string[],
  n: number,
  wjac: Float64Array,
): AliasedColumn[] {
  const cols = params.map((_, j) => wjac.slice(j * n, (j + 1) * n));
  if (!cols.every((c) => c.every(Number.isFinite))) return [];
  const r = leastSquares(cols, new Float64Array(n), params);
  return r.fullRank ? [] : r.aliasing;
}

function derivativePhrase(a: AliasedColumn): string {
  if (a.of.length === 0) return `the model's derivative by "${a.name}" is 0 in every row`;
  if (a.of.length === 1) {
    return `the model's derivative by "${a.name}" is a multiple of that by "${a.of[0]}"`;
  }
  return `the model's derivative by "${a.name}" is a linear combination of those by ${
    quotedList(a.of)
  }`;
}

function number(v: number): string {
  return Number.isFinite(v) ? Number(v.toPrecision(6)).toString() : String(v);
}
