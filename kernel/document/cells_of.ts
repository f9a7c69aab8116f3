/**
 * The cells of a document, without the prose.
 *
 * @module
 */
import type { CellBlock, ParsedDocument } from "./types.ts";
import { cells } from "./_edit.ts";

/**
 * The cell blocks of a parsed document in document order.
 *
 * @param doc A parsed document.
 * @returns Its cells (duplicates by name included; the kernel reports those).
 * @example
 * ```ts
 * import { cellsOf, parseDocument } from "./mod.ts";
 * const doc = parseDocument("~~~table t\n~~~\n\ntext\n\n~~~fit f\n~~~\n");
 * if (cellsOf(doc).map((c) => c.name).join() !== "t,f") throw new Error("expected t,f");
 * ```
 */
export function cellsOf(doc: ParsedDocument): CellBlock[] {
  return cells(doc);
}
