/**
 * Row numbers in words and in compact runs, for the run history's sentences
 * and records.
 *
 * @module
 */

/**
 * Ascending row numbers as runs: `[1, 2, 3, 7]` → `[[1, 3], [7, 7]]`.
 *
 * @param rows Row numbers, ascending.
 * @returns Inclusive runs.
 */
export function toRuns(rows: ArrayLike<number>): [number, number][] {
  const out: [number, number][] = [];
  for (let i = 0; i < rows.length; i++) {
    const r = rows[i];
    const last = out[out.length - 1];
    if (last && r === last[1] + 1) last[1] = r;
    else out.push([r, r]);
  }
  return out;
}

/**
 * Runs back to row numbers.
 *
 * @param runs Inclusive runs.
 * @returns The row numbers.
 */
export function fromRuns(runs: readonly (readonly [number, number])[]): number[] {
  const out: number[] = [];
  for (const [a, b] of runs) for (let r = a; r <= b; r++) out.push(r);
  return out;
}

/**
 * Row numbers in words: "row 7", "rows 121–160", "rows 3, 9–11 and 40 more".
 *
 * @param rows Row numbers (any order).
 * @param most How many runs to write out before "and N more".
 * @returns The phrase.
 * @example
 * ```ts
 * import { rowsInWords } from "./row_list.ts";
 * if (rowsInWords([121, 122, 123, 5]) !== "rows 5, 121–123") throw new Error(rowsInWords([121, 122, 123, 5]));
 * ```
 */
export function rowsInWords(rows: readonly number[], most = 6): string {
  if (rows.length === 0) return "no rows";
  if (rows.length === 1) return `row ${rows[0]}`;
  const runs = toRuns([...rows].sort((a, b) => a - b));
  const shown = runs.slice(0, most).map(([a, b]) => (a === b ? `${a}` : `${a}–${b}`));
  const rest = runs.slice(most).reduce((n, [a, b]) => n + b - a + 1, 0);
  return `rows ${shown.join(", ")}${rest > 0 ? ` and ${rest} more` : ""}`;
}
