/**
 * Normalisers for where a table's data comes from: the `from` path, the
 * delimiter and the decimal separator.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { ownValue } from "../../kernel/own.ts";

/**
 * Checks `from` (or `database`, a DuckDB file): a non-empty relative path
 * that stays inside the document's folder (the kernel checks again, with
 * symbolic links, when it reads).
 *
 * @param v The option's value.
 * @param option The option it came from.
 * @throws {CellError} On [option].
 */
export function checkFromPath(v: unknown, option: "from" | "database" = "from"): string {
  if (typeof v !== "string" || v.trim() === "") {
    throw new CellError(
      option === "from"
        ? `Option "from" must be a file path such as data/batch7.csv`
        : `Option "database" must be a DuckDB file such as plant.duckdb, or { url_from: VARIABLE }`,
      [option],
    );
  }
  const path = v.trim();
  const outside = () =>
    new CellError(
      `File "${path}" is outside the document's folder: data files must sit beside the document or below it`,
      [option],
    );
  if (/^([/\\]|[A-Za-z]:)/.test(path)) throw outside();
  let depth = 0;
  for (const part of path.split(/[/\\]/)) {
    if (part === "..") depth--;
    else if (part !== "." && part !== "") depth++;
    if (depth < 0) throw outside();
  }
  return path;
}

const DELIMITER_WORDS: Record<string, string> = {
  tab: "\t",
  "\\t": "\t",
  comma: ",",
  semicolon: ";",
  space: " ",
};

/**
 * Normalises `delimiter`: one ASCII character other than a quote or line
 * end, or one of the words tab, comma, semicolon, space (or `\t` written
 * literally).
 *
 * @throws {CellError} On ["delimiter"].
 */
export function parseDelimiter(v: unknown, decimal: "." | ","): string | null {
  if (v === undefined || v === null) return null;
  const text = typeof v === "string"
    ? (ownValue(DELIMITER_WORDS, v.trim().toLowerCase()) ?? v)
    : "";
  const code = text.length === 1 ? text.charCodeAt(0) : -1;
  if (code < 0 || code >= 0x80 || text === '"' || text === "\n" || text === "\r") {
    throw new CellError(
      `Delimiter ${
        JSON.stringify(v)
      } cannot be used: give one character such as ";" or the word tab`,
      ["delimiter"],
    );
  }
  if (text === "," && decimal === ",") {
    throw new CellError(
      `Delimiter "," cannot be used with a decimal comma: use ";" or tab between fields`,
      ["delimiter"],
    );
  }
  return text;
}

/**
 * Normalises `decimal`: point (default) or comma, also written "." or ",".
 *
 * @throws {CellError} On ["decimal"].
 */
export function parseDecimalOption(v: unknown): "." | "," {
  if (v === undefined || v === null || v === "point" || v === ".") return ".";
  if (v === "comma" || v === ",") return ",";
  throw new CellError(`Decimal separator ${JSON.stringify(v)} is not known: use point or comma`, [
    "decimal",
  ]);
}
