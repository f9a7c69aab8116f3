/**
 * The `document` message: the document as the page shows it, with one line
 * of facts per data file.
 *
 * @module
 */
import type { ParsedDocument } from "../document/mod.ts";
import type { DocumentMessage, LiveBlock } from "./protocol.ts";

/** What the workspace learnt about one data file (nulls when it could not be read). */
export interface FileInfo {
  path: string;
  sha256: string | null;
  bytes: Uint8Array | null;
  mtime: Date | null;
}

/**
 * Counts the data rows of delimited text: non-blank lines after the first
 * (the header). Quoted fields holding line breaks count once per line, so the
 * count is exact for the usual one-record-per-line files.
 *
 * @param bytes The file's content.
 * @returns The row count, or null for content with NUL bytes (not text).
 * @example
 * ```ts
 * import { countRows } from "./document_message.ts";
 * const rows = countRows(new TextEncoder().encode("x,y\n1,2\n3,4\n\n"));
 * if (rows !== 2) throw new Error(String(rows));
 * ```
 */
export function countRows(bytes: Uint8Array): number | null {
  let lines = 0;
  let blank = true;
  for (let i = 0; i < bytes.length; i++) {
    const b = bytes[i];
    if (b === 0) return null;
    if (b === 10) {
      if (!blank) lines++;
      blank = true;
    } else if (b !== 13 && b !== 32 && b !== 9) blank = false;
  }
  if (!blank) lines++;
  return Math.max(0, lines - 1);
}

/**
 * Builds the `document` message.
 *
 * @param path The document's path as given to `plumb serve`.
 * @param version Hex SHA-256 of the document's bytes.
 * @param title The title to show.
 * @param doc The parsed document.
 * @param files The data files its cells read, in document order.
 * @returns The message.
 * @example
 * ```ts
 * import { documentMessage } from "./document_message.ts";
 * import { parseDocument } from "../document/mod.ts";
 * const doc = parseDocument("# A\n\n~~~fit f\non: t\n~~~\n");
 * const m = documentMessage("a.md", "00", "A", doc, []);
 * if (m.blocks.length !== 2 || m.blocks[1].type !== "cell") throw new Error("blocks");
 * ```
 */
export function documentMessage(
  path: string,
  version: string,
  title: string,
  doc: ParsedDocument,
  files: FileInfo[],
): DocumentMessage {
  const blocks: LiveBlock[] = doc.blocks.map((b) =>
    b.type === "prose"
      ? { type: "prose", line: b.line, text: b.text }
      : { type: "cell", name: b.name, kind: b.kind, line: b.line, body: b.body }
  );
  return {
    type: "document",
    version,
    path,
    title,
    source: doc.source,
    blocks,
    data: files.map((f) => ({
      path: f.path,
      rows: f.bytes ? countRows(f.bytes) : null,
      bytes: f.bytes?.length ?? 0,
      changed: f.mtime?.toISOString() ?? "",
    })),
  };
}
