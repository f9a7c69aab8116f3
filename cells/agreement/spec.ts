/**
 * The options of an `agreement` cell and their normaliser: two methods that
 * measured the same samples, both with error.
 *
 * ```agreement meters
 * on: readings            # the table cell (required)
 * x: lab                  # the comparison method's column, on the horizontal axis (required)
 * y: meter                # the other method's column (required)
 * sample: patient         # rows sharing a value are replicates of one sample (optional)
 * variance_ratio: 1       # y's error variance over x's; or replicates (needs sample)
 * errors: constant        # constant, or proportional (weighted Deming, CVs instead of SDs)
 * differences: absolute   # the agreement plot's differences: absolute (y − x) or percent
 * limits: 0.95            # share of differences the limits of agreement are to hold
 * ```
 *
 * Columns are checked in `run`, against the table (the parse step has only
 * the options).
 *
 * @module
 */
import {
  badOption,
  checkOptionKeys,
  type OptionDecls,
  type ParseContext,
  readCellName,
  readChoice,
  readNumber,
} from "../../kernel/contract/mod.ts";
import { CellError } from "../../kernel/errors.ts";

/** How the methods' errors scale: the same SD at every level, or the same CV. */
export type ErrorModel = "constant" | "proportional";

/** What the agreement plot takes as a difference. */
export type DifferenceScale = "absolute" | "percent";

/** An `agreement` cell's normalised options (plain JSON: hashed into the cache key). */
export interface AgreementSpec {
  /** The table cell. */
  on: string;
  /** The comparison method's column (horizontal axis of the regressions). */
  x: string;
  /** The other method's column. */
  y: string;
  /** The sample-id column, or null when every row is a sample of its own. */
  sample: string | null;
  /** δ = σ²(y)/σ²(x) (CV² ratio with proportional errors), or "replicates" to estimate it. */
  varianceRatio: number | "replicates";
  errors: ErrorModel;
  differences: DifferenceScale;
  /** Share of differences inside the limits of agreement, in (0, 1). */
  limits: number;
}

/** Options an `agreement` cell understands, each declared once. */
export const AGREEMENT_OPTIONS: OptionDecls = {
  on: {
    type: "text",
    doc: "the table cell holding both methods' readings",
    required: true,
    names: "cell",
  },
  x: {
    type: "text",
    doc: "the comparison method's column, on the horizontal axis of the regressions",
    required: true,
    names: "column",
  },
  y: {
    type: "text",
    doc: "the other method's column, the one judged against x",
    required: true,
    names: "column",
  },
  sample: {
    type: "text",
    doc: "a column naming each row's sample; rows sharing a value are replicates of one sample",
    names: "column",
  },
  variance_ratio: {
    type: "number",
    doc:
      "the ratio of y's error variance to x's (of squared CVs with proportional errors), or replicates to estimate it from the sample column",
    default: 1,
  },
  errors: {
    type: "choice",
    doc:
      "constant (one SD per method) or proportional (one CV per method: weighted Deming regression)",
    default: "constant",
    choices: ["constant", "proportional"],
  },
  differences: {
    type: "choice",
    doc: "the agreement plot's differences: absolute (y − x) or percent of the pair's mean",
    default: "absolute",
    choices: ["absolute", "percent"],
  },
  limits: {
    type: "number",
    doc: "the share of differences the limits of agreement are to hold",
    default: 0.95,
  },
};

const isName = (v: unknown): v is string =>
  typeof v === "string" && v.trim() !== "" && !/\s/.test(v.trim());

/**
 * Checks and normalises an `agreement` cell's options.
 *
 * @param ctx The parse context (cell name, YAML options).
 * @returns The spec.
 * @throws {CellError} For an unknown option, a missing `on`, `x` or `y`,
 *   the same column twice, a variance ratio that is not a positive number
 *   (or `replicates` without `sample`), or a bad choice or share.
 * @example
 * ```ts
 * import { parseAgreementSpec } from "./spec.ts";
 * const spec = parseAgreementSpec({
 *   name: "meters", kind: "agreement", body: "", warn() {},
 *   options: { on: "readings", x: "lab", y: "meter" },
 *   settings: { title: "", confidence: 0.95, seed: 1, criterion: "aicc", maxFileBytes: 1, extra: {} },
 * });
 * if (spec.varianceRatio !== 1 || spec.errors !== "constant") throw new Error(JSON.stringify(spec));
 * ```
 */
export function parseAgreementSpec(ctx: ParseContext): AgreementSpec {
  checkOptionKeys(ctx, AGREEMENT_OPTIONS);
  const on = readCellName(
    ctx,
    "on",
    "table",
    "name the table holding both methods' readings, as in on: readings",
  );
  const x = column(ctx, "x", "name the comparison method's column, as in x: lab");
  const y = column(ctx, "y", "name the other method's column, as in y: meter");
  if (x === y) {
    throw new CellError(
      `Agreement "${ctx.name}" names column "${x}" as both methods: x and y must be two columns`,
      ["y"],
    );
  }
  const sample = ctx.options.sample === undefined || ctx.options.sample === null
    ? null
    : column(ctx, "sample", "");
  if (sample !== null && (sample === x || sample === y)) {
    throw new CellError(
      `Agreement "${ctx.name}" names column "${sample}" as the sample column and as a method: the sample column names the samples`,
      ["sample"],
    );
  }
  return {
    on,
    x,
    y,
    sample,
    varianceRatio: varianceRatio(ctx, sample),
    errors: readChoice(ctx, "errors", ["constant", "proportional"] as const) ?? "constant",
    differences: readChoice(ctx, "differences", ["absolute", "percent"] as const) ?? "absolute",
    limits: readNumber(
      ctx,
      "limits",
      0.95,
      (v) => v > 0 && v < 1,
      "a share between 0 and 1, such as 0.95",
    ),
  };
}

function column(ctx: ParseContext, key: string, how: string): string {
  const v = ctx.options[key];
  if (v === undefined || v === null) {
    throw new CellError(`Missing "${key}" in agreement "${ctx.name}": ${how}`, []);
  }
  if (!isName(v)) throw badOption(ctx, key, "the name of a column of the table");
  return v.trim();
}

function varianceRatio(ctx: ParseContext, sample: string | null): number | "replicates" {
  const v = ctx.options.variance_ratio;
  if (v === undefined || v === null) return 1;
  if (typeof v === "string" && v.trim().toLowerCase() === "replicates") {
    if (sample === null) {
      throw new CellError(
        `Agreement "${ctx.name}" estimates the variance ratio from replicates but names no "sample" column: name the column whose rows repeat a sample, as in sample: patient, or give the ratio as a number`,
        ["variance_ratio"],
      );
    }
    return "replicates";
  }
  if (typeof v !== "number" || !Number.isFinite(v) || !(v > 0)) {
    throw new CellError(
      `Option "variance_ratio" of agreement "${ctx.name}" is "${
        typeof v === "object" ? JSON.stringify(v) : String(v)
      }": expected a positive number (the ratio of y's error variance to x's, such as 1), or replicates`,
      ["variance_ratio"],
    );
  }
  return v;
}
