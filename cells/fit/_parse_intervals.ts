/**
 * The interval options of a `fit` cell:
 *
 * ```fit decay
 * intervals: [wald, profile, bootstrap]   # which intervals (Wald always; default: wald, and
 *                                         #   profile for a nonlinear model)
 * bootstrap: { resamples: 2000, resample: residuals }   # or cases; implies bootstrap intervals
 * derived:                                # quantities computed from the parameters
 *   half_life: log(2)/k
 * ```
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { type ParseContext, shown } from "../../kernel/contract/mod.ts";
import type { Resample } from "./_bootstrap.ts";

/** The methods a fit's `intervals` can name. */
export const INTERVAL_METHODS = ["wald", "profile", "bootstrap"] as const;
export type IntervalMethod = typeof INTERVAL_METHODS[number];

/** The interval part of a fit spec (keys present only when given). */
export interface IntervalsSpec {
  intervals?: IntervalMethod[];
  bootstrap?: { resamples: number; resample: Resample };
  /** Derived quantities in the order written: a name and an expression of the parameters. */
  derived?: { name: string; text: string }[];
}

/** A derived quantity's name: a letter or _, then letters, digits and _. */
const NAME = /^[A-Za-z_][A-Za-z0-9_]*$/;

/** Fewest and most resamples (BCa needs a few hundred at least; common practice, no source). */
export const RESAMPLES = { min: 200, max: 100_000, default: 2000 } as const;

/**
 * Reads `intervals` and `bootstrap`.
 *
 * @param ctx The parse context.
 * @returns The keys that were given.
 * @throws {CellError} For an unknown method, a bad `bootstrap` mapping or count.
 */
export function parseIntervals(ctx: ParseContext): IntervalsSpec {
  const o = ctx.options;
  const out: IntervalsSpec = {};
  if (o.intervals !== undefined && o.intervals !== null) {
    const list = Array.isArray(o.intervals) ? o.intervals : [o.intervals];
    const methods: IntervalMethod[] = [];
    list.forEach((m, i) => {
      if (typeof m !== "string" || !(INTERVAL_METHODS as readonly string[]).includes(m.trim())) {
        throw new CellError(
          `Option "intervals" of fit "${ctx.name}" names "${shown(m)}": the methods are ${
            INTERVAL_METHODS.join(", ")
          }`,
          Array.isArray(o.intervals) ? ["intervals", i] : ["intervals"],
        );
      }
      const method = m.trim() as IntervalMethod;
      if (!methods.includes(method)) methods.push(method);
    });
    out.intervals = methods;
  }
  if (o.bootstrap !== undefined && o.bootstrap !== null) {
    const b = o.bootstrap;
    if (typeof b !== "object" || Array.isArray(b)) {
      throw new CellError(
        `Option "bootstrap" of fit "${ctx.name}" is a mapping, as in bootstrap: { resamples: 2000, resample: cases }`,
        ["bootstrap"],
      );
    }
    const m = b as Record<string, unknown>;
    for (const k of Object.keys(m)) {
      if (k !== "resamples" && k !== "resample") {
        throw new CellError(
          `Option "bootstrap" of fit "${ctx.name}" knows resamples and resample, not "${k}"`,
          ["bootstrap", k],
        );
      }
    }
    const count = m.resamples ?? RESAMPLES.default;
    if (
      typeof count !== "number" || !Number.isInteger(count) || count < RESAMPLES.min ||
      count > RESAMPLES.max
    ) {
      throw new CellError(
        `bootstrap: resamples of fit "${ctx.name}" is "${
          shown(count)
        }": a whole number from ${RESAMPLES.min} to ${RESAMPLES.max} (2000 is usual for 95% limits)`,
        ["bootstrap", "resamples"],
      );
    }
    const how = m.resample ?? "residuals";
    if (how !== "residuals" && how !== "cases") {
      throw new CellError(
        `bootstrap: resample of fit "${ctx.name}" is residuals (the design kept, residuals redrawn) or cases (rows redrawn), not "${
          shown(how)
        }"`,
        ["bootstrap", "resample"],
      );
    }
    out.bootstrap = { resamples: count, resample: how };
  }
  if (o.derived !== undefined && o.derived !== null) {
    const d = o.derived;
    if (typeof d !== "object" || Array.isArray(d)) {
      throw new CellError(
        `Option "derived" of fit "${ctx.name}" is a mapping of names to expressions of the parameters, as in derived: { half_life: log(2)/k }`,
        ["derived"],
      );
    }
    const list: { name: string; text: string }[] = [];
    for (const [name, text] of Object.entries(d as Record<string, unknown>)) {
      if (!NAME.test(name)) {
        throw new CellError(
          `Derived quantity "${name}" of fit "${ctx.name}": a name is a letter or _, then letters, digits or _`,
          ["derived", name],
        );
      }
      if (typeof text !== "string" && typeof text !== "number") {
        throw new CellError(
          `Derived quantity "${name}" of fit "${ctx.name}" is "${
            shown(text)
          }": write an expression of the parameters, such as log(2)/k`,
          ["derived", name],
        );
      }
      list.push({ name, text: String(text) });
    }
    out.derived = list;
  }
  return out;
}
