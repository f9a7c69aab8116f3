/**
 * Lossless writing: a parsed document joins back to its source.
 *
 * @module
 */
import type { ParsedDocument } from "./types.ts";

/**
 * Joins a parsed document's parts (BOM, front matter, prose and cells, each
 * cell as its opening fence line, body and closing fence) back into text. For
 * a document from `parseDocument`, the result is `doc.source` byte for byte.
 *
 * @param doc A parsed document.
 * @returns The document text.
 * @throws {RangeError} When the blocks do not cover the source contiguously
 *   (a hand-built or edited `ParsedDocument`).
 * @example
 * ```ts
 * import { parseDocument, writeDocument } from "./mod.ts";
 * const src = "\uFEFF---\r\ntitle: T\r\n---\r\n~~~fit a\r\non: t\r\n~~~";
 * if (writeDocument(parseDocument(src)) !== src) throw new Error("not lossless");
 * ```
 */
export function writeDocument(doc: ParsedDocument): string {
  const { source } = doc;
  const parts: string[] = doc.bom ? ["\uFEFF"] : [];
  let at = doc.bom ? 1 : 0;
  const fm = doc.frontMatter;
  if (fm !== null) {
    parts.push(source.slice(fm.start, fm.bodyStart), fm.raw, source.slice(fm.bodyEnd, fm.end));
    at = fm.end;
  }
  for (const b of doc.blocks) {
    if (b.start !== at) {
      throw new RangeError(
        `Cannot write the document: a block starts at ${b.start}, expected ${at}`,
      );
    }
    if (b.type === "prose") parts.push(b.text);
    else {
      parts.push(source.slice(b.start, b.bodyStart), b.body, source.slice(b.bodyEnd, b.end));
    }
    at = b.end;
  }
  if (at !== source.length) {
    throw new RangeError(
      `Cannot write the document: blocks end at ${at}, the source at ${source.length}`,
    );
  }
  return parts.join("");
}
