/**
 * The options of a `search` cell and their normaliser.
 *
 * ```search drivers
 * on: runs                          # the table cell to search (required)
 * response: yield                   # the response column (required)
 * candidates: [temp, feed, press]   # candidate predictor columns, at most 25 (default: every
 *                                   #   other number column)
 * always: [batch_age]               # columns every subset holds (optional)
 * intercept: true                   # every subset has an intercept (default)
 * by: bic                           # bic | aic | aicc | adj_r2 | loo (default bic)
 * keep: 5                           # models kept per size and overall (default 5)
 * largest: 8                        # most candidates in one subset (default all)
 * count_variance: true              # criteria count σ² as a parameter, as a fit does (default)
 * ```
 *
 * Column names are checked for their form here (a model must be able to
 * write them) and against the table in `run`.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { CONSTANTS } from "../../kernel/expr/mod.ts";
import {
  badOption,
  checkOptionKeys,
  missingOption,
  type OptionDecls,
  type ParseContext,
  readBoolean,
  readCellName,
  readChoice,
  readNumber,
  shown,
} from "../../kernel/contract/mod.ts";

/** A criterion the search ranks by. */
export type SearchCriterion = "bic" | "aic" | "aicc" | "adj_r2" | "loo";

/** The criteria `by` accepts. */
export const SEARCH_CRITERIA: readonly SearchCriterion[] = ["bic", "aic", "aicc", "adj_r2", "loo"];

/** Most candidates a search takes: 2²⁵ = 33,554,432 subsets (issue 16). */
export const MAX_CANDIDATES = 25;

/** Models kept per size and overall, when `keep` is not given. */
export const DEFAULT_KEEP = 5;

/** Most models `keep` may ask for per size. */
export const MAX_KEEP = 100;

/** A `search` cell's normalised options (plain JSON: hashed into the cache key). */
export interface SearchSpec {
  /** The table cell searched. */
  on: string;
  /** The response column. */
  response: string;
  /** Candidate columns in the order written; null: every other number column of the table. */
  candidates: string[] | null;
  /** Columns every subset holds. */
  always: string[];
  /** Whether every subset has an intercept. */
  intercept: boolean;
  /** The criterion that ranks the subsets. */
  by: SearchCriterion;
  /** Models kept per size and overall. */
  keep: number;
  /** Most candidates in one subset; null: all of them. */
  largest: number | null;
  /** False when the criteria count only the mean parameters (`count_variance: false`). */
  countVariance?: false;
}

/** Options a `search` cell understands, each declared once. */
export const SEARCH_OPTIONS: OptionDecls = {
  on: { type: "text", doc: "the table cell to search", required: true, names: "cell" },
  response: { type: "text", doc: "the response column", required: true, names: "column" },
  candidates: {
    type: "list",
    doc: "candidate predictor columns, at most 25 (default every other number column)",
    names: "columns",
  },
  always: { type: "list", doc: "columns that every subset holds", names: "columns" },
  intercept: { type: "boolean", doc: "whether every subset has an intercept", default: true },
  by: {
    type: "choice",
    doc: "the criterion that ranks the subsets",
    default: "bic",
    choices: SEARCH_CRITERIA,
  },
  keep: {
    type: "whole number",
    doc: "how many models are kept per size and overall",
    default: DEFAULT_KEEP,
  },
  largest: { type: "whole number", doc: "the most candidates one subset holds (default all)" },
  count_variance: {
    type: "boolean",
    doc: "whether AIC, AICc and BIC count the error variance as a parameter",
    default: true,
  },
};

/** A name a model can write as it is (kernel/expr's identifiers). */
const PLAIN_NAME = /^[A-Za-z_][A-Za-z0-9_]*$/;

/**
 * Checks and normalises a `search` cell's options.
 *
 * @param ctx The parse context (cell name, YAML options).
 * @returns The spec.
 * @throws {CellError} For an unknown option; a missing `on` or `response`; a
 *   column that is not a name a model can write; a column listed twice, or
 *   both as a candidate and in `always`, or as the response too; more than 25
 *   candidates; an unknown criterion (with the nearest); a `keep` or
 *   `largest` that is not a whole number in range.
 * @example
 * ```ts
 * import { parseSearchSpec } from "./spec.ts";
 * const spec = parseSearchSpec({
 *   name: "drivers", kind: "search", body: "", warn() {},
 *   options: { on: "runs", response: "yield", candidates: ["temp", "feed"] },
 *   settings: { title: "", confidence: 0.95, seed: 1, criterion: "aicc", maxFileBytes: 1, extra: {} },
 * });
 * if (spec.by !== "bic" || spec.keep !== 5 || !spec.intercept) throw new Error(JSON.stringify(spec));
 * ```
 */
export function parseSearchSpec(ctx: ParseContext): SearchSpec {
  checkOptionKeys(ctx, SEARCH_OPTIONS);
  const on = readCellName(ctx, "on", "table", "name the table cell to search, as in on: runs");
  const response = columnName(ctx, ctx.options.response, ["response"]);
  const always = columnList(ctx, "always") ?? [];
  const candidates = columnList(ctx, "candidates");
  checkRoles(ctx, response, always, candidates);
  const largest = ctx.options.largest ?? null;
  const spec: SearchSpec = {
    on,
    response,
    candidates,
    always,
    intercept: readBoolean(ctx, "intercept", true),
    by: readChoice(ctx, "by", SEARCH_CRITERIA) ?? "bic",
    keep: readNumber(
      ctx,
      "keep",
      DEFAULT_KEEP,
      (x) => Number.isSafeInteger(x) && x >= 1 && x <= MAX_KEEP,
      `a whole number from 1 to ${MAX_KEEP}`,
    ),
    largest: largest === null ? null : readNumber(
      ctx,
      "largest",
      0,
      (x) => Number.isSafeInteger(x) && x >= 1,
      "a whole number, 1 or more",
    ),
  };
  if (!readBoolean(ctx, "count_variance", true)) spec.countVariance = false;
  return spec;
}

/** One column name: a plain name a model can write, not a constant. */
function columnName(ctx: ParseContext, v: unknown, path: (string | number)[]): string {
  const where = path.length === 1
    ? `Option "${path[0]}"`
    : `Entry ${(path[1] as number) + 1} of "${path[0]}"`;
  if (v === undefined || v === null) {
    if (path.length === 1) {
      throw missingOption(ctx, "response", "name the response column, as in response: yield");
    }
    throw new CellError(`${where} of search "${ctx.name}" is empty: expected a column name`, path);
  }
  const s = typeof v === "string" ? v.trim() : typeof v === "number" ? String(v) : "";
  if (!PLAIN_NAME.test(s)) {
    throw new CellError(
      `${where} of search "${ctx.name}" is "${shown(v)}": expected a column name a model can ` +
        "write (letters, digits and _, not starting with a digit); rename the column with derive",
      path,
    );
  }
  if (CONSTANTS.has(s)) {
    throw new CellError(
      `${where} of search "${ctx.name}" is "${s}", which a model reads as the constant ${s}: ` +
        "rename the column with derive",
      path,
    );
  }
  return s;
}

/** An optional list of column names, each once. */
function columnList(ctx: ParseContext, key: "candidates" | "always"): string[] | null {
  const v = ctx.options[key];
  if (v === undefined || v === null) return null;
  if (!Array.isArray(v)) throw badOption(ctx, key, "a list of columns, as in [temp, feed]");
  const names = v.map((x, i) => columnName(ctx, x, [key, i]));
  names.forEach((s, i) => {
    const first = names.indexOf(s);
    if (first !== i) {
      throw new CellError(
        `Column "${s}" is listed twice in "${key}" of search "${ctx.name}": as entries ${
          first + 1
        } and ${i + 1}`,
        [key, i],
      );
    }
  });
  if (key === "candidates" && names.length === 0) {
    throw new CellError(
      `Option "candidates" of search "${ctx.name}" is empty: list at least one column, or leave ` +
        "the option out to search every other number column",
      [key],
    );
  }
  if (key === "candidates" && names.length > MAX_CANDIDATES) {
    throw new CellError(
      `Search "${ctx.name}" lists ${names.length} candidates: at most ${MAX_CANDIDATES} ` +
        `(2^${MAX_CANDIDATES} subsets); move the ones every model needs to "always" or leave some out`,
      [key, MAX_CANDIDATES],
    );
  }
  return names;
}

/** The response is no predictor, and a column is a candidate or always held, not both. */
function checkRoles(
  ctx: ParseContext,
  response: string,
  always: string[],
  candidates: string[] | null,
): void {
  const at = (key: string, list: string[], s: string) => [key, list.indexOf(s)];
  if (always.includes(response)) {
    throw new CellError(
      `Column "${response}" of search "${ctx.name}" is the response and cannot be in "always"`,
      at("always", always, response),
    );
  }
  if (candidates === null) return;
  if (candidates.includes(response)) {
    throw new CellError(
      `Column "${response}" of search "${ctx.name}" is the response and cannot be a candidate`,
      at("candidates", candidates, response),
    );
  }
  const both = candidates.find((c) => always.includes(c));
  if (both !== undefined) {
    throw new CellError(
      `Column "${both}" of search "${ctx.name}" is both a candidate and in "always": ` +
        "a column every subset holds is not searched; keep it in one list",
      at("candidates", candidates, both),
    );
  }
}
