/**
 * The options of a `check` cell and their normaliser.
 *
 * ```check judge
 * fit: line                 # the fit cell to judge (required)
 * variance_test: koenker    # Breusch–Pagan form: koenker (studentized, default) or original
 * robust: hc3               # heteroscedasticity-consistent standard errors hc0 … hc3 (optional)
 * significance: 0.05        # level at which a test's p-value makes a finding (default 0.05)
 * ```
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { didYouMean } from "../../kernel/suggest.ts";
import type { BreuschPaganVariant, HCType } from "../../kernel/stats/mod.ts";
import type { ParseContext } from "../types.ts";

/** A `check` cell's normalised options (plain JSON). */
export interface CheckSpec {
  fit: string;
  varianceTest: BreuschPaganVariant;
  /** HC estimator for robust standard errors, or null for none. */
  robust: HCType | null;
  significance: number;
}

/** Option keys a `check` cell understands. */
export const CHECK_OPTIONS = {
  fit: "the fit cell to judge",
  variance_test: "Breusch–Pagan form: koenker (studentized, the default) or original",
  robust: "heteroscedasticity-consistent standard errors: hc0, hc1, hc2 or hc3",
  significance: "level below which a test's p-value makes a finding (default 0.05)",
} as const;

const VARIANTS = ["koenker", "original"] as const;
const HC = ["hc0", "hc1", "hc2", "hc3"] as const;

/**
 * Checks and normalises a `check` cell's options.
 *
 * @param ctx The parse context.
 * @returns The spec.
 * @throws {CellError} For a missing or bad `fit`, an unknown `variance_test` or `robust`
 *   value, a `significance` outside (0, 0.5], or an unknown option.
 * @example
 * ```ts
 * import { parseCheckSpec } from "./spec.ts";
 * const spec = parseCheckSpec({
 *   name: "judge", kind: "check", body: "", warn() {}, options: { fit: "line" },
 *   settings: { title: "", confidence: 0.95, seed: 1, criterion: "aicc", maxFileBytes: 1, extra: {} },
 * });
 * if (spec.fit !== "line" || spec.varianceTest !== "koenker" || spec.significance !== 0.05) throw new Error();
 * ```
 */
export function parseCheckSpec(ctx: ParseContext): CheckSpec {
  const o = ctx.options;
  for (const key of Object.keys(o)) {
    if (!(key in CHECK_OPTIONS)) {
      const hint = didYouMean(key, Object.keys(CHECK_OPTIONS)) ||
        `: a check takes ${Object.keys(CHECK_OPTIONS).map((k) => `"${k}"`).join(", ")}`;
      throw new CellError(`Unknown option "${key}" in check "${ctx.name}"${hint}`, [key]);
    }
  }
  return {
    fit: fitName(ctx, o.fit),
    varianceTest: choice(ctx, "variance_test", o.variance_test, VARIANTS) ?? "koenker",
    robust: choice(ctx, "robust", o.robust, HC),
    significance: level(ctx, o.significance),
  };
}

function fitName(ctx: ParseContext, v: unknown): string {
  if (v === undefined || v === null) {
    throw new CellError(
      `Missing "fit" in check "${ctx.name}": name the fit cell to judge, as in fit: line`,
      [],
    );
  }
  if (typeof v !== "string" || v.trim() === "" || /\s/.test(v.trim())) {
    throw new CellError(
      `Option "fit" of check "${ctx.name}" is "${String(v)}": expected the name of a fit cell`,
      ["fit"],
    );
  }
  return v.trim();
}

function choice<T extends string>(
  ctx: ParseContext,
  key: string,
  v: unknown,
  allowed: readonly T[],
): T | null {
  if (v === undefined || v === null) return null;
  const s = typeof v === "string" ? v.trim().toLowerCase() : "";
  if ((allowed as readonly string[]).includes(s)) return s as T;
  const hint = typeof v === "string" ? didYouMean(s, allowed) : "";
  throw new CellError(
    `Option "${key}" of check "${ctx.name}" is "${String(v)}"${
      hint || `: expected one of ${allowed.join(", ")}`
    }`,
    [key],
  );
}

function level(ctx: ParseContext, v: unknown): number {
  if (v === undefined || v === null) return 0.05;
  if (typeof v !== "number" || !(v > 0 && v <= 0.5)) {
    throw new CellError(
      `Option "significance" of check "${ctx.name}" is "${
        String(v)
      }": expected a number in (0, 0.5], such as 0.05`,
      ["significance"],
    );
  }
  return v;
}
