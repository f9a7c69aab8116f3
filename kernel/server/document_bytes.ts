/**
 * The document's bytes as the save path reads them: exactly, or not at all.
 * The text is decoded strictly and keeps a byte-order mark as U+FEFF (the
 * document layer knows it), so encoding the edited text again gives back
 * every byte outside the edit: a loose decode would drop the BOM and turn
 * bytes that are not UTF-8 into U+FFFD, rewriting them on the next save.
 *
 * @module
 */
import { basename } from "node:path";
import { sha256Hex } from "../hash.ts";

/** A document as on disk. */
export interface DocumentBytes {
  bytes: Uint8Array;
  /** The text, BOM included as U+FEFF. */
  source: string;
  /** Lower-case hex SHA-256 of the bytes. */
  version: string;
}

/** Why the save path will not edit a document: `status` is the HTTP status to answer. */
export class DocumentRefusal extends Error {
  override name = "DocumentRefusal";
  /**
   * @param message What is wrong, in plain words.
   * @param status 404 (gone) or 422 (not UTF-8).
   */
  constructor(message: string, readonly status: 404 | 422) {
    super(message);
  }
}

/**
 * Decodes a document's bytes for editing.
 *
 * @param bytes The bytes on disk.
 * @param path The document's path (its name goes into the message).
 * @returns The text, BOM kept.
 * @throws {DocumentRefusal} 422 naming the first byte that is not UTF-8 and its offset.
 * @example
 * ```ts
 * import { decodeDocument } from "./document_bytes.ts";
 * if (decodeDocument(new Uint8Array([0xef, 0xbb, 0xbf, 0x41]), "a.md") !== "\uFEFFA") throw new Error();
 * ```
 */
export function decodeDocument(bytes: Uint8Array, path: string): string {
  try {
    return new TextDecoder("utf-8", { fatal: true, ignoreBOM: true }).decode(bytes);
  } catch {
    const at = firstBadByte(bytes);
    const hex = bytes[at]?.toString(16).padStart(2, "0") ?? "end";
    throw new DocumentRefusal(
      `Cannot edit "${basename(path)}": it is not valid UTF-8 (byte 0x${hex} at offset ${at}); ` +
        `save it as UTF-8 in a text editor first`,
      422,
    );
  }
}

/**
 * Reads and decodes the document.
 *
 * @param path The document.
 * @returns Its bytes, text and version.
 * @throws {DocumentRefusal} 404 when the file is gone, 422 when it is not UTF-8.
 */
export async function readDocumentBytes(path: string): Promise<DocumentBytes> {
  let bytes: Uint8Array;
  try {
    bytes = await Deno.readFile(path);
  } catch (err) {
    if (!(err instanceof Deno.errors.NotFound)) throw err;
    throw new DocumentRefusal(`Cannot edit "${basename(path)}": the file is no longer there`, 404);
  }
  return { bytes, source: decodeDocument(bytes, path), version: await sha256Hex(bytes) };
}

/** Offset of the first byte that starts no valid UTF-8 sequence (RFC 3629 §4 syntax). */
function firstBadByte(b: Uint8Array): number {
  let i = 0;
  while (i < b.length) {
    const n = sequenceLength(b, i);
    if (n === 0) return i;
    i += n;
  }
  return b.length;
}

function sequenceLength(b: Uint8Array, i: number): number {
  const c = b[i];
  if (c < 0x80) return 1;
  const [n, lo, hi] = c >= 0xc2 && c <= 0xdf
    ? [2, 0x80, 0xbf]
    : c === 0xe0
    ? [3, 0xa0, 0xbf]
    : c === 0xed
    ? [3, 0x80, 0x9f]
    : c >= 0xe1 && c <= 0xef
    ? [3, 0x80, 0xbf]
    : c === 0xf0
    ? [4, 0x90, 0xbf]
    : c === 0xf4
    ? [4, 0x80, 0x8f]
    : c >= 0xf1 && c <= 0xf3
    ? [4, 0x80, 0xbf]
    : [0, 0, 0];
  if (n === 0 || i + n > b.length || b[i + 1] < lo || b[i + 1] > hi) return 0;
  for (let k = 2; k < n; k++) if (b[i + k] < 0x80 || b[i + k] > 0xbf) return 0;
  return n;
}
