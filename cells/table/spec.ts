/**
 * The options of a `table` cell and their normaliser.
 *
 * ```table cycles
 * from: data/batch7.csv               # a CSV/TSV file beside the document, or:
 * # columns: [cycle, capacity]        #   inline data: column names …
 * # rows: [[1, 2500.2], [2, 2498.9]]  #   … and one list of values per row
 * delimiter: ";"                      # default "," ("\t" for .tsv; ";" with a decimal comma)
 * decimal: comma                      # decimal separator: point (default) or comma
 * missing: [NA, "-999"]               # markers of a missing value besides the empty field
 * types: { batch: text }              # force a column's type: number or text
 * units: { cycle: cycles, capacity: mAh }
 * exclude:                            # rows left out, each entry with its reason
 *   - rows: [41, 42]
 *     why: thermocouple came loose
 * derive: { fade: 2500 - capacity }   # new number columns by expression, in order
 * where: cycle >= 10                  # keep only rows passing a comparison
 * ```
 *
 * Row numbers (in `exclude` and in messages) count data rows from 1; the
 * header line is not a row. Only the options' shapes are checked here;
 * column names are known when the data has been read, in `run`.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { didYouMean } from "../../kernel/suggest.ts";
import { checkOptionKeys, type OptionDecls, type ParseContext } from "../../kernel/contract/mod.ts";
import { parseExclude } from "./_parse_exclude.ts";
import { parseInline } from "./_parse_inline.ts";
import { parseDerive, parseWhere } from "./_parse_derive.ts";
import { checkFromPath, parseDecimalOption, parseDelimiter } from "./_parse_source.ts";
import { type DatabaseSource, parseDatabaseSource } from "./_parse_database.ts";
import { parseBelowLimit } from "./_below_limit.ts";

import type { InlineData } from "./_parse_inline.ts";
export type { InlineData };

/** A `table` cell's normalised options (plain JSON: hashed into the cache key). */
export interface TableSpec {
  /** Data file path as written, relative to the document; null for inline data. */
  from: string | null;
  /** Inline data; null when reading a file. */
  inline: InlineData | null;
  /** Field delimiter; null for the default by file name and decimal separator. */
  delimiter: string | null;
  decimal: "." | ",";
  /** Missing-value markers; null for the reader's default (NA, NaN). */
  missing: string[] | null;
  types: Record<string, "number" | "text">;
  units: Record<string, string>;
  exclude: { rows: number[]; why: string }[];
  /** Derived columns in the order written. */
  derive: { name: string; expression: string }[];
  /** Row filter (a comparison), or null. */
  where: string | null;
  /** A query in a database (instead of a file or inline rows), or null. */
  source: DatabaseSource | null;
  /** Columns whose cells may be written `<L` (below a detection limit L); absent when none. */
  belowLimit?: string[];
}

/** Options a `table` cell understands, each declared once. */
export const TABLE_OPTIONS: OptionDecls = {
  from: { type: "text", doc: "the data file, relative to the document", names: "file" },
  columns: { type: "list", doc: "inline data: the column names" },
  rows: { type: "rows", doc: "inline data: one list of values per row" },
  delimiter: {
    type: "text",
    doc: 'the field delimiter (default ",", "\\t" for .tsv, ";" with a decimal comma)',
  },
  decimal: {
    type: "choice",
    doc: "the decimal separator",
    default: "point",
    choices: ["point", "comma"],
  },
  missing: {
    type: "list",
    doc: "markers of a missing value besides the empty field (default NA, NaN)",
  },
  types: { type: "mapping", doc: "forced column types, number or text", names: "columns" },
  units: { type: "mapping", doc: "units of the columns", names: "columns" },
  below_limit: {
    type: "list",
    doc:
      "columns whose cells may be written <L, below the detection limit L (left-censored values)",
  },
  exclude: { type: "list", doc: "rows left out, each entry with rows and why" },
  derive: { type: "mapping", doc: "derived number columns by expression, in order" },
  where: { type: "expression", doc: "a row filter, such as temp >= 20" },
  database: {
    type: "text",
    doc:
      "a database to query instead of a file: a DuckDB file beside the document, or { url_from: VARIABLE } for PostgreSQL",
  },
  query: { type: "text", doc: "with database: one SELECT giving the table's rows" },
  keep_rows: {
    type: "choice",
    doc:
      "with database: where the rows stay: auto (in memory up to 1,000,000 rows), memory, or database",
    default: "auto",
    choices: ["auto", "memory", "database"],
  },
  partition_by: {
    type: "text",
    doc: "with database: the column the database partitions the table by (sums per partition)",
  },
  order_by: {
    type: "text",
    doc:
      "with database: the column whose order is the rows' sequence (rows in that order; Durbin–Watson of a fit in the engine)",
  },
};

function stringMap(v: unknown, key: string): Record<string, unknown> {
  if (v === undefined || v === null) return {};
  if (typeof v !== "object" || Array.isArray(v)) {
    throw new CellError(`Option "${key}" must be a mapping of column names`, [key]);
  }
  return v as Record<string, unknown>;
}

function parseTypes(v: unknown): Record<string, "number" | "text"> {
  const out: Record<string, "number" | "text"> = {};
  for (const [col, t] of Object.entries(stringMap(v, "types"))) {
    if (t !== "number" && t !== "text") {
      const hint = typeof t === "string" ? didYouMean(t, ["number", "text"]) : "";
      throw new CellError(
        `Type ${JSON.stringify(t)} of column "${col}" is not known${
          hint || ": use number or text"
        }`,
        ["types", col],
      );
    }
    out[col] = t;
  }
  return out;
}

function parseUnits(v: unknown): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [col, u] of Object.entries(stringMap(v, "units"))) {
    if ((typeof u !== "string" && typeof u !== "number") || String(u).trim() === "") {
      throw new CellError(`Unit of column "${col}" must be a non-empty text such as mAh`, [
        "units",
        col,
      ]);
    }
    out[col] = String(u).trim();
  }
  return out;
}

function parseMissing(v: unknown): string[] | null {
  if (v === undefined || v === null) return null;
  const list = Array.isArray(v) ? v : [v];
  return list.map((m, i) => {
    if (typeof m !== "string" && typeof m !== "number") {
      throw new CellError(`Missing-value marker ${JSON.stringify(m)} must be a text or a number`, [
        "missing",
        i,
      ]);
    }
    return String(m);
  });
}

/**
 * Checks and normalises a `table` cell's options.
 *
 * @param ctx The parse context (cell name, YAML options).
 * @returns The spec.
 * @throws {CellError} For an unknown option, neither or both of `from` and
 *   `rows`, a path outside the document's folder, bad inline data, or an
 *   ill-formed `delimiter`, `decimal`, `missing`, `types`, `units`,
 *   `exclude`, `derive` or `where`; the error's path names the option.
 * @example
 * ```ts
 * import { parseTableSpec } from "./spec.ts";
 * const spec = parseTableSpec({
 *   name: "cycles", kind: "table", body: "", warn: () => {},
 *   options: { from: "data/b7.csv", exclude: [{ rows: [41], why: "probe loose" }] },
 *   settings: { title: "", confidence: 0.95, seed: 1, criterion: "aicc", maxFileBytes: 2 ** 29, extra: {} },
 * });
 * if (spec.exclude[0].rows[0] !== 41) throw new Error("exclusion not kept");
 * ```
 */
export function parseTableSpec(ctx: ParseContext): TableSpec {
  const o = ctx.options;
  checkOptionKeys(ctx, TABLE_OPTIONS);
  const source = parseDatabaseSource(o, ctx.name);
  if (source !== null && o.below_limit !== undefined) {
    throw new CellError(
      `Option "below_limit" applies to files and inline rows: in a query, give the limit in one column and a 0/1 flag in another, and name the flag in the fit's censored_by`,
      ["below_limit"],
    );
  }
  if (source !== null) {
    return {
      from: null,
      inline: null,
      delimiter: null,
      decimal: ".",
      missing: null,
      types: parseTypes(o.types),
      units: parseUnits(o.units),
      exclude: [],
      derive: [],
      where: null,
      source,
    };
  }
  const hasFrom = o.from !== undefined && o.from !== null;
  const hasRows = o.rows !== undefined;
  if (hasFrom === hasRows) {
    throw new CellError(
      hasFrom
        ? `Table "${ctx.name}" has both from and rows: read a file or give rows inline, not both`
        : `Table "${ctx.name}" needs data: name a file with from, give columns and rows inline, or query a database`,
      hasFrom ? ["rows"] : [],
    );
  }
  if (hasFrom && o.columns !== undefined) {
    throw new CellError(
      `Option "columns" goes with inline rows; a file's header names its columns`,
      ["columns"],
    );
  }
  if (hasRows) {
    for (const key of ["delimiter", "decimal"]) {
      if (o[key] !== undefined) {
        throw new CellError(`Option "${key}" applies to files: inline rows need none`, [key]);
      }
    }
  }
  const decimal = parseDecimalOption(o.decimal);
  return {
    from: hasFrom ? checkFromPath(o.from) : null,
    inline: hasRows ? parseInline(o.columns, o.rows) : null,
    delimiter: parseDelimiter(o.delimiter, decimal),
    decimal,
    missing: parseMissing(o.missing),
    types: parseTypes(o.types),
    units: parseUnits(o.units),
    exclude: parseExclude(o.exclude),
    derive: parseDerive(o.derive),
    where: parseWhere(o.where),
    source: null,
    ...(o.below_limit === undefined || o.below_limit === null
      ? {}
      : { belowLimit: parseBelowLimit(o.below_limit) }),
  };
}
