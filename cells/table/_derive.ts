/**
 * Derived columns: each `derive` entry is an expression over the number
 * columns (and the derived columns before it), compiled by the expression
 * language into one row loop. Results that are not finite (log of a
 * negative, division by zero) become missing values, with one warning per
 * column naming the first rows.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { ownValue } from "../../kernel/own.ts";
import { didYouMean } from "../../kernel/suggest.ts";
import { compile, type Expr, ExprError, parseColumnExpression } from "../../kernel/expr/mod.ts";
import type { Column, NumberColumn } from "../../kernel/contract/mod.ts";
import { findId } from "./_find_id.ts";

function parseAgainst(name: string, text: string, columns: Column[]): Expr {
  const all = columns.map((c) => c.name);
  let e: Expr;
  try {
    e = parseColumnExpression(text, all);
  } catch (err) {
    if (err instanceof ExprError) throw new CellError(err.message, ["derive", name], err.offset);
    throw err;
  }
  for (const c of columns) {
    if (c.type !== "text") continue;
    const at = findId(e, c.name);
    if (at !== null) {
      throw new CellError(
        `Column "${c.name}" is text: a derived column can use only number columns`,
        ["derive", name],
        at.start,
      );
    }
  }
  return e;
}

/**
 * Adds the derived columns to `columns` (in place, in order).
 *
 * @param derive The spec's derived columns.
 * @param columns The table's columns over the kept rows; derived ones are appended.
 * @param rows Source row numbers of the kept rows (for warnings).
 * @param units Units by column name.
 * @param warn Records a warning on the cell.
 * @throws {CellError} On ["derive", name]: a name already taken, a syntax
 *   error, an unknown or text column (with the offset into the expression).
 */
export function addDerived(
  derive: readonly { name: string; expression: string }[],
  columns: Column[],
  rows: Int32Array,
  units: Readonly<Record<string, string>>,
  warn: (message: string) => void,
): void {
  const n = rows.length;
  for (const { name, expression } of derive) {
    if (columns.some((c) => c.name === name)) {
      throw new CellError(
        `Column "${name}" already exists: choose another name for the derived column`,
        ["derive", name],
      );
    }
    const e = parseAgainst(name, expression, columns);
    const numeric = columns.filter((c): c is NumberColumn => c.type === "number");
    const f = compile(e, numeric.map((c) => c.name), []);
    const values = f(numeric.map((c) => c.values), [], n);
    const used = numeric.filter((c) => findId(e, c.name) !== null);
    let missing = 0;
    const badRows: number[] = [];
    for (let i = 0; i < n; i++) {
      const v = values[i];
      if (v === v && (v === Infinity || v === -Infinity)) values[i] = NaN;
      if (values[i] !== values[i]) {
        missing++;
        if (badRows.length < 4 && !used.some((c) => c.values[i] !== c.values[i])) {
          badRows.push(rows[i]);
        }
      }
    }
    if (badRows.length > 0) {
      const more = badRows.length > 3 ? ", …" : "";
      warn(
        `Derived column "${name}" has no finite value in row${badRows.length > 1 ? "s" : ""} ` +
          `${badRows.slice(0, 3).join(", ")}${more}: those rows are missing`,
      );
    }
    columns.push({
      name,
      type: "number",
      unit: ownValue(units, name) ?? null,
      values,
      lo: null,
      missing,
    });
  }
}

/**
 * Refuses units of columns that do not exist, suggesting the near miss.
 *
 * @param units The spec's units.
 * @param names Every column name, derived ones included.
 * @throws {CellError} On ["units", name].
 */
export function checkUnits(
  units: Readonly<Record<string, string>>,
  names: readonly string[],
): void {
  for (const col of Object.keys(units)) {
    if (!names.includes(col)) {
      throw new CellError(
        `Column "${col}" in units is not in the table${didYouMean(col, names)}`,
        ["units", col],
      );
    }
  }
}
