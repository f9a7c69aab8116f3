/**
 * The `within` option of a `fit` cell: a range per parameter that a
 * nonlinear fit keeps its estimate inside.
 *
 * ```fit decay
 * within: { b: [0, null], c: [-1, 1] }   # [lower, upper]; null (or ~) for an open end
 * ```
 *
 * Which parameters exist is known only when the model is parsed against the
 * table (in `run`), so names are checked by the solver; here only the shape
 * of each range is. A linear model ignores the option, with a warning from
 * the solver's side, since its estimates come from one direct solve.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import type { ParseContext } from "../../kernel/contract/mod.ts";

/** Ranges by parameter name: [lower, upper], null for an open end. */
export type Limits = Record<string, [number | null, number | null]>;

/**
 * Reads `within`.
 *
 * @param ctx The parse context.
 * @returns `{ within }` when the option is given, else `{}`.
 * @throws {CellError} For a value that is not a mapping, a range that is not a
 *   list of two numbers or nulls, or a lower end not below the upper one.
 * @example
 * ```ts
 * import { parseLimits } from "./_parse_limits.ts";
 * const spec = parseLimits({
 *   name: "decay", kind: "fit", body: "", warn() {},
 *   options: { within: { b: [0, null] } },
 *   settings: { title: "", confidence: 0.95, seed: 1, criterion: "aicc", maxFileBytes: 1, extra: {} },
 * });
 * if (spec.within?.b[0] !== 0 || spec.within.b[1] !== null) throw new Error("within");
 * ```
 */
export function parseLimits(ctx: ParseContext): { within?: Limits } {
  const v = ctx.options.within;
  if (v === undefined || v === null) return {};
  if (typeof v !== "object" || Array.isArray(v)) {
    throw new CellError(
      `Option "within" of fit "${ctx.name}" is "${
        String(v)
      }": expected a mapping of parameters to ranges, such as { b: [0, null] }`,
      ["within"],
    );
  }
  const out: Limits = {};
  for (const [k, range] of Object.entries(v as Record<string, unknown>)) {
    out[k] = parseRange(ctx, k, range);
  }
  return { within: out };
}

/**
 * One parameter's range `[lower, upper]` (null or ±∞: open), located at `within.k`.
 *
 * @param ctx The cell's parse context (its name for the message).
 * @param k The parameter.
 * @param range The range as written.
 * @param kind The cell's kind, as the message names it ("fit", "joint").
 * @returns The ends, null where open.
 */
export function parseRange(
  ctx: ParseContext,
  k: string,
  range: unknown,
  kind = "fit",
): [number | null, number | null] {
  const end = (x: unknown) => x === null || (typeof x === "number" && !Number.isNaN(x));
  if (!Array.isArray(range) || range.length !== 2 || !range.every(end)) {
    throw new CellError(
      `Range of "${k}" in ${kind} "${ctx.name}" is "${
        JSON.stringify(range)
      }": expected [lower, upper] with numbers or null for an open end, such as [0, null]`,
      ["within", k],
    );
  }
  const lo = range[0] === null || range[0] === -Infinity ? null : range[0] as number;
  const hi = range[1] === null || range[1] === Infinity ? null : range[1] as number;
  if (lo !== null && hi !== null && !(lo < hi)) {
    throw new CellError(
      `Range of "${k}" in ${kind} "${ctx.name}" is [${lo}, ${hi}]: the lower end must be below the upper end`,
      ["within", k],
    );
  }
  return [lo, hi];
}
