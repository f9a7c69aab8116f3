/**
 * Rows grouped by equal values in every given column, in linear time and
 * without a string per row: the lack-of-fit test's replicate groups.
 *
 * Method: hashing with open addressing and linear probing (Knuth, *The Art
 * of Computer Programming* vol. 3, 2nd ed., §6.4, Algorithm L; from memory
 * for the algorithm's letter). Each row's key is the bit patterns of its
 * values (two 32-bit words per column, read through a Uint32Array view of
 * the column, no copy), hashed as MurmurHash3_x86_32 hashes a key of 32-bit
 * blocks (Appleby 2011, public domain; common practice, no published
 * source), one column at a time over all rows (each column read straight
 * through); the table has at least 2n slots, so a probe visits about 1.5
 * slots on average. Equal hashes are confirmed by comparing the values
 * themselves, so the grouping is exact.
 *
 * Equality is that of the strings the check compared before (`String(v)`
 * is exact for doubles): −0 and 0 are one value, and every NaN is one
 * value; both are hashed as a canonical pattern.
 *
 * ```
 *   rows ──hash──▶ slots (2^k ≥ 2n, −1 empty) ──▶ first row of each group
 *                   └──────────────▶ group[i] = its group, numbered in order of first row
 * ```
 *
 * @module
 */

/** Each row's group and the number of groups. */
export interface RowGroups {
  /** group[i] ∈ [0, count): groups numbered in order of their first row. */
  group: Int32Array;
  count: number;
}

/**
 * Groups rows that are equal in every column.
 *
 * @param columns The columns, each at least `n` long (read, not copied).
 * @param n Rows.
 * @returns Each row's group and the number of groups.
 * @example
 * ```ts
 * import { groupRows } from "./_row_groups.ts";
 * const g = groupRows([Float64Array.of(1, 2, 1, -0, 0), Float64Array.of(5, 5, 5, 7, 7)], 5);
 * if (g.count !== 3 || g.group.join() !== "0,1,0,2,2") throw new Error(g.group.join());
 * ```
 */
export function groupRows(columns: readonly Float64Array[], n: number): RowGroups {
  const hash = new Int32Array(n).fill(SEED);
  for (const c of columns) {
    const words = new Uint32Array(c.buffer, c.byteOffset, 2 * c.length);
    for (let i = 0; i < n; i++) {
      const v = c[i];
      // −0 and 0 alike, every NaN alike (as String(v) groups them); other values by their bits.
      const lo = v === 0 || v !== v ? 0 : words[2 * i];
      const hi = v === 0 ? 0 : v !== v ? 0x7ff80000 : words[2 * i + 1];
      hash[i] = block(block(hash[i], lo), hi);
    }
  }
  const length = 8 * columns.length;
  for (let i = 0; i < n; i++) hash[i] = fmix32(hash[i] ^ length);
  let size = 2;
  while (size < 2 * n) size *= 2;
  const mask = size - 1, slots = new Int32Array(size).fill(-1);
  const group = new Int32Array(n);
  let count = 0;
  for (let i = 0; i < n; i++) {
    const h = hash[i];
    let s = h & mask;
    for (;;) {
      const r = slots[s];
      if (r < 0) {
        slots[s] = i;
        group[i] = count++;
        break;
      }
      if (hash[r] === h && sameRow(columns, r, i)) {
        group[i] = group[r];
        break;
      }
      s = (s + 1) & mask;
    }
  }
  return { group, count };
}

const SEED = 0x9747b28c | 0;

/** One 32-bit block k into the running hash h (MurmurHash3_x86_32's body). */
function block(h: number, k: number): number {
  k = Math.imul(k, 0xcc9e2d51);
  k = (k << 15) | (k >>> 17);
  k = Math.imul(k, 0x1b873593);
  h ^= k;
  h = (h << 13) | (h >>> 19);
  return (Math.imul(h, 5) + 0xe6546b64) | 0;
}

/** MurmurHash3's 32-bit finaliser: every input bit affects every output bit. */
function fmix32(h: number): number {
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  return h ^ (h >>> 16);
}

/** Whether rows a and b hold the same value in every column (NaN equal to NaN). */
function sameRow(columns: readonly Float64Array[], a: number, b: number): boolean {
  for (let c = 0; c < columns.length; c++) {
    const x = columns[c][a], y = columns[c][b];
    if (x !== y && (x === x || y === y)) return false;
  }
  return true;
}
