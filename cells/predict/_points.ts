/**
 * The points of a `predict` cell: the `at` values checked against the fit's
 * predictor columns and paired element by element (a list of one value, or
 * a scalar, applies to every point); the fitted range of each predictor
 * column, the points outside it, and the extrapolation warning that names
 * them (column, values, point numbers, range).
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { hasOwnKey } from "../../kernel/own.ts";
import { didYouMean } from "../../kernel/suggest.ts";
import type { RunContext } from "../../kernel/contract/mod.ts";
import type { Fit } from "../fit/mod.ts";
import type { PredictSpec } from "./spec.ts";

/** Points as columns (one array per `fit.model.columns` entry) and their count. */
export interface Points {
  cols: Float64Array[];
  n: number;
}

/**
 * Builds the points from `spec.at`.
 *
 * @param name The predict cell's name.
 * @param spec The spec (`at` not null).
 * @param fit The fit.
 * @returns The points.
 * @throws {CellError} At `at.<key>` for a key that is not a predictor column
 *   (with did-you-mean), or at `at` when predictor columns have no value.
 */
export function pointsOf(name: string, spec: PredictSpec, fit: Fit): Points {
  const at = spec.at ?? {};
  const cols = fit.model.columns;
  for (const key of Object.keys(at)) {
    if (cols.includes(key)) continue;
    const why = key === fit.model.responseColumn
      ? `it is the response of fit "${spec.fit}", not a predictor`
      : `fit "${spec.fit}" has ${
        cols.length === 0 ? "no predictor columns" : `predictors ${quoted(cols)}`
      }${didYouMean(key, cols)}`;
    throw new CellError(`Column "${key}" in "at" of predict "${name}" is not used: ${why}`, [
      "at",
      key,
    ]);
  }
  const missing = cols.filter((c) => !hasOwnKey(at, c));
  if (missing.length > 0) {
    throw new CellError(
      `Predict "${name}" has no value in "at" for ${
        missing.length === 1 ? "predictor column" : "predictor columns"
      } ${quoted(missing)} of fit "${spec.fit}": give one, as in at: { ${missing[0]}: [1, 2] }`,
      ["at"],
    );
  }
  const n = Math.max(1, ...cols.map((c) => at[c].length));
  return {
    n,
    cols: cols.map((c) =>
      Float64Array.from({ length: n }, (_, i) => at[c][at[c].length === 1 ? 0 : i])
    ),
  };
}

/** `"a", "b"`. */
export function quoted(names: readonly string[]): string {
  return names.map((c) => `"${c}"`).join(", ");
}

/**
 * The fitted range of each model column.
 *
 * @param fit The fit.
 * @returns [low, high] per `fit.model.columns` entry.
 */
export function fittedRanges(fit: Fit): [number, number][] {
  return fit.columns.map((v) => {
    let lo = Infinity, hi = -Infinity;
    for (const x of v) if (!Number.isNaN(x)) [lo, hi] = [Math.min(lo, x), Math.max(hi, x)];
    return [lo, hi];
  });
}

/**
 * Whether point i lies outside the fitted range in any column.
 *
 * @param ranges The fitted ranges.
 * @param pts The points.
 * @param i The point.
 * @returns True when extrapolated.
 */
export function outside(ranges: [number, number][], pts: Points, i: number): boolean {
  return ranges.some(([lo, hi], j) => pts.cols[j][i] < lo || pts.cols[j][i] > hi);
}

/**
 * Warns, per column, about points outside the fitted range.
 *
 * @param ctx The run context (its warning sink).
 * @param spec The spec (the fit's name).
 * @param fit The fit.
 * @param pts The points.
 */
export function warnExtrapolation(ctx: RunContext, spec: PredictSpec, fit: Fit, pts: Points) {
  fittedRanges(fit).forEach(([lo, hi], j) => {
    const bad: number[] = [];
    for (let i = 0; i < pts.n; i++) if (pts.cols[j][i] < lo || pts.cols[j][i] > hi) bad.push(i);
    if (bad.length === 0) return;
    const values = [...new Set(bad.map((i) => pts.cols[j][i]))].join(", ");
    ctx.warn(
      `Extrapolation: "${fit.model.columns[j]}" = ${values} (${
        bad.length === 1 ? "point" : "points"
      } ${
        bad.map((i) => i + 1).join(", ")
      }) lies outside the range fitted by "${spec.fit}", [${lo}, ${hi}]`,
    );
  });
}
