/**
 * The weighting options of a `fit` cell and the count of parameters its
 * criteria use:
 *
 * ```fit cal
 * weights: 1/conc^2        # relative weights ∝ 1/variance (rescaled by the residual variance)
 * known_sigma: sd          # or: each row's absolute standard deviation, in the response's units
 * count_variance: false    # AIC/AICc/BIC count only the mean parameters (default: + 1 for σ²)
 * ```
 *
 * `weights` and `known_sigma` exclude each other: one is a relative
 * statement about variances, the other an absolute one about standard
 * deviations, and users mix the two up (1/σ for 1/σ², relative for
 * absolute), so the names and the refusal keep them apart.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { type ParseContext, shown } from "../../kernel/contract/mod.ts";

/** The weighting part of a fit spec (keys present only when given). */
export interface WeightingSpec {
  /** Expression over columns giving relative weights ∝ 1/variance. */
  weights?: string;
  /** Expression over columns giving each row's known standard deviation (absolute). */
  knownSigma?: string;
  /** False: criteria count only the mean parameters (k = p). */
  countVariance?: false;
}

/**
 * Reads `weights`, `known_sigma` and `count_variance`.
 *
 * @param ctx The parse context.
 * @returns The keys that were given.
 * @throws {CellError} For a non-text or empty expression, both weightings at
 *   once, or a `count_variance` that is not true or false.
 * @example
 * ```ts
 * import { parseWeighting } from "./_parse_weighting.ts";
 * const w = parseWeighting({
 *   name: "cal", kind: "fit", body: "", warn() {}, options: { weights: "1/conc^2" },
 *   settings: { title: "", confidence: 0.95, seed: 1, criterion: "aicc", maxFileBytes: 1, extra: {} },
 * });
 * if (w.weights !== "1/conc^2") throw new Error();
 * ```
 */
export function parseWeighting(ctx: ParseContext): WeightingSpec {
  const o = ctx.options, out: WeightingSpec = {};
  if (o.weights !== undefined && o.known_sigma !== undefined) {
    throw new CellError(
      `Cannot fit "${ctx.name}" with both "weights" and "known_sigma": give relative weights ∝ 1/variance or each row's absolute standard deviation, not both`,
      ["known_sigma"],
    );
  }
  if (o.weights !== undefined) out.weights = expression(ctx, "weights", o.weights);
  if (o.known_sigma !== undefined) out.knownSigma = expression(ctx, "known_sigma", o.known_sigma);
  const cv = o.count_variance;
  if (cv !== undefined && typeof cv !== "boolean") {
    throw new CellError(
      `Option "count_variance" of fit "${ctx.name}" is "${shown(cv)}": expected true or false`,
      ["count_variance"],
    );
  }
  if (cv === false) out.countVariance = false;
  return out;
}

function expression(ctx: ParseContext, key: string, v: unknown): string {
  if (typeof v === "number" && Number.isFinite(v)) return String(v);
  if (typeof v !== "string" || v.trim() === "") {
    throw new CellError(
      `Option "${key}" of fit "${ctx.name}" is "${
        shown(v)
      }": expected an expression over columns, such as ${key === "weights" ? "1/conc^2" : "sd"}`,
      [key],
    );
  }
  return v;
}
