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
import type { BreuschPaganVariant, HCType } from "../../kernel/stats/mod.ts";
import {
  checkOptionKeys,
  type OptionDecls,
  type ParseContext,
  readCellName,
  readChoice,
  readNumber,
} from "../../kernel/contract/mod.ts";

/** A `check` cell's normalised options (plain JSON). */
export interface CheckSpec {
  fit: string;
  varianceTest: BreuschPaganVariant;
  /** HC estimator for robust standard errors, or null for none. */
  robust: HCType | null;
  significance: number;
}

/** Options a `check` cell understands, each declared once. */
export const CHECK_OPTIONS: OptionDecls = {
  fit: { type: "text", doc: "the fit cell to judge", required: true, names: "cell" },
  variance_test: {
    type: "choice",
    doc: "Breusch–Pagan form: koenker (studentized) or original",
    default: "koenker",
    choices: ["koenker", "original"],
  },
  robust: {
    type: "choice",
    doc: "heteroscedasticity-consistent standard errors",
    choices: ["hc0", "hc1", "hc2", "hc3"],
  },
  significance: {
    type: "number",
    doc: "level below which a test's p-value makes a finding",
    default: 0.05,
  },
};

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
  checkOptionKeys(ctx, CHECK_OPTIONS);
  return {
    fit: readCellName(ctx, "fit", "fit", "name the fit cell to judge, as in fit: line"),
    varianceTest: readChoice(ctx, "variance_test", VARIANTS) ?? "koenker",
    robust: readChoice(ctx, "robust", HC),
    significance: readNumber(
      ctx,
      "significance",
      0.05,
      (x) => x > 0 && x <= 0.5,
      "a number in (0, 0.5], such as 0.05",
    ),
  };
}
