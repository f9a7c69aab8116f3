/**
 * Delimited texts and reader options for the csv target: headers with
 * prototype names, repeats and odd Unicode; fields of every number spelling,
 * quoted fields with delimiters and line ends inside, ragged rows, blank
 * lines, mixed line ends, BOMs, very long fields and many rows.
 *
 * @module
 */
import type { ReadDelimitedOptions } from "../../../kernel/csv/mod.ts";
import { lineEnd, longLine, name, NUMBER_EDGES, ODD_UNICODE } from "../_generators.ts";
import type { Rng } from "../_rng.ts";

const DELIMITERS = [",", ",", ",", ";", "\t", "|", " "];

/** One field: a number (mostly), an edge spelling, text, quoted text, empty. */
function field(rng: Rng, delim: string, eol: string): string {
  const r = rng.next();
  if (r < 0.55) return String(Math.round(rng.next() * 10 ** rng.between(0, 8)) / 10 ** rng.int(6));
  if (r < 0.62) return (rng.next() * 10 ** rng.between(-320, 308)).toString();
  if (r < 0.72) return rng.pick(NUMBER_EDGES);
  if (r < 0.8) return rng.pick(["", "NA", "NaN", "n/a", " 3 ", "-"]);
  if (r < 0.9) return `"a${delim}b${eol}c""d"`;
  if (r < 0.97) return rng.pick(ODD_UNICODE) + "t";
  return longLine(rng, rng.size(100_000)).replaceAll(delim, "").replace(/["\r\n]/g, "");
}

/**
 * A delimited text.
 *
 * @param rng The input's generator.
 * @returns The text (the delimiter is one of `, ; tab | space`).
 */
export function csvText(rng: Rng): string {
  const delim = rng.pick(DELIMITERS);
  const mixed = rng.chance(0.15), fixed = lineEnd(rng);
  const eol = () => (mixed ? lineEnd(rng) : fixed);
  const ncols = rng.size(rng.chance(0.02) ? 3000 : 8);
  const names = Array.from({ length: ncols }, () => name(rng).replaceAll(delim, "_"));
  let out = (rng.chance(0.1) ? "\uFEFF" : "") + names.join(delim) + eol();
  const rows = rng.chance(0.03) ? rng.size(100_000) : rng.size(60);
  for (let r = 0; r < rows; r++) {
    const n = rng.chance(0.03) ? rng.int(ncols + 2) : ncols;
    const e = eol();
    const fields = Array.from({ length: n }, () => field(rng, delim, e));
    out += fields.join(delim) + e;
    if (rng.chance(0.02)) out += e;
    if (out.length > 2_000_000) break;
  }
  return rng.chance(0.1) ? out.slice(0, -1) : out;
}

/**
 * Reader options: sometimes none; else a delimiter (valid or not), decimal
 * comma, missing markers, declared types naming the header or not.
 *
 * @param rng The input's generator.
 * @param text The text, whose header gives names to declare.
 * @returns The options.
 */
export function csvOptions(rng: Rng, text: string): ReadDelimitedOptions {
  const o: ReadDelimitedOptions = {};
  if (rng.chance(0.3)) return o;
  if (rng.chance(0.5)) o.name = rng.pick(["data.csv", "d.tsv", "x.tab", "__proto__"]);
  if (rng.chance(0.3)) o.delimiter = rng.pick([",", ";", "\t", "|", '"', "\n", "ab", "", "é", " "]);
  if (rng.chance(0.2)) o.decimal = rng.pick([".", ","] as const);
  if (rng.chance(0.3)) o.missing = rng.pick([[], ["", "-"], ["NA"], ["__proto__", "constructor"]]);
  if (rng.chance(0.3)) {
    const header = text.split(/\r\n|\r|\n/)[0].split(/[,;\t| ]/);
    const types: Record<string, string> = {};
    for (let n = rng.size(3); n > 0; n--) {
      types[rng.chance(0.7) ? rng.pick(header) : name(rng)] = rng.pick(["number", "text", "date"]);
    }
    o.types = types as ReadDelimitedOptions["types"];
  }
  if (rng.chance(0.1)) o.loLimit = rng.pick([0, 1, 7]);
  return o;
}
