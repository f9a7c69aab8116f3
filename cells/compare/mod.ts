/**
 * The `compare` cell kind: ranks fits of the same response on the same rows
 * by an information criterion or leave-one-out error, with Akaike weights,
 * nested F tests and a verdict that names its evidence scale.
 *
 * ```compare shape
 * fits: [line, root, power]
 * by: aicc
 * ```
 *
 * @example
 * ```ts
 * import { compareKind } from "./mod.ts";
 * if (compareKind.kind !== "compare" || compareKind.output !== "Comparison") throw new Error("unexpected");
 * ```
 *
 * @module
 */
import type { CellKind } from "../../kernel/contract/mod.ts";
import { type CompareSpec, parseCompareSpec } from "./spec.ts";
import type { CompareResult, Comparison } from "./result.ts";
import { runCompare } from "./run.ts";
import { compareLine } from "./line.ts";
import { COMPARE_OPTIONS } from "./spec.ts";
import type { TemplateContext } from "../../kernel/contract/mod.ts";
import { cellsOf } from "../shared/template_cells.ts";

export type { CompareSpec, Criterion } from "./spec.ts";
export type { CompareResult, CompareRow, Comparison } from "./result.ts";
export type { NestedTest } from "./nested_tests.ts";

/** The `compare` kind record. */
export const compareKind: CellKind<CompareSpec, Comparison, CompareResult> = {
  kind: "compare",
  body: "yaml",
  output: "Comparison",
  description: "ranks fits by AIC, AICc, BIC or leave-one-out error, with weights and F tests",
  parse: parseCompareSpec,
  inputs: (spec) => spec.fits.map((name, i) => ({ name, accepts: ["Fit"], path: ["fits", i] })),
  run: runCompare,
  summary: (out) => out.result,
  line: compareLine,
  options: COMPARE_OPTIONS,
  template: compareTemplate,
};

/** A new comparison: the last two fits of the same table and response. */
function compareTemplate(ctx: TemplateContext): string {
  const fits = cellsOf(ctx, "Fit");
  const last = fits.at(-1);
  const same = fits.filter((f) =>
    f.inputs.join() === last?.inputs.join() &&
    (f.result as { response?: string } | null)?.response ===
      (last?.result as { response?: string } | null)?.response
  );
  const pick = (same.length >= 2 ? same : fits).slice(-2).map((f) => f.name);
  return `fits: [${(pick.length === 2 ? pick : ["fit1", "fit2"]).join(", ")}]\n`;
}
