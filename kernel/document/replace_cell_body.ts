/**
 * Replacing one cell's body, leaving every other byte of the document alone.
 *
 * @module
 */
import type { ParsedDocument } from "./types.ts";
import { closingLineIn, endingBefore, endsLine, findCell, withEnding } from "./_edit.ts";

/**
 * The document's new source with the body of cell `name` replaced. Only the
 * bytes in `[bodyStart, bodyEnd)` change. The new body's line endings become
 * the cell's own (that of its opening fence line), and a non-empty body gets
 * a final line ending so the closing fence stays on its own line. An unclosed
 * cell stays unclosed.
 *
 * @param doc A parsed document.
 * @param name The cell's name (the first cell of that name).
 * @param newBody The new body text, any line endings.
 * @returns The new document source.
 * @throws {ReferenceError} When no cell is named `name`.
 * @throws {RangeError} When a line of `newBody` would close the cell's fence.
 * @example
 * ```ts
 * import { parseDocument, replaceCellBody } from "./mod.ts";
 * const doc = parseDocument("~~~fit a\r\non: t\r\n~~~\r\n");
 * const out = replaceCellBody(doc, "a", "on: u\nmodel: y = k*x");
 * if (out !== "~~~fit a\r\non: u\r\nmodel: y = k*x\r\n~~~\r\n") throw new Error(out);
 * ```
 */
export function replaceCellBody(doc: ParsedDocument, name: string, newBody: string): string {
  const cell = findCell(doc, name, "replace the body of");
  const { source } = doc;
  const opensLine = endsLine(source, cell.bodyStart);
  const eol = endingBefore(source, cell.bodyStart);
  const body = withEnding(newBody, eol);
  const bad = closingLineIn(body, cell.fence);
  if (bad > 0) {
    const fence = cell.fence.char.repeat(cell.fence.length);
    throw new RangeError(
      `Cannot replace the body of "${name}": line ${bad} of the new body would close its ${fence} fence`,
    );
  }
  // A fence on the last line with no ending: the body must start on a new line.
  const lead = !opensLine && body.length > 0 ? eol : "";
  return source.slice(0, cell.bodyStart) + lead + body + source.slice(cell.bodyEnd);
}
