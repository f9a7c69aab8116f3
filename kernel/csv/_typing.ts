/**
 * Header checks and the column-typing rule of the reader (documented in
 * `read_delimited.ts`).
 *
 * @module
 */
import { didYouMean } from "../suggest.ts";
import { DelimitedError } from "./delimited_error.ts";
import type { BadValue, NumberPass } from "./_passes.ts";

/** Share of numbers among non-missing values from which a stray text value is called a data error. */
export const MOSTLY_NUMBERS = 0.9;

/**
 * Refuses empty and repeated header names, naming the column position (1-based).
 *
 * @param names The header's names, trimmed.
 * @param label The file's name, for messages.
 * @param starts Byte offset of each header field, for the error's place.
 * @throws {DelimitedError} With the offending field's byte offset (and name, for a repeat).
 */
export function checkHeader(
  names: readonly string[],
  label: string,
  starts: readonly number[] = [],
): void {
  const seen = new Map<string, number>();
  names.forEach((name, i) => {
    if (name === "") {
      throw new DelimitedError(
        `File "${label}": column ${i + 1} has no name in the header row`,
        { offset: starts[i] ?? null },
      );
    }
    const first = seen.get(name);
    if (first !== undefined) {
      throw new DelimitedError(
        `File "${label}": columns ${first + 1} and ${
          i + 1
        } are both named "${name}" in the header row`,
        { column: name, offset: starts[i] ?? null },
      );
    }
    seen.set(name, i);
  });
}

/**
 * Refuses declared types for columns that do not exist, or types other than number and text.
 *
 * @throws {DelimitedError} With option `["types", name]`.
 */
export function checkTypes(
  names: readonly string[],
  types: Readonly<Record<string, string>>,
): void {
  for (const [name, type] of Object.entries(types)) {
    if (!names.includes(name)) {
      throw new DelimitedError(
        `Column "${name}" is not in the header${didYouMean(name, names)}`,
        { option: ["types", name], column: name },
      );
    }
    if (type !== "number" && type !== "text") {
      throw new DelimitedError(
        `Type "${type}" of column "${name}" is not known: use number or text`,
        { option: ["types", name], column: name },
      );
    }
  }
}

function describe(bad: readonly BadValue[], count: number): string {
  const first = bad[0];
  const more = count > 1
    ? ` (and ${count - 1} more, first in row${count > 2 ? "s" : ""} ` +
      `${bad.slice(1).map((b) => b.row).join(", ")}${count > bad.length ? ", …" : ""})`
    : "";
  return `row ${first.row} has ${JSON.stringify(first.text)}${more}`;
}

/**
 * Decides each column's type from pass 1's counts and declared types.
 *
 * @returns "number" or "text" per column.
 * @throws {DelimitedError} For a non-number in a declared number column, or a
 *   column that is mostly numbers with a stray value.
 */
export function decideTypes(
  names: readonly string[],
  types: Readonly<Record<string, "number" | "text">>,
  pass: NumberPass,
): ("number" | "text")[] {
  return names.map((name, c) => {
    if (types[name] === "text") return "text";
    const bad = pass.bad[c], numeric = pass.numeric[c];
    if (bad === 0) return "number";
    const where = describe(pass.badSamples[c], bad);
    if (types[name] === "number") {
      throw new DelimitedError(
        `Column "${name}" is declared number but ${where}: correct the value or list it under missing`,
        { row: pass.badSamples[c][0].row, column: name, option: ["types", name] },
      );
    }
    if (numeric >= MOSTLY_NUMBERS * (numeric + bad)) {
      throw new DelimitedError(
        `Column "${name}" is mostly numbers but ${where}: correct the value, list it under ` +
          `missing, or declare types: { ${name}: text }`,
        { row: pass.badSamples[c][0].row, column: name },
      );
    }
    return "text";
  });
}
