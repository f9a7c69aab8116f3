/**
 * Normaliser of `exclude`: a list of entries, each with `rows` (a row number
 * or a list of them) and a non-empty `why`.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { didYouMean } from "../../kernel/suggest.ts";

/** One exclusion entry after normalising. */
export interface Exclusion {
  rows: number[];
  why: string;
}

function entryRows(v: unknown, i: number): number[] {
  if (v === undefined || v === null) {
    throw new CellError(`Exclusion ${i + 1} needs rows: the data row numbers to leave out`, [
      "exclude",
      i,
    ]);
  }
  const list = Array.isArray(v) ? v : [v];
  if (list.length === 0) {
    throw new CellError(`Exclusion ${i + 1} lists no rows`, ["exclude", i, "rows"]);
  }
  return list.map((r, j) => {
    if (typeof r !== "number" || !Number.isInteger(r) || r < 1) {
      throw new CellError(
        `Row ${
          JSON.stringify(r)
        } cannot be excluded: rows are whole numbers from 1 (the header is not a row)`,
        Array.isArray(v) ? ["exclude", i, "rows", j] : ["exclude", i, "rows"],
      );
    }
    return r;
  });
}

/**
 * Checks `exclude`. Row numbers are checked against the data in `run`.
 *
 * @param v The option's value.
 * @returns The entries in order.
 * @throws {CellError} For a non-list, an entry without rows or why, a row
 *   that is not a positive whole number, or a row listed twice.
 */
export function parseExclude(v: unknown): Exclusion[] {
  if (v === undefined || v === null) return [];
  if (!Array.isArray(v)) {
    throw new CellError(`Option "exclude" must be a list of entries with rows and why`, [
      "exclude",
    ]);
  }
  const seen = new Map<number, number>();
  return v.map((entry, i) => {
    if (typeof entry !== "object" || entry === null || Array.isArray(entry)) {
      throw new CellError(`Exclusion ${i + 1} must be a mapping with rows and why`, ["exclude", i]);
    }
    const e = entry as Record<string, unknown>;
    for (const key of Object.keys(e)) {
      if (key !== "rows" && key !== "why") {
        throw new CellError(
          `Exclusion ${i + 1} has an unknown key "${key}"${
            didYouMean(key, ["rows", "why"]) || ": use rows and why"
          }`,
          ["exclude", i, key],
        );
      }
    }
    const rows = entryRows(e.rows, i);
    if (typeof e.why !== "string" || e.why.trim() === "") {
      throw new CellError(
        `Exclusion ${i + 1} needs a reason: write why the rows are left out`,
        e.why === undefined ? ["exclude", i] : ["exclude", i, "why"],
      );
    }
    rows.forEach((r, j) => {
      const first = seen.get(r);
      if (first !== undefined) {
        throw new CellError(
          `Row ${r} is excluded twice: also in exclusion ${first + 1}`,
          Array.isArray(e.rows) ? ["exclude", i, "rows", j] : ["exclude", i, "rows"],
        );
      }
      seen.set(r, i);
    });
    return { rows, why: e.why.trim() };
  });
}
