/**
 * Content fingerprints of a table's rows for the run history: one 32-bit
 * hash a used row, over the values of the columns read from the source (not
 * the derived ones, so a new `derive` changes no row), and hashes of blocks
 * of rows and of the whole content built from those.
 *
 * Method: MurmurHash3, x86 32-bit variant (A. Appleby, SMHasher, public
 * domain), fed one 32-bit word at a time: its body step per word and its
 * finaliser `fmix32` with the byte length. Words of a row, column by column:
 *
 * ```
 *  number  ─▶ low word, high word of the IEEE double (every NaN as one NaN)
 *  text    ─▶ length + 1, then UTF-16 code units two to a word
 *  missing ─▶ 0 (a text column's null; a missing number is NaN)
 * ```
 *
 * Unlike FNV over whole words, each word's high bits reach the hash's low
 * bits (the rotations), so changes that touch only a double's upper word
 * (integers, halves) mix as well as any.
 *
 * @module
 */
import type { Column } from "../../kernel/contract/mod.ts";

/** The name of this fingerprint, kept with it: records of another kind compare by count only. */
export const ROW_HASH = "murmur3-32";

const f64 = new Float64Array(1);
const u32 = new Uint32Array(f64.buffer);
const NAN_LOW = 0, NAN_HIGH = 0x7ff80000;

/** MurmurHash3's body step: one word `k` into the state `h`. */
function step(h: number, k: number): number {
  k = Math.imul(k, 0xcc9e2d51);
  k = (k << 15) | (k >>> 17);
  k = Math.imul(k, 0x1b873593);
  h ^= k;
  h = (h << 13) | (h >>> 19);
  return (Math.imul(h, 5) + 0xe6546b64) | 0;
}

/** MurmurHash3's finaliser (`fmix32`) after the byte count. */
function finish(h: number, bytes: number): number {
  h ^= bytes;
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

/**
 * One hash a row over `columns` (all of the same length).
 *
 * @param columns The columns to cover, in order.
 * @param n The number of rows.
 * @returns The hashes, row by row.
 * @example
 * ```ts
 * import { rowHashes } from "./_row_hash.ts";
 * const x = { name: "x", type: "number" as const, unit: null, values: Float64Array.of(1, 2, 1), lo: null, missing: 0 };
 * const h = rowHashes([x], 3);
 * if (h[0] !== h[2] || h[0] === h[1]) throw new Error("equal rows hash alike, others not");
 * ```
 */
export function rowHashes(columns: readonly Column[], n: number): Uint32Array {
  const h = new Int32Array(n);
  const words = new Uint32Array(n);
  for (const c of columns) {
    if (c.type === "number") {
      const v = c.values;
      for (let i = 0; i < n; i++) {
        f64[0] = v[i];
        const nan = v[i] !== v[i];
        h[i] = step(step(h[i], nan ? NAN_LOW : u32[0]), nan ? NAN_HIGH : u32[1]);
      }
      for (let i = 0; i < n; i++) words[i] += 2;
    } else {
      for (let i = 0; i < n; i++) {
        const s = c.values[i];
        let x = step(h[i], s === null ? 0 : s.length + 1);
        let w = 1;
        if (s !== null) {
          for (let k = 0; k < s.length; k += 2, w++) {
            x = step(x, s.charCodeAt(k) | ((k + 1 < s.length ? s.charCodeAt(k + 1) : 0) << 16));
          }
        }
        h[i] = x;
        words[i] += w;
      }
    }
  }
  const out = new Uint32Array(n);
  for (let i = 0; i < n; i++) out[i] = finish(h[i], 4 * words[i]);
  return out;
}

/**
 * One hash over row hashes `from` to `to` (exclusive), in order.
 *
 * @param h Row hashes.
 * @param from First row (0-based).
 * @param to One past the last.
 * @returns The hash.
 */
export function hashOfRows(h: ArrayLike<number>, from: number, to: number): number {
  let x = 0;
  for (let i = from; i < to; i++) x = step(x, h[i]);
  return finish(x, 4 * (to - from));
}

/**
 * A hash a block of `size` rows (the last may be shorter), as one string of
 * 8 hex digits a block.
 *
 * @param h Row hashes.
 * @param size Rows a block.
 * @returns The concatenated block hashes.
 */
export function blockHashes(h: ArrayLike<number>, size: number): string {
  let out = "";
  for (let b = 0; b < h.length; b += size) {
    out += hex8(hashOfRows(h, b, Math.min(h.length, b + size)));
  }
  return out;
}

/** A 32-bit number as 8 hex digits. */
export const hex8 = (x: number): string => (x >>> 0).toString(16).padStart(8, "0");

/**
 * A string of 8-digit hashes cut into its hashes; null when it is not one
 * (a record of an older or damaged kind). The pieces are compared as text.
 *
 * @param s The concatenated hashes.
 * @returns The hashes, or null.
 */
export function splitHashes(s: unknown): string[] | null {
  if (typeof s !== "string" || s.length % 8 !== 0) return null;
  const out: string[] = new Array(s.length / 8);
  for (let i = 0; i < out.length; i++) out[i] = s.slice(8 * i, 8 * i + 8);
  return out;
}

/**
 * Hex hashes back to numbers (to hash them again by blocks); null when one is not hex.
 *
 * @param hashes 8 hex digits each.
 * @returns The numbers, or null.
 */
export function hexValues(hashes: readonly string[]): Uint32Array | null {
  const out = new Uint32Array(hashes.length);
  for (let i = 0; i < hashes.length; i++) {
    if (!/^[0-9a-f]{8}$/.test(hashes[i])) return null;
    out[i] = parseInt(hashes[i], 16);
  }
  return out;
}
