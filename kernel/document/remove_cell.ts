/**
 * Removing a cell with the fewest byte changes.
 *
 * @module
 */
import type { ParsedDocument } from "./types.ts";
import { blankBefore, blankLineAt, contentStart, findCell } from "./_edit.ts";

/**
 * The document's new source without cell `name`: its fences and body are
 * removed, plus one blank line after it when a blank line (or the start of
 * the content) precedes it, so no double gap is left behind.
 *
 * @param doc A parsed document.
 * @param name The cell's name (the first cell of that name).
 * @returns The new document source.
 * @throws {ReferenceError} When no cell is named `name`.
 * @example
 * ```ts
 * import { parseDocument, removeCell } from "./mod.ts";
 * const doc = parseDocument("Intro\n\n~~~fit a\non: t\n~~~\n\nEnd\n");
 * if (removeCell(doc, "a") !== "Intro\n\nEnd\n") throw new Error("unexpected");
 * ```
 */
export function removeCell(doc: ParsedDocument, name: string): string {
  const cell = findCell(doc, name, "remove");
  const { source } = doc;
  let end = cell.end;
  if (blankBefore(source, cell.start, contentStart(doc))) end = blankLineAt(source, end);
  return source.slice(0, cell.start) + source.slice(end);
}
