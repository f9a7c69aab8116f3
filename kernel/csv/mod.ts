/**
 * Delimited text (CSV, TSV, `;` with decimal comma) read from bytes into
 * typed columns, with correctly rounded numbers and their double-double
 * decimal corrections.
 *
 * @example
 * ```ts
 * import { readDelimited } from "./mod.ts";
 * const data = readDelimited(new TextEncoder().encode("t;v\n1;0,5\n"), { decimal: "," });
 * if (data.columns[1].values[0] !== 0.5) throw new Error("decimal comma not read");
 * ```
 *
 * @module
 */
export {
  type DelimitedColumn,
  type DelimitedData,
  type NumberData,
  readDelimited,
  type ReadDelimitedOptions,
  type TextData,
} from "./read_delimited.ts";
export { DelimitedError, type DelimitedErrorPlace } from "./delimited_error.ts";
export { DecimalParser, type DecimalParserOptions, parseDecimal } from "./decimal_parser.ts";
export { DEFAULT_LO_LIMIT, DEFAULT_MISSING } from "./_options.ts";
export { MOSTLY_NUMBERS } from "./_typing.ts";
export { makeNumericCsv } from "./make_numeric_csv.ts";
export { countLineFeeds } from "./line_feeds.ts";
export { HALVES_FROM, halvesHelperWorker, stopHalvesHelper, useHalvesHelper } from "./_halves.ts";
