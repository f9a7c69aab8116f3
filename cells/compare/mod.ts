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
import { compareHistory } from "./history.ts";
import type { TemplateCell, TemplateContext } from "../../kernel/contract/mod.ts";
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
  history: compareHistory,
};

/**
 * A new comparison: the latest two fits of one table and one response (fits
 * of different data are not comparable), else the last two fits.
 */
function compareTemplate(ctx: TemplateContext): string {
  const fits = cellsOf(ctx, "Fit");
  const basis = (f: TemplateCell) =>
    `${f.inputs.join()}|${(f.result as { response?: string } | null)?.response ?? ""}`;
  const pair = fits.map((f) => fits.filter((g) => basis(g) === basis(f)))
    .filter((group) => group.length >= 2).at(-1)?.slice(-2) ?? fits.slice(-2);
  const names = pair.length === 2 ? pair.map((f) => f.name) : ["fit1", "fit2"];
  return `fits: [${names.join(", ")}]\n`;
}
