/**
 * The model equation of one subset, as a `fit` cell writes it (the
 * expression language of kernel/expr; docs/expressions.md):
 *
 * ```
 *  intercept, terms       yield = linear(temp, feed)        (the shorthand: b0 + b_temp*temp + …)
 *  intercept, no term     yield = b0
 *  no intercept           yield = b_temp*temp + b_feed*feed
 * ```
 *
 * The shorthand names its own parameters clear of the columns. The other two
 * forms take the shorthand's names with the first prefix letter (the
 * shorthand's order: `b`, `c`, `d`, `f`, …) whose every name is free, so a
 * column called `b0` does not turn into a parameter.
 *
 * @module
 */
import { CONSTANTS } from "../../kernel/expr/mod.ts";

/** Prefix letters in the order the model shorthands try them (kernel/expr/_shorthands.ts). */
const LETTERS = "bcdfghjkmnpqrstuvwxyza";

/**
 * The model of a subset.
 *
 * @param response The response column.
 * @param terms The predictor columns (always held ones first, then the chosen candidates).
 * @param intercept Whether the model has an intercept.
 * @param columns Every column of the table (names a parameter must not take).
 * @returns The equation `response = …`.
 * @throws {RangeError} Without an intercept and without terms (no model).
 * @example
 * ```ts
 * import { subsetModel } from "./model_text.ts";
 * const cols = ["y", "x1", "b0"];
 * if (subsetModel("y", ["x1"], true, cols) !== "y = linear(x1)") throw new Error("shorthand");
 * if (subsetModel("y", [], true, cols) !== "y = c0") throw new Error("b0 is a column");
 * if (subsetModel("y", ["x1"], false, cols) !== "y = b_x1*x1") throw new Error("no intercept");
 * ```
 */
export function subsetModel(
  response: string,
  terms: readonly string[],
  intercept: boolean,
  columns: readonly string[],
): string {
  if (intercept && terms.length > 0) return `${response} = linear(${terms.join(", ")})`;
  if (!intercept && terms.length === 0) {
    throw new RangeError("A model without an intercept needs at least one term");
  }
  const taken = new Set<string>([...columns, ...CONSTANTS.keys()]);
  const names = (letter: string) => intercept ? [`${letter}0`] : terms.map((t) => `${letter}_${t}`);
  const letter = [...LETTERS].find((l) => names(l).every((n) => !taken.has(n))) ?? "b";
  if (intercept) return `${response} = ${letter}0`;
  return `${response} = ${terms.map((t) => `${letter}_${t}*${t}`).join(" + ")}`;
}
