/**
 * The points of a `predict` cell: the `at` values checked against the fit's
 * predictor columns and paired element by element (a list of one value, or
 * a scalar, applies to every point).
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { didYouMean } from "../../kernel/suggest.ts";
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
  const missing = cols.filter((c) => !(c in at));
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
