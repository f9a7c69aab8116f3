/**
 * Row lists for messages.
 *
 * @module
 */

/**
 * `row 12` or `rows 12, 40, 41` (up to `limit` numbers, then `and 7 more`).
 *
 * @param rows Source row numbers.
 * @param limit How many to show.
 * @returns The phrase.
 */
export function rowList(rows: readonly number[], limit = 5): string {
  const shown = rows.slice(0, limit).join(", ");
  const more = rows.length > limit ? ` and ${rows.length - limit} more` : "";
  return `${rows.length === 1 ? "row" : "rows"} ${shown}${more}`;
}
