/**
 * Normaliser of inline data, the compact form
 *
 * ```yaml
 * columns: [cycle, capacity]
 * rows:
 *   - [1, 2500.2]
 *   - [2, NA]
 * ```
 *
 * one list of values per row, in the order of `columns`. Values are numbers,
 * texts, or empty (`null`, `~`); texts are read the way a file's fields are
 * (so `NA` is missing and a quoted "2.5" is a number).
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";

/** Inline data: column names and one list of values per row. */
export interface InlineData {
  columns: string[];
  rows: (number | string | null)[][];
}

function columnNames(v: unknown): string[] {
  if (!Array.isArray(v) || v.length === 0) {
    throw new CellError(
      `Inline rows need columns: a list of column names such as [cycle, capacity]`,
      v === undefined ? ["rows"] : ["columns"],
    );
  }
  const seen = new Map<string, number>();
  return v.map((c, i) => {
    const name = typeof c === "string" || typeof c === "number" ? String(c).trim() : "";
    if (name === "") {
      throw new CellError(`Column ${i + 1} has no name: columns must be texts`, ["columns", i]);
    }
    const first = seen.get(name);
    if (first !== undefined) {
      throw new CellError(`Columns ${first + 1} and ${i + 1} are both named "${name}"`, [
        "columns",
        i,
      ]);
    }
    seen.set(name, i);
    return name;
  });
}

/**
 * Checks inline `columns` and `rows`.
 *
 * @param columns The `columns` option.
 * @param rows The `rows` option.
 * @returns The inline data.
 * @throws {CellError} For missing or repeated column names, a row that is
 *   not a list, a row with the wrong number of values, or a value that is
 *   neither a number, a text nor empty.
 */
export function parseInline(columns: unknown, rows: unknown): InlineData {
  const names = columnNames(columns);
  if (!Array.isArray(rows)) {
    throw new CellError(`Option "rows" must be a list of rows, each a list of values`, ["rows"]);
  }
  const out = rows.map((row, i) => {
    if (!Array.isArray(row)) {
      throw new CellError(`Row ${i + 1} must be a list of values such as [1, 2500.2]`, ["rows", i]);
    }
    if (row.length !== names.length) {
      throw new CellError(
        `Row ${i + 1} has ${row.length} value${
          row.length === 1 ? "" : "s"
        }, expected ${names.length} ` +
          `(one per column)`,
        ["rows", i],
      );
    }
    return row.map((v, j) => {
      if (v === null || typeof v === "string") return v;
      if (typeof v === "number" && Number.isFinite(v)) return v;
      throw new CellError(
        `Value ${JSON.stringify(v) ?? String(v)} in row ${
          i + 1
        } cannot be read: use a number, a text or leave it empty`,
        ["rows", i, j],
      );
    });
  });
  return { columns: names, rows: out };
}
