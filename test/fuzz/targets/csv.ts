/**
 * Target "csv": delimited text (and bytes that are not UTF-8) through
 * readDelimited with random options. Only a DelimitedError with a place
 * (row, column, byte offset or option) may escape. What is read must hold
 * together: every column has rowCount values, missing counts match the
 * NaN/null values, declared text stays text, and a plain decimal field
 * reads as the correctly rounded double (JavaScript's Number) — nothing
 * lost.
 *
 * @module
 */
import { DelimitedError, readDelimited } from "../../../kernel/csv/mod.ts";
import type { ReadDelimitedOptions } from "../../../kernel/csv/mod.ts";
import { Defect, located, uncaught } from "../_oracle.ts";
import { mutate } from "../_mutate.ts";
import type { Target } from "./_target.ts";
import { csvOptions, csvText } from "./_csv_text.ts";

/** Text, byte patches applied after UTF-8 encoding, and reader options. */
export interface CsvInput {
  text: string;
  /** `[index, byte]`: bytes set after encoding (invalid UTF-8, NUL, stray high bytes). */
  patches: [number, number][];
  options: ReadDelimitedOptions;
}

function bytesOf(input: CsvInput): Uint8Array {
  const bytes = new TextEncoder().encode(input.text);
  for (const [i, b] of input.patches) if (i < bytes.length) bytes[i] = b;
  return bytes;
}

type Data = ReturnType<typeof readDelimited>;

function checkShape(data: Data, input: CsvInput): void {
  for (const col of data.columns) {
    const bad = (what: string) => new Defect("lost", `Column "${col.name}": ${what}`);
    if (col.values.length !== data.rowCount) {
      throw bad(`${col.values.length} values, ${data.rowCount} rows`);
    }
    let missing = 0;
    if (col.type === "number") {
      for (let i = 0; i < data.rowCount; i++) {
        if (Number.isNaN(col.values[i])) missing++;
        else if (col.lo !== null && !Number.isFinite(col.lo[i])) {
          throw bad(`lo[${i}] is ${col.lo[i]}`);
        }
      }
      if (input.options.types?.[col.name] === "text") throw bad("declared text, read as numbers");
    } else for (const v of col.values) if (v === null) missing++;
    if (missing !== col.missing) throw bad(`missing says ${col.missing}, counted ${missing}`);
  }
}

const PLAIN = /^-?\d{1,30}(\.\d{1,30})?([eE][+-]?\d{1,3})?$/;

/** Where the text is simple enough to split by hand, plain decimals read as Number reads them. */
function checkValues(data: Data, input: CsvInput): void {
  const { text, patches, options } = input;
  if (patches.length > 0 || /["\r\uFEFF]/.test(text) || (options.decimal ?? ".") !== ".") return;
  const lines = text.split("\n").filter((l) => l !== "");
  if (lines.length - 1 !== data.rowCount) return;
  const delim = data.delimiter;
  for (let r = 0; r < data.rowCount; r++) {
    const fields = lines[r + 1].split(delim);
    data.columns.forEach((col, c) => {
      const f = fields[c];
      if (col.type !== "number" || f === undefined || !PLAIN.test(f)) return;
      if (!Object.is(col.values[r], Number(f)) && !(col.values[r] === 0 && Number(f) === 0)) {
        throw new Defect(
          "lost",
          `Row ${r + 1} column "${col.name}": "${f}" read as ${col.values[r]}`,
        );
      }
    });
  }
}

function checkCsv(input: CsvInput): void {
  let data: Data;
  try {
    data = readDelimited(bytesOf(input), input.options);
  } catch (err) {
    if (!(err instanceof DelimitedError)) throw uncaught(err, "readDelimited");
    const placed = err.row !== null || err.column !== null || err.offset !== null ||
      err.option.length > 0;
    located(placed, `DelimitedError with no place: ${err.message.slice(0, 200)}`);
    return;
  }
  checkShape(data, input);
  checkValues(data, input);
}

/** The CSV reader target. */
export const csvTarget: Target<CsvInput> = {
  name: "csv",
  about: "delimited text and broken bytes through readDelimited with random options",
  make(rng, corpus) {
    const text = rng.chance(0.3)
      ? mutate(rng.pick(corpus.csv), rng, corpus.csv, 4)
      : rng.chance(0.8)
      ? csvText(rng)
      : mutate(csvText(rng), rng, corpus.csv, 3);
    const patches: [number, number][] = [];
    if (rng.chance(0.1)) {
      for (let n = rng.size(4); n > 0; n--) patches.push([rng.int(text.length + 1), rng.int(256)]);
    }
    return { text, patches, options: csvOptions(rng, text) };
  },
  check: checkCsv,
  text: (i) => i.text,
  withText: (i, text) => ({ ...i, text }),
};
