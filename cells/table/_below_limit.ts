/**
 * Values below a detection limit in a table (issue 20 item 2): a column
 * named in `below_limit` may hold values written `<L` — below the limit L —
 * beside measured numbers. It becomes a number column holding L on those
 * rows, with a flag per row (`NumberColumn.below`) that fits read as
 * left-censoring.
 *
 * ```table water
 * from: data/nitrate.csv
 * below_limit: [nitrate]        # cells such as "<0.05" are below the limit 0.05
 * ```
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { nearest } from "../../kernel/suggest.ts";
import type { Column, NumberColumn } from "../../kernel/contract/mod.ts";

/** `<` then a number (any spaces, a sign, an exponent); the number is the limit. */
const BELOW = /^\s*<\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*$/;

/**
 * Reads `below_limit`: one column name or a list of them.
 *
 * @param v The option's value.
 * @returns The names.
 * @throws {CellError} When it is not a name or a list of names.
 */
export function parseBelowLimit(v: unknown): string[] {
  const list = Array.isArray(v) ? v : [v];
  return list.map((name, i) => {
    if (typeof name !== "string" || name.trim() === "") {
      throw new CellError(
        `Option "below_limit" names the columns whose cells may be written <L (below the detection limit L), as in below_limit: [nitrate]`,
        Array.isArray(v) ? ["below_limit", i] : ["below_limit"],
      );
    }
    return name.trim();
  });
}

/**
 * The columns named in `below_limit` as number columns with their flags.
 *
 * @param columns The table's columns as read (all rows).
 * @param names The columns named.
 * @param rowNumber The source row number of row index i (for messages).
 * @returns The columns, the named ones replaced.
 * @throws {CellError} For a name that is no column, or a cell that is neither a number,
 *   `<number` nor missing (at its row).
 */
export function withBelowLimit<C extends { name: string; type: string }>(
  columns: C[],
  names: readonly string[],
  rowNumber: (i: number) => number,
): (C | NumberColumn)[] {
  const out: (C | NumberColumn)[] = [...columns];
  names.forEach((name, k) => {
    const at = columns.findIndex((c) => c.name === name);
    if (at < 0) {
      const near = nearest(name, columns.map((c) => c.name), 2);
      throw new CellError(
        `below_limit names "${name}", which is not a column${
          near ? `: did you mean "${near}"?` : ""
        }`,
        names.length === 1 ? ["below_limit"] : ["below_limit", k],
      );
    }
    out[at] = flagged(columns[at] as unknown as Column, rowNumber);
  });
  return out;
}

function flagged(c: Column, rowNumber: (i: number) => number): NumberColumn {
  if (c.type === "number") {
    return { ...c, below: new Uint8Array(c.values.length) };
  }
  const n = c.values.length;
  const values = new Float64Array(n);
  const below = new Uint8Array(n);
  let missing = 0;
  for (let i = 0; i < n; i++) {
    const text = c.values[i];
    if (text === null || text.trim() === "") {
      values[i] = NaN;
      missing++;
      continue;
    }
    const m = BELOW.exec(text);
    if (m !== null) {
      values[i] = Number(m[1]);
      below[i] = 1;
      continue;
    }
    const v = Number(text.trim());
    if (text.trim() === "" || !Number.isFinite(v)) {
      throw new CellError(
        `Column "${c.name}" row ${rowNumber(i)} holds "${
          text.slice(0, 30)
        }": a column in below_limit holds numbers and values written <L (below the detection limit L)`,
        ["below_limit"],
      );
    }
    values[i] = v;
  }
  return { name: c.name, type: "number", unit: c.unit, values, lo: null, missing, below };
}
