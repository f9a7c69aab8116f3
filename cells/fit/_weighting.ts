/**
 * Weights for a fit problem, from the `weights` or `known_sigma` option:
 * evaluates the expression over the table's columns on the rows the fit
 * uses, leaves out rows where a column it reads is missing and rows of
 * zero weight (each counted in a warning), refuses negative, NaN or
 * infinite weights (and zero, negative or non-finite standard deviations)
 * naming the rows, and returns the problem restricted to the remaining rows
 * with `weights` set (w = 1/σ² for known standard deviations).
 *
 * @module
 */
import {
  compile,
  type Expr,
  ExprError,
  freeNames,
  parseColumnExpression,
} from "../../kernel/expr/mod.ts";
import { CellError } from "../../kernel/errors.ts";
import { quotedList } from "../../kernel/linalg/mod.ts";
import type { NumberColumn, Table } from "../../kernel/contract/mod.ts";
import type { FitSpec } from "./spec.ts";
import type { FitProblem } from "./problem.ts";
import { countRows, identifierOffset } from "./_offsets.ts";
import { rowList } from "../shared/rows.ts";

/** How the rows are weighted. */
export type Weighting = "none" | "relative" | "absolute";

/**
 * Sets `problem.weights` from the spec, dropping rows as described above.
 *
 * @param problem The unweighted problem (rows without missing model values).
 * @param spec The fit's spec.
 * @param table The table fitted.
 * @param warn Records a warning on the cell.
 * @returns The weighting mode and the (possibly smaller) weighted problem.
 * @throws {CellError} At `weights` or `known_sigma`: a bad expression, a text
 *   column, or a value that is not a valid weight or standard deviation.
 */
export function applyWeighting(
  problem: FitProblem,
  spec: FitSpec,
  table: Table,
  warn: (message: string) => void,
): { weighting: Weighting; problem: FitProblem } {
  const key = spec.weights !== undefined
    ? "weights"
    : spec.knownSigma !== undefined
    ? "known_sigma"
    : null;
  if (key === null) return { weighting: "none", problem };
  const text = (key === "weights" ? spec.weights : spec.knownSigma)!;
  const expr = parseAgainst(text, table, key);
  const names = [...freeNames(expr)].filter((c) => table.columns.some((x) => x.name === c));
  const cols = names.map((c) => numberColumn(problem.name, table, c, key, expr));
  const index = new Map<number, number>();
  table.rows.forEach((r, i) => index.set(r, i));
  const at = Array.from(problem.rows, (r) => index.get(r)!);
  const values = cols.map((c) => Float64Array.from(at, (i) => c.values[i]));
  const v = compile(expr, names, [])(values, [], problem.n);
  const keep: number[] = [], missing: number[] = [], zero: number[] = [], bad: number[] = [];
  for (let i = 0; i < problem.n; i++) {
    if (values.some((c) => Number.isNaN(c[i]))) missing.push(i);
    else if (key === "weights" ? !(v[i] >= 0 && v[i] < Infinity) : !(v[i] > 0 && v[i] < Infinity)) {
      bad.push(i);
    } else if (v[i] === 0) zero.push(i);
    else keep.push(i);
  }
  if (bad.length > 0) throw refusal(problem, key, text, bad.map((i) => [problem.rows[i], v[i]]));
  const rowsOf = (ix: number[]) => rowList(ix.map((i) => problem.rows[i]));
  if (missing.length > 0) {
    warn(
      `${countRows(missing.length)} left out for missing values in ${
        quotedList(names)
      } of "${key}": ${rowsOf(missing)}`,
    );
  }
  if (zero.length > 0) {
    warn(
      `${countRows(zero.length)} of weight 0 left out of the fit (not counted in n): ${
        rowsOf(zero)
      }`,
    );
  }
  const sub = keep.length === problem.n ? problem : subset(problem, keep);
  const w = Float64Array.from(keep, (i) => (key === "weights" ? v[i] : 1 / (v[i] * v[i])));
  const rowsMissing = withMissing(problem.rowsMissing, missing.map((i) => problem.rows[i]));
  return {
    weighting: key === "weights" ? "relative" : "absolute",
    problem: { ...sub, weights: w, ...(rowsMissing ? { rowsMissing } : {}) },
  };
}

/** The rows left out for the model's columns and for the weights', ascending; undefined when none. */
function withMissing(before: Int32Array | undefined, more: number[]): Int32Array | undefined {
  if (more.length === 0) return before;
  return Int32Array.from([...(before ?? []), ...more]).sort();
}

/**
 * A weighting expression parsed against a table's columns.
 *
 * @param text The expression as written.
 * @param table The table.
 * @param key The option (`weights` or `known_sigma`), for messages.
 * @returns The expression.
 * @throws {CellError} On the option, at the offending place.
 */
export function parseAgainst(text: string, table: Table, key: string): Expr {
  try {
    return parseColumnExpression(text, table.columns.map((c) => c.name));
  } catch (e) {
    if (e instanceof ExprError) {
      // The expression parser speaks of derived columns; here it is the weighting option.
      const message = e.message.replace("a derived column may use", `"${key}" may use`);
      throw new CellError(message, [key], e.offset);
    }
    throw e;
  }
}

function numberColumn(name: string, table: Table, col: string, key: string, e: Expr): NumberColumn {
  const c = table.columns.find((x) => x.name === col)!;
  if (c.type !== "number") {
    throw new CellError(
      `Cannot fit "${name}": column "${col}" of "${key}" holds text, not numbers`,
      [key],
      identifierOffset(e, col),
    );
  }
  return c;
}

/** `Cannot fit "cal": weight "w" is negative, NaN or infinite in rows 3 (-1), 7 (NaN): …`. */
function refusal(
  problem: FitProblem,
  key: string,
  text: string,
  bad: [number, number][],
): CellError {
  const rows = rowList(bad.map(([r, x]) => `${r} (${x})`));
  const message = key === "weights"
    ? `weight "${text}" is negative, NaN or infinite in ${rows}: weights must be finite and at least 0`
    : `known standard deviation "${text}" is zero, negative, NaN or infinite in ${rows}: each must be finite and positive`;
  return new CellError(`Cannot fit "${problem.name}": ${message}`, [key]);
}

/** The problem on the rows `keep` (indexes into the problem's rows). */
function subset(p: FitProblem, keep: number[]): FitProblem {
  const pick = (v: Float64Array) => Float64Array.from(keep, (i) => v[i]);
  const pickOrNull = (v: Float64Array | null) => (v === null ? null : pick(v));
  return {
    ...p,
    n: keep.length,
    columns: p.columns.map(pick),
    y: pick(p.y),
    rows: Int32Array.from(keep, (i) => p.rows[i]),
    lo: p.lo && {
      columns: p.lo.columns.map(pickOrNull),
      response: { hi: pick(p.lo.response.hi), lo: pickOrNull(p.lo.response.lo) },
    },
  };
}
