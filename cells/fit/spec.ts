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
 * ```
 *
 * Model text is only checked for being a string here: its names are known only
 * when the table has run, so `run` parses it against the table's columns.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { didYouMean } from "../../kernel/suggest.ts";
import type { ParseContext } from "../types.ts";
import { parseWeighting } from "./_parse_weighting.ts";
import { type Limits, parseLimits } from "./_parse_limits.ts";

/** A `fit` cell's normalised options (plain JSON: hashed into the cache key). */
export interface FitSpec {
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

/** Option keys a `fit` cell understands, with what each is for. */
export const FIT_OPTIONS = {
  on: "the table cell to fit",
  model: "the model equation, response = expression",
  start: "start values of parameters, for nonlinear fits",
  weights: "relative weights ∝ 1/variance, an expression over columns",
  known_sigma: "each row's known standard deviation (absolute), an expression over columns",
  count_variance:
    "whether AIC, AICc and BIC count the error variance as a parameter (default true)",
  within: "ranges [lower, upper] that nonlinear estimates stay inside, null for an open end",
} as const;

/**
 * Checks and normalises a `fit` cell's options.
 *
 * @param ctx The parse context (cell name, YAML options).
 * @returns The spec.
 * @throws {CellError} For a missing or non-text `on` or `model`, a bad `start`
 *   mapping, bad weighting options (see `_parse_weighting.ts`), a bad `within` range
 *   (see `_parse_limits.ts`) or an unknown option.
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
  for (const key of Object.keys(o)) {
    if (!(key in FIT_OPTIONS)) {
      const hint = didYouMean(key, Object.keys(FIT_OPTIONS)) ||
        `: a fit takes ${Object.keys(FIT_OPTIONS).map((k) => `"${k}"`).join(", ")}`;
      throw new CellError(`Unknown option "${key}" in fit "${ctx.name}"${hint}`, [key]);
    }
  }
  return {
    on: cellName(ctx, o.on),
    model: modelText(ctx, o.model),
    start: startValues(ctx, o.start),
    ...parseWeighting(ctx),
    ...parseLimits(ctx),
  };
}

function cellName(ctx: ParseContext, v: unknown): string {
  if (v === undefined || v === null) {
    throw new CellError(
      `Missing "on" in fit "${ctx.name}": name the table cell to fit, as in on: cycles`,
      [],
    );
  }
  if (typeof v !== "string" || v.trim() === "" || /\s/.test(v.trim())) {
    throw new CellError(
      `Option "on" of fit "${ctx.name}" is "${String(v)}": expected the name of a table cell`,
      ["on"],
    );
  }
  return v.trim();
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
        String(v)
      }": expected an equation such as y = a + b*x`,
      ["model"],
    );
  }
  return v;
}

function startValues(ctx: ParseContext, v: unknown): Record<string, number> {
  if (v === undefined || v === null) return {};
  if (typeof v !== "object" || Array.isArray(v)) {
    throw new CellError(
      `Option "start" of fit "${ctx.name}" is "${
        String(v)
      }": expected a mapping such as { a: 1, b: 0.5 }`,
      ["start"],
    );
  }
  const out: Record<string, number> = {};
  for (const [k, x] of Object.entries(v as Record<string, unknown>)) {
    if (typeof x !== "number" || !Number.isFinite(x)) {
      throw new CellError(
        `Start value of "${k}" in fit "${ctx.name}" is "${String(x)}": expected a finite number`,
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
