/**
 * The `search` cell kind: ranks every subset of up to 25 candidate
 * predictor columns by BIC, AIC, AICc, adjusted R² or leave-one-out error,
 * and keeps the best models per size and overall.
 *
 * ```search drivers
 * on: runs
 * response: yield
 * candidates: [temp, feed, pressure, stir, age]
 * ```
 *
 * No subset is fitted from scratch: each is one sweep step from its parent
 * in Furnival's tree over the correlation-scale cross-products
 * (`subset_tree.ts`, `cross_products.ts`); the models kept are then fitted
 * by QR and their criteria computed as a fit and a compare would
 * (`exact_fit.ts`, `rank_sizes.ts`).
 *
 * @example
 * ```ts
 * import { searchKind } from "./mod.ts";
 * if (searchKind.kind !== "search" || searchKind.output !== "Ranked") throw new Error("unexpected");
 * ```
 *
 * @module
 */
import type { CellKind, TemplateContext } from "../../kernel/contract/mod.ts";
import { parseSearchSpec, SEARCH_OPTIONS, type SearchSpec } from "./spec.ts";
import type { SearchOutput, SearchResult } from "./result.ts";
import { runSearch } from "./run.ts";
import { searchDetails, searchLine } from "./line.ts";
import { cellsOf, numberColumns, tableFor } from "../shared/template_cells.ts";

export type { SearchCriterion, SearchSpec } from "./spec.ts";
export type { SearchModel, SearchOutput, SearchResult, SearchSize } from "./result.ts";

/** The `search` kind record. */
export const searchKind: CellKind<SearchSpec, SearchOutput, SearchResult> = {
  kind: "search",
  body: "yaml",
  output: "Ranked",
  description: "ranks every subset of candidate predictors by a criterion, best models per size",
  parse: parseSearchSpec,
  inputs: (spec) => [{ name: spec.on, accepts: ["Table"], path: ["on"] }],
  run: runSearch,
  summary: (out) => out.result,
  line: searchLine,
  details: searchDetails,
  options: SEARCH_OPTIONS,
  template: searchTemplate,
};

/**
 * A new search: on the table the last fit reads, for that fit's response,
 * over the table's other number columns; without a fit, the last table's
 * last number column as the response. At most 25 candidates.
 */
function searchTemplate(ctx: TemplateContext): string {
  const fit = cellsOf(ctx, "Fit").findLast((f) => {
    const r = f.result as { response?: unknown } | null;
    return typeof r?.response === "string" && /^[A-Za-z_]\w*$/.test(r.response);
  });
  const table =
    (fit && ctx.cells.find((c) => c.output === "Table" && fit.inputs.includes(c.name))) ??
      tableFor(ctx, 2);
  const cols = numberColumns(table);
  const fitResponse = (fit?.result as { response?: string } | null)?.response;
  const response = fitResponse !== undefined && cols.includes(fitResponse)
    ? fitResponse
    : cols.at(-1) ?? "y";
  const others = cols.filter((c) => c !== response).slice(0, 25);
  const candidates = others.length > 0 ? others : ["x1", "x2"];
  return `on: ${table?.name ?? "table1"}\nresponse: ${response}\ncandidates: [${
    candidates.join(", ")
  }]\n`;
}
