/**
 * Row numbers in messages: the one way the kinds name the rows a message is
 * about, so "row 12", "rows 12, 40, 41" and "and 7 more" read alike in a
 * fit's refusal, a comparison's warning and a check's finding.
 *
 * Two forms, for two kinds of sentence:
 *
 * - {@link rowList}: an error or warning names the first few rows and counts
 *   the rest (`rows 2, 3, 4, 5, 6 and 2 more`);
 * - {@link rowsInFull}: a finding that has already picked its few rows
 *   names every one as a sentence would (`rows 3, 17 and 22`).
 *
 * @module
 */

/**
 * `row 12` or `rows 12, 40, 41`: at most `limit` entries, then `and 7 more`.
 *
 * @param rows Source row numbers, or entries that start with one (`3 (-1)`).
 * @param limit How many to show.
 * @returns The phrase.
 * @example
 * ```ts
 * import { rowList } from "./rows.ts";
 * if (rowList([12]) !== "row 12") throw new Error(rowList([12]));
 * const many = rowList([2, 3, 4, 5, 6, 7, 8]);
 * if (many !== "rows 2, 3, 4, 5, 6 and 2 more") throw new Error(many);
 * ```
 */
export function rowList(rows: readonly (number | string)[], limit = 5): string {
  const shown = rows.slice(0, limit).join(", ");
  const more = rows.length > limit ? ` and ${rows.length - limit} more` : "";
  return `${rows.length === 1 ? "row" : "rows"} ${shown}${more}`;
}

/**
 * `row 3` or `rows 3, 17 and 22`: every row, the last joined by "and".
 *
 * @param rows Source row numbers (at least one).
 * @returns The phrase.
 * @example
 * ```ts
 * import { rowsInFull } from "./rows.ts";
 * if (rowsInFull([3, 17, 22]) !== "rows 3, 17 and 22") throw new Error(rowsInFull([3, 17, 22]));
 * ```
 */
export function rowsInFull(rows: readonly number[]): string {
  if (rows.length === 1) return `row ${rows[0]}`;
  return `rows ${rows.slice(0, -1).join(", ")} and ${rows[rows.length - 1]}`;
}
