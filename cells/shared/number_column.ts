/**
 * A table's number column by name, for kinds that read columns of a table
 * (chart, search): an unknown name gets the nearest one or the table's
 * columns; a text column says what needed numbers.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { didYouMean } from "../../kernel/suggest.ts";
import type { NumberColumn, OptionPath, Table } from "../../kernel/contract/mod.ts";

/** Who asks and why, for the messages: `Cannot chart "c"`, `the x axis needs numbers`. */
export interface ColumnAsker {
  /** The start of every message, e.g. `Cannot chart "overview"`. */
  cannot: string;
  /** The name of the table cell read (`on`). */
  on: string;
  /** What needs the numbers, e.g. `the x axis needs numbers`. */
  needs: string;
  /** Where the column was named. */
  path: OptionPath;
}

/**
 * The number column `column` of `table`.
 *
 * @param table The table.
 * @param column The column's name as written.
 * @param ask Who asks, for the messages.
 * @returns The column.
 * @throws {CellError} At `ask.path` for an unknown or text column.
 * @example
 * ```ts
 * import { numberColumnOf } from "./number_column.ts";
 * const table = { type: "Table", columns: [{ name: "cycle", type: "number", unit: null,
 *   values: new Float64Array([1]), lo: null, missing: 0 }], rows: new Int32Array([1]),
 *   rowsRead: 1, excluded: [], sha256: null, source: null } as never;
 * const ask = { cannot: 'Cannot chart "c"', on: "t", needs: "the x axis needs numbers", path: ["x"] };
 * try {
 *   numberColumnOf(table, "cycel", ask);
 *   throw new Error("refused");
 * } catch (e) {
 *   if (!String(e).includes('did you mean "cycle"')) throw e;
 * }
 * ```
 */
export function numberColumnOf(table: Table, column: string, ask: ColumnAsker): NumberColumn {
  const c = table.columns.find((c) => c.name === column);
  if (c === undefined) {
    const names = table.columns.map((c) => c.name);
    const hint = didYouMean(column, names) ||
      `: table "${ask.on}" has ${names.map((n) => `"${n}"`).join(", ")}`;
    throw new CellError(`${ask.cannot}: unknown column "${column}"${hint}`, ask.path);
  }
  if (c.type !== "number") {
    throw new CellError(`${ask.cannot}: column "${column}" holds text, and ${ask.needs}`, ask.path);
  }
  return c;
}
