/**
 * The robust options of a `fit` cell:
 *
 * ```fit line-robust
 * loss: huber            # least_squares (default), huber, soft_l1 or bisquare
 * tuning: 1.345          # the loss's tuning constant in units of the scale (default: 95% efficiency)
 * ```
 *
 * Refused at their place: an unknown loss (with the nearest name), a tuning
 * constant that is not a positive number, `tuning` without a robust loss,
 * a robust loss with `known_sigma` (the robust scale would replace the
 * standard deviations the fit was told are known) or with `censored_by`
 * (censored responses are fitted by normal maximum likelihood).
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { didYouMean } from "../../kernel/suggest.ts";
import { type ParseContext, shown } from "../../kernel/contract/mod.ts";
import { type Loss, LOSSES } from "./_robust_loss.ts";
import type { IntervalsSpec } from "./_parse_intervals.ts";

/** What `loss:` may say. */
export const LOSS_CHOICES = ["least_squares", ...LOSSES] as const;

/** The robust part of a fit spec (keys present only for a robust loss, so other fits keep their keys). */
export interface RobustSpec {
  loss?: Loss;
  /** The tuning constant when given (else the loss's default). */
  tuning?: number;
}

/**
 * Reads `loss` and `tuning`.
 *
 * @param ctx The parse context.
 * @returns `{}` for least squares, else the loss and any tuning constant given.
 * @throws {CellError} At `loss` or `tuning`, as described in the module notes.
 * @example
 * ```ts
 * import { parseRobust } from "./_robust_parse.ts";
 * const ctx = { name: "r", kind: "fit", body: "", warn() {}, options: { loss: "Huber" },
 *   settings: { title: "", confidence: 0.95, seed: 1, criterion: "aicc", maxFileBytes: 1, extra: {} } };
 * if (parseRobust(ctx).loss !== "huber") throw new Error("case is not significant");
 * ```
 */
export function parseRobust(ctx: ParseContext): RobustSpec {
  const v = ctx.options.loss, t = ctx.options.tuning;
  let loss: Loss | null = null;
  if (v !== undefined && v !== null) {
    const s = typeof v === "string" ? v.trim().toLowerCase().replace(/-/g, "_") : "";
    if (!(LOSS_CHOICES as readonly string[]).includes(s)) {
      const hint = typeof v === "string" ? didYouMean(s, LOSS_CHOICES) : "";
      throw new CellError(
        `Option "loss" of fit "${ctx.name}" is "${shown(v)}"${
          hint || `: expected one of ${LOSS_CHOICES.join(", ")}`
        }`,
        ["loss"],
      );
    }
    if (s !== "least_squares") loss = s as Loss;
  }
  if (loss !== null && ctx.options.known_sigma !== undefined && ctx.options.known_sigma !== null) {
    throw new CellError(
      `Cannot fit "${ctx.name}" with loss ${loss} and known_sigma: a robust fit estimates the scale of the residuals itself (their normalised median absolute deviation), which known standard deviations would fix; give relative weights instead (weights: 1/(σ)^2) or drop the loss`,
      ["loss"],
    );
  }
  if (loss !== null && ctx.options.censored_by !== undefined && ctx.options.censored_by !== null) {
    throw new CellError(
      `Cannot fit "${ctx.name}" with loss ${loss} and censored_by: responses below a detection limit are fitted by maximum likelihood under normal errors, which a robust loss replaces; fit one or the other`,
      ["loss"],
    );
  }
  if (t === undefined || t === null) return loss === null ? {} : { loss };
  if (typeof t !== "number" || !Number.isFinite(t) || !(t > 0)) {
    throw new CellError(
      `Option "tuning" of fit "${ctx.name}" is "${
        shown(t)
      }": expected a positive number, the loss's tuning constant in units of the robust scale, such as 1.345`,
      ["tuning"],
    );
  }
  if (loss === null) {
    throw new CellError(
      `Option "tuning" of fit "${ctx.name}" has no robust loss to tune: add loss: huber, soft_l1 or bisquare, or remove tuning`,
      ["tuning"],
    );
  }
  return { loss, tuning: t };
}

/**
 * Refuses profile and bootstrap intervals for a robust fit, at the option
 * that asks for them: both refit by least squares (`_profile.ts`,
 * `_bootstrap.ts`), so their limits would belong to another estimate.
 *
 * @param ctx The parse context.
 * @param spec The robust loss and the interval options read.
 * @throws {CellError} At `intervals` or `bootstrap` for a robust fit asking for them.
 */
export function refuseRobustIntervals(
  ctx: ParseContext,
  spec: RobustSpec & IntervalsSpec,
): void {
  if (spec.loss === undefined) return;
  const asked = (spec.intervals ?? []).filter((m) => m !== "wald");
  const key = asked.length > 0 ? "intervals" : spec.bootstrap !== undefined ? "bootstrap" : null;
  if (key === null) return;
  const what = asked.length > 0 ? asked.join(" and ") : "bootstrap";
  throw new CellError(
    `Cannot give ${what} intervals for fit "${ctx.name}" with loss ${spec.loss}: they refit by least squares, which a robust fit is not; its Wald intervals come from the sandwich covariance (intervals: [wald], or no intervals option)`,
    [key],
  );
}
