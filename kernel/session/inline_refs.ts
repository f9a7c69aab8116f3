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
