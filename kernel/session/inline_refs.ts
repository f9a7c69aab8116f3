/**
 * Checks inline references in prose (`@(root.r2, 3)`) against the cells of
 * the document before anything runs: an unknown cell is an error at that
 * spot, with the nearest name suggested, never silent text. Fields are
 * checked when a value is shown, since they depend on the result.
 *
 * @module
 */
import { findInlineRefs, type ParsedDocument } from "../document/mod.ts";
import { LocatedError } from "../errors.ts";
import type { Graph } from "../graph/build.ts";
import { didYouMean } from "../suggest.ts";

/**
 * Finds malformed and dangling inline references.
 *
 * @param doc The parsed document.
 * @param graph Its graph (for cell names).
 * @returns Located errors, in document order.
 */
export function checkInlineRefs(doc: ParsedDocument, graph: Graph): LocatedError[] {
  const errors: LocatedError[] = [];
  for (const block of doc.blocks) {
    if (block.type !== "prose") continue;
    const found = findInlineRefs(block);
    errors.push(...found.errors);
    for (const ref of found.refs) {
      if (graph.byName.has(ref.cell)) continue;
      errors.push(
        new LocatedError(
          `Unknown cell "${ref.cell}" in inline reference${
            didYouMean(ref.cell, graph.byName.keys())
          }`,
          { line: ref.line, column: ref.column },
        ),
      );
    }
  }
  return errors;
}

/**
 * The top-level result fields that the document's inline values name, per cell.
 *
 * @param doc The parsed document.
 * @returns Cell name → field names (`@(root.residuals[3])` names `residuals` of `root`).
 * @example
 * ```ts
 * import { parseDocument } from "../document/mod.ts";
 * import { referencedFields } from "./inline_refs.ts";
 * const doc = parseDocument("Residual @(root.residuals[3], 3) and @(root.r2).\n");
 * const f = referencedFields(doc).get("root");
 * if (!f?.has("residuals") || !f.has("r2")) throw new Error("fields");
 * ```
 */
export function referencedFields(doc: ParsedDocument): Map<string, Set<string>> {
  const out = new Map<string, Set<string>>();
  for (const block of doc.blocks) {
    if (block.type !== "prose") continue;
    for (const ref of findInlineRefs(block).refs) {
      // `@(fit.result.rows[0])` names the field after the explicit `result`.
      const first = ref.path[0] === "result" && ref.path.length > 1 ? ref.path[1] : ref.path[0];
      if (typeof first !== "string") continue;
      let set = out.get(ref.cell);
      if (set === undefined) out.set(ref.cell, set = new Set());
      set.add(first);
    }
  }
  return out;
}
