/**
 * The options of a `fit` cell and their normaliser.
 *
 * ```fit root
 * on: cycles                          # the table cell to fit (required)
 * model: capacity = q0 - a*sqrt(cycle) # response = expression (required)
 * start: { q0: 2500, a: 1 }           # start values, used by nonlinear fits (optional)
 * weights: 1/cycle                    # relative weights ∝ 1/variance (optional), or
 * known_sigma: sd                     # each row's absolute standard deviation (optional)
 * count_variance: true                # criteria count σ² as a parameter (default)
 * within: { a: [0, null] }            # ranges that nonlinear estimates stay inside (optional)
 * intervals: [wald, profile]          # interval methods (default: wald; + profile if nonlinear)
 * bootstrap: { resamples: 2000, resample: residuals }   # bootstrap intervals (or cases)
 * loss: huber                         # a robust fit: huber, soft_l1 or bisquare (default least squares)
 * tuning: 1.345                       # the loss's tuning constant (default: 95% efficiency)
 * ```
 *
 * Model text is only checked for being a string here: its names are known only
 * when the table has run, so `run` parses it against the table's columns.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import {
  checkOptionKeys,
  type OptionDecls,
  type ParseContext,
  readCellName,
  readMapping,
  shown,
} from "../../kernel/contract/mod.ts";
import { parseWeighting } from "./_parse_weighting.ts";
import { type Limits, parseLimits } from "./_parse_limits.ts";
import { type IntervalsSpec, parseIntervals } from "./_parse_intervals.ts";
import {
  LOSS_CHOICES,
  parseRobust,
  refuseRobustIntervals,
  type RobustSpec,
} from "./_robust_parse.ts";
import { type CensoringSpec, parseCensoring } from "./_parse_censoring.ts";

/** A `fit` cell's normalised options (plain JSON: hashed into the cache key). */
export interface FitSpec extends IntervalsSpec, RobustSpec, CensoringSpec {
  /** Name of the table cell to fit. */
  on: string;
  /** The model equation as written. */
  model: string;
  /** Start values by parameter name (nonlinear fits); empty when not given. */
  start: Record<string, number>;
  /** Expression for relative weights ∝ 1/variance (`weights`), when given. */
  weights?: string;
  /** Expression for each row's known absolute standard deviation (`known_sigma`), when given. */
  knownSigma?: string;
  /** False when the criteria count only the mean parameters (`count_variance: false`). */
  countVariance?: false;
  /** Ranges [lower, upper] by parameter (`within`; nonlinear fits), when given. */
  within?: Limits;
}

/** Options a `fit` cell understands, each declared once. */
export const FIT_OPTIONS: OptionDecls = {
  on: { type: "text", doc: "the table cell to fit", required: true, names: "cell" },
  model: { type: "equation", doc: "the model equation, response = expression", required: true },
  start: { type: "mapping", doc: "start values of parameters, for nonlinear fits" },
  weights: { type: "expression", doc: "relative weights ∝ 1/variance, an expression over columns" },
  known_sigma: {
    type: "expression",
    doc: "each row's known standard deviation (absolute), an expression over columns",
  },
  count_variance: {
    type: "boolean",
    doc: "whether AIC, AICc and BIC count the error variance as a parameter",
    default: true,
  },
  within: {
    type: "mapping",
    doc: "ranges [lower, upper] that nonlinear estimates stay inside, null for an open end",
  },
  intervals: {
    type: "list",
    doc:
      "interval methods beside Wald: profile (likelihood), bootstrap; default profile for nonlinear models",
  },
  derived: {
    type: "mapping",
    doc:
      "quantities computed from the parameters, name: expression (delta method, profile and bootstrap intervals)",
  },
  bootstrap: {
    type: "mapping",
    doc: "bootstrap intervals: resamples (default 2000) and resample: residuals (default) or cases",
  },
  loss: {
    type: "choice",
    doc:
      "least_squares, or a robust M-estimate by huber, soft_l1 or bisquare loss (IRLS, MAD scale, sandwich covariance)",
    default: "least_squares",
    choices: LOSS_CHOICES,
  },
  tuning: {
    type: "number",
    doc:
      "the robust loss's tuning constant in units of the scale (default 1.345, 1.287, 4.685: 95% efficiency at the normal)",
  },
  censored_by: {
    type: "text",
    doc:
      "a 0/1 column: 1 where the response holds a detection limit it lies below (maximum likelihood, censored normal)",
    names: "columns",
  },
  substitute: {
    type: "number",
    doc:
      "least squares with each detection limit L replaced by this fraction of L, instead of maximum likelihood (warned)",
  },
};

/**
 * Checks and normalises a `fit` cell's options.
 *
 * @param ctx The parse context (cell name, YAML options).
 * @returns The spec.
 * @throws {CellError} For a missing or non-text `on` or `model`, a bad `start`
 *   mapping, bad weighting options (see `_parse_weighting.ts`), a bad `within` range
 *   (see `_parse_limits.ts`), a bad `loss` or `tuning` (`_robust_parse.ts`) or an unknown option.
 * @example
 * ```ts
 * import { parseFitSpec } from "./spec.ts";
 * const spec = parseFitSpec({
 *   name: "line", kind: "fit", body: "", warn() {},
 *   options: { on: "cycles", model: "capacity = q0 + a*cycle" },
 *   settings: { title: "", confidence: 0.95, seed: 1, criterion: "aicc", maxFileBytes: 1, extra: {} },
 * });
 * if (spec.on !== "cycles") throw new Error("unexpected");
 * ```
 */
export function parseFitSpec(ctx: ParseContext): FitSpec {
  const o = ctx.options;
  checkOptionKeys(ctx, FIT_OPTIONS);
  const spec: FitSpec = {
    on: readCellName(ctx, "on", "table", "name the table cell to fit, as in on: cycles"),
    model: modelText(ctx, o.model),
    start: startValues(ctx),
    ...parseWeighting(ctx),
    ...parseLimits(ctx),
    ...parseIntervals(ctx),
    ...parseRobust(ctx),
    ...parseCensoring(ctx),
  };
  refuseRobustIntervals(ctx, spec);
  return spec;
}

function modelText(ctx: ParseContext, v: unknown): string {
  if (v === undefined || v === null) {
    throw new CellError(
      `Missing "model" in fit "${ctx.name}": write the model as response = expression, as in model: y = a + b*x`,
      [],
    );
  }
  if (typeof v !== "string" || v.trim() === "") {
    throw new CellError(
      `Option "model" of fit "${ctx.name}" is "${
        shown(v)
      }": expected an equation such as y = a + b*x`,
      ["model"],
    );
  }
  return v;
}

function startValues(ctx: ParseContext): Record<string, number> {
  const v = readMapping(ctx, "start", "{ a: 1, b: 0.5 }");
  if (v === null) return {};
  const out: Record<string, number> = {};
  for (const [k, x] of Object.entries(v)) {
    if (typeof x !== "number" || !Number.isFinite(x)) {
      throw new CellError(
        `Start value of "${k}" in fit "${ctx.name}" is "${shown(x)}": expected a finite number`,
        [
          "start",
          k,
        ],
      );
    }
    out[k] = x;
  }
  return out;
}
