/**
 * Offsets to document positions.
 *
 * @module
 */
import type { SourcePos } from "../errors.ts";
import { floorIndex, lineStarts } from "./_lines.ts";

const cache = new WeakMap<object, number[]>();

/**
 * The 1-based line and column of a character offset in a document's source.
 * Columns count UTF-16 code units; a tab is one column; a BOM is not a column.
 * An offset just past a final line ending is the start of the (empty) next line.
 *
 * @param doc Anything with the document's `source` and `bom` (a {@link ParsedDocument}).
 * @param offset A code unit index into `doc.source`, clamped to `[0, source.length]`.
 * @returns The position, e.g. `{ line: 3, column: 1 }`.
 * @example
 * ```ts
 * import { lineColumnAt, parseDocument } from "./mod.ts";
 * const doc = parseDocument("a\r\nbc\rd");
 * const pos = lineColumnAt(doc, 4);
 * if (pos.line !== 2 || pos.column !== 2) throw new Error("expected 2:2");
 * ```
 */
export function lineColumnAt(doc: { source: string; bom: boolean }, offset: number): SourcePos {
  let starts = cache.get(doc);
  if (starts === undefined) {
    starts = lineStarts(doc.source, doc.bom ? 1 : 0);
    cache.set(doc, starts);
  }
  const at = Math.max(starts[0], Math.min(offset, doc.source.length));
  const k = floorIndex(starts, at);
  return { line: k + 1, column: at - starts[k] + 1 };
}
