/**
 * The two mixing steps of MurmurHash3_x86_32 (Appleby, MurmurHash3, public
 * domain reference implementation): the body step that folds one 32-bit word
 * into the running state, and the finaliser `fmix32`. The one home of them:
 * the cache keys (hash.ts), lack of fit's grouping of rows by their bits
 * (kernel/stats/lack_of_fit.ts) and the table's row fingerprints in the run
 * history all mix with these.
 *
 * @module
 */

/**
 * One 32-bit word `k` into the running state `h`.
 *
 * @param h The state (any 32-bit integer).
 * @param k The word.
 * @returns The new state, a signed 32-bit integer.
 * @example
 * ```ts
 * import { fmix32, murmurStep } from "./murmur3.ts";
 * if (murmurStep(0, 1) === murmurStep(0, 2) || fmix32(0) !== 0) throw new Error("mixing");
 * ```
 */
export function murmurStep(h: number, k: number): number {
  k = Math.imul(k, 0xcc9e2d51);
  k = (k << 15) | (k >>> 17);
  k = Math.imul(k, 0x1b873593);
  h ^= k;
  h = (h << 13) | (h >>> 19);
  return (Math.imul(h, 5) + 0xe6546b64) | 0;
}

/**
 * The finaliser: every input bit affects every output bit.
 *
 * @param h The state (after the length is folded in by the caller).
 * @returns The hash, an unsigned 32-bit integer.
 */
export function fmix32(h: number): number {
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}
