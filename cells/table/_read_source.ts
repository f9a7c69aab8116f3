/**
 * Reading a table's data, from the file's bytes or from inline rows, with
 * the reader's errors placed on the option at fault.
 *
 * Inline rows are written out as CSV bytes (every text quoted, numbers in
 * their shortest round-trip form) and read by the same reader, so typing,
 * missing markers and messages are exactly those of a file. The decimal
 * correction of an inline number is then that of its shortest round-trip
 * decimal, which is the decimal as written whenever it had at most 15
 * significant digits (DBL_DIG: 15-digit decimals survive the trip through a
 * double; IEEE 754-2008 §5.12.2).
 *
 * @module
 */
import { CellError, type OptionPath } from "../../kernel/errors.ts";
import { formatBytes } from "../../kernel/format_bytes.ts";
import {
  type DelimitedData,
  DelimitedError,
  HALVES_FROM,
  readDelimited,
} from "../../kernel/csv/mod.ts";
import type { RunContext } from "../../kernel/contract/mod.ts";
import type { InlineData, TableSpec } from "./spec.ts";

function quote(s: string): string {
  return '"' + s.replaceAll('"', '""') + '"';
}

/** Inline data as CSV bytes (header quoted, texts quoted, numbers plain, empty for null). */
export function inlineCsv(data: InlineData): Uint8Array {
  const lines = [data.columns.map(quote).join(",")];
  for (const row of data.rows) {
    lines.push(
      row.map((v) => (v === null ? "" : typeof v === "number" ? String(v) : quote(v))).join(","),
    );
  }
  return new TextEncoder().encode(lines.join("\n") + "\n");
}

function place(e: DelimitedError, spec: TableSpec): OptionPath {
  if (e.option.length > 0) return e.option;
  if (spec.from !== null) return ["from"];
  return e.row !== null ? ["rows", e.row - 1] : ["rows"];
}

/**
 * Reads the table's source into typed columns.
 *
 * @param spec The table's spec.
 * @param ctx The run context (files, settings, progress).
 * @returns The reader's columns and row count.
 * @throws {CellError} For a file not handed over, a file over the size
 *   limit, or any reader error (placed on `from`, `rows`, `types` or `delimiter`).
 */
export function readSource(spec: TableSpec, ctx: RunContext): DelimitedData {
  let bytes: Uint8Array;
  if (spec.from !== null) {
    const file = ctx.files[spec.from];
    if (file === undefined) {
      throw new CellError(`File "${spec.from}" was not read for this cell`, ["from"]);
    }
    bytes = file.bytes;
    if (bytes.length > ctx.settings.maxFileBytes) {
      throw new CellError(
        `File "${spec.from}" is ${formatBytes(bytes.length)}, over the limit of ` +
          `${
            formatBytes(ctx.settings.maxFileBytes)
          } (set max_file_size in the front matter to raise it)`,
        ["from"],
      );
    }
  } else {
    bytes = inlineCsv(spec.inline!);
  }
  try {
    return readDelimited(bytes, {
      name: spec.from ?? "inline rows",
      delimiter: spec.from !== null ? spec.delimiter ?? undefined : ",",
      decimal: spec.from !== null ? spec.decimal : ".",
      missing: spec.missing ?? undefined,
      types: spec.types,
      onProgress: spec.from !== null
        ? (f) => ctx.progress(0.9 * f, `reading ${spec.from}`)
        : undefined,
      halvesFrom: HALVES_FROM,
    });
  } catch (e) {
    if (e instanceof DelimitedError) throw new CellError(e.message, place(e, spec));
    throw e;
  }
}
