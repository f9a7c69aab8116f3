/**
 * Options of a `predict` cell that take one value for every point or one
 * value per point (`weight: 0.25` or `weight: [1, 0.25, 0.04]`): a list is
 * paired element by element with the points of `at`, and with the values of
 * `solve`, as `at`'s own lists are with each other (common practice, no
 * source).
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { type ParseContext, shown } from "../../kernel/contract/mod.ts";

/** How many points `at` gives and how many values `solve` gives (0: the option is absent). */
export interface PointCounts {
  at: number;
  solve: number;
}

/**
 * Reads a positive number or a list of them, one per point.
 *
 * @param ctx The parse context.
 * @param key The option, e.g. "weight".
 * @param expected What a value must be, e.g. "a positive weight".
 * @param counts The points of `at` and the values of `solve`.
 * @returns The values as a list (one value: a list of one), or undefined when absent.
 * @throws {CellError} At `key` (or `key.i`) for a value that is not a finite
 *   positive number, an empty list, or a list whose length matches neither
 *   one value nor the points.
 * @example
 * ```ts
 * import { perPoint } from "./_per_point.ts";
 * const ctx = {
 *   name: "eol", kind: "predict", body: "", warn() {}, options: { weight: [1, 0.25] },
 *   settings: { title: "", confidence: 0.95, seed: 1, criterion: "aicc", maxFileBytes: 1, extra: {} },
 * };
 * const w = perPoint(ctx, "weight", "a positive weight", { at: 2, solve: 0 });
 * if (w?.join() !== "1,0.25") throw new Error(String(w));
 * ```
 */
export function perPoint(
  ctx: ParseContext,
  key: string,
  expected: string,
  counts: PointCounts,
): number[] | undefined {
  const v = ctx.options[key];
  if (v === undefined || v === null) return undefined;
  const where = `"${key}" of predict "${ctx.name}"`;
  const list = Array.isArray(v) ? v : [v];
  if (list.length === 0) {
    throw new CellError(
      `Option ${where} is an empty list: expected ${expected}, or one per point`,
      [key],
    );
  }
  list.forEach((x, i) => {
    if (typeof x === "number" && Number.isFinite(x) && x > 0) return;
    throw Array.isArray(v)
      ? new CellError(`Value "${shown(x)}" in ${where} is not ${expected}`, [key, i])
      : new CellError(`Option ${where} is "${shown(x)}": expected ${expected}`, [key]);
  });
  if (list.length > 1) {
    for (
      const [option, n, what] of [["at", counts.at, "points"], [
        "solve",
        counts.solve,
        "values",
      ]] as const
    ) {
      if (n === 0 || n === list.length) continue;
      throw new CellError(
        `Option ${where} has ${list.length} values, but "${option}" gives ${n} ${what}: give one value for all, or one per point`,
        [key],
      );
    }
  }
  return list as number[];
}
