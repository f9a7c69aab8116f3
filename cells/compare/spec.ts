/**
 * The options of a `compare` cell and their normaliser.
 *
 * ```compare shape
 * fits: [line, root, power]   # the fit cells to compare, two or more (required)
 * by: aicc                    # aic | aicc | bic | loo (default: the document's criterion)
 * folds: 10                   # k-fold count for nonlinear fits' cross-validation (default 10)
 * significance: 0.05          # level the verdict uses for nested F tests (default 0.05)
 * ```
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { didYouMean } from "../../kernel/suggest.ts";
import {
  checkOptionKeys,
  type OptionDecls,
  type ParseContext,
  readNumber,
  shown,
} from "../../kernel/contract/mod.ts";

/** A criterion to rank by. */
export type Criterion = "aic" | "aicc" | "bic" | "loo";

/** The criteria `by` accepts. */
export const CRITERIA: readonly Criterion[] = ["aic", "aicc", "bic", "loo"];

/** Folds of the k-fold cross-validation of nonlinear fits, when `folds` is not given. */
export const DEFAULT_FOLDS = 10;

/** Level of the nested F tests the verdict reports, when `significance` is not given. */
export const DEFAULT_SIGNIFICANCE = 0.05;

/** A `compare` cell's normalised options (plain JSON: hashed into the cache key). */
export interface CompareSpec {
  /** Names of the fit cells, in the order written; at least two, no repeats. */
  fits: string[];
  /** The criterion that ranks the fits. */
  by: Criterion;
  /** Fold count for nonlinear fits (n is used when smaller). */
  folds: number;
  /** Level at which the verdict calls a nested F test significant. */
  significance: number;
}

/** Options a `compare` cell understands, each declared once. */
export const COMPARE_OPTIONS: OptionDecls = {
  fits: {
    type: "list",
    doc: "the fit cells to compare, two or more",
    required: true,
    names: "cells",
  },
  by: {
    type: "choice",
    doc: "the criterion that ranks them (default the document's criterion)",
    choices: CRITERIA,
  },
  folds: {
    type: "whole number",
    doc: "how many folds the cross-validation of nonlinear fits uses",
    default: DEFAULT_FOLDS,
  },
  significance: {
    type: "number",
    doc: "the level at which nested F tests count as significant",
    default: DEFAULT_SIGNIFICANCE,
  },
};

/**
 * Checks and normalises a `compare` cell's options.
 *
 * @param ctx The parse context (cell name, YAML options, document settings).
 * @returns The spec; `by` defaults to the document's `criterion` setting.
 * @throws {CellError} For an unknown option, a missing `fits`, fewer than two
 *   fits, a name that is not a cell name, a fit listed twice, an unknown
 *   criterion, a fold count that is not a whole number ≥ 2, or a
 *   significance level outside (0, 1).
 * @example
 * ```ts
 * import { parseCompareSpec } from "./spec.ts";
 * const spec = parseCompareSpec({
 *   name: "shape", kind: "compare", body: "", warn() {},
 *   options: { fits: ["line", "root"] },
 *   settings: { title: "", confidence: 0.95, seed: 1, criterion: "bic", maxFileBytes: 1, extra: {} },
 * });
 * if (spec.by !== "bic" || spec.folds !== 10) throw new Error(JSON.stringify(spec));
 * ```
 */
export function parseCompareSpec(ctx: ParseContext): CompareSpec {
  const o = ctx.options;
  checkOptionKeys(ctx, COMPARE_OPTIONS);
  return {
    fits: fitNames(ctx, o.fits),
    by: criterion(ctx, o.by),
    folds: readNumber(
      ctx,
      "folds",
      DEFAULT_FOLDS,
      (x) => Number.isSafeInteger(x) && x >= 2,
      "a whole number, 2 or more",
    ),
    significance: readNumber(
      ctx,
      "significance",
      DEFAULT_SIGNIFICANCE,
      (x) => x > 0 && x < 1,
      "a number between 0 and 1, exclusive",
    ),
  };
}

function fitNames(ctx: ParseContext, v: unknown): string[] {
  if (v === undefined || v === null) {
    throw new CellError(
      `Missing "fits" in compare "${ctx.name}": list the fit cells to compare, as in fits: [line, root]`,
      [],
    );
  }
  if (!Array.isArray(v)) {
    throw new CellError(
      `Option "fits" of compare "${ctx.name}" is "${
        shown(v)
      }": expected a list of fit cell names, as in [line, root]`,
      ["fits"],
    );
  }
  const names = v.map((x, i) => {
    const s = typeof x === "string" ? x.trim() : "";
    if (s === "" || /\s/.test(s)) {
      throw new CellError(
        `Fit ${i + 1} of compare "${ctx.name}" is "${shown(x)}": expected the name of a fit cell`,
        ["fits", i],
      );
    }
    return s;
  });
  names.forEach((s, i) => {
    const first = names.indexOf(s);
    if (first !== i) {
      throw new CellError(
        `Fit "${s}" is listed twice in compare "${ctx.name}": as fits ${first + 1} and ${i + 1}`,
        ["fits", i],
      );
    }
  });
  if (names.length < 2) {
    throw new CellError(
      `Compare "${ctx.name}" lists ${names.length === 1 ? `one fit, "${names[0]}"` : "no fits"}: ` +
        "a comparison needs two or more fits (a single fit's criteria are in its own result)",
      ["fits"],
    );
  }
  return names;
}

function criterion(ctx: ParseContext, v: unknown): Criterion {
  const raw = v === undefined || v === null ? ctx.settings.criterion : v;
  const c = typeof raw === "string" ? raw.trim().toLowerCase() : "";
  if ((CRITERIA as readonly string[]).includes(c)) return c as Criterion;
  const hint = didYouMean(c || String(raw), CRITERIA) || `: expected ${CRITERIA.join(", ")}`;
  throw new CellError(
    `Criterion "${shown(raw)}" of compare "${ctx.name}" is not known${hint}`,
    v === undefined || v === null ? [] : ["by"],
  );
}
