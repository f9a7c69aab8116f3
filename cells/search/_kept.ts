/**
 * The best few subsets of one size, by residual sum of squares: a bounded
 * max-heap (the worst kept at the root), so a subset that cannot enter costs
 * one comparison and one that can costs O(log capacity).
 *
 * ```
 *  offer(rss, mask) ── rss < worst? ──no──▶ dropped
 *                            │ yes
 *                            ▼
 *        root replaced, sifted down (or pushed while not full)
 * ```
 *
 * Ties keep the subset offered first, so a search is deterministic.
 *
 * @module
 */

/** A bounded list of the smallest residual sums of squares with their subsets. */
export class Kept {
  readonly capacity: number;
  #rss: Float64Array;
  #mask: Int32Array;
  #size = 0;

  /**
   * @param capacity How many subsets to keep (at least 1).
   */
  constructor(capacity: number) {
    this.capacity = capacity;
    this.#rss = new Float64Array(capacity);
    this.#mask = new Int32Array(capacity);
  }

  /** The largest RSS kept once full; Infinity before. */
  get worst(): number {
    return this.#size < this.capacity ? Infinity : this.#rss[0];
  }

  /** How many are kept. */
  get size(): number {
    return this.#size;
  }

  /**
   * Offers a subset.
   *
   * @param rss Its residual sum of squares.
   * @param mask Its candidates as a bit mask.
   */
  offer(rss: number, mask: number): void {
    const h = this.#rss, k = this.#mask;
    if (this.#size < this.capacity) {
      let i = this.#size++;
      while (i > 0) {
        const up = (i - 1) >> 1;
        if (h[up] >= rss) break;
        h[i] = h[up];
        k[i] = k[up];
        i = up;
      }
      h[i] = rss;
      k[i] = mask;
      return;
    }
    if (!(rss < h[0])) return;
    let i = 0;
    for (;;) {
      const l = 2 * i + 1, r = l + 1;
      let top = i, topRss = rss;
      if (l < this.capacity && h[l] > topRss) (top = l), (topRss = h[l]);
      if (r < this.capacity && h[r] > topRss) top = r;
      if (top === i) break;
      h[i] = h[top];
      k[i] = k[top];
      i = top;
    }
    h[i] = rss;
    k[i] = mask;
  }

  /**
   * The kept subsets, smallest RSS first (ties by mask).
   *
   * @returns Masks and their RSS.
   * @example
   * ```ts
   * import { Kept } from "./_kept.ts";
   * const k = new Kept(2);
   * [[3, 1], [1, 2], [2, 4], [0.5, 8]].forEach(([r, m]) => k.offer(r, m));
   * if (k.sorted().map((s) => s.mask).join() !== "8,2") throw new Error("two smallest");
   * ```
   */
  sorted(): { mask: number; rss: number }[] {
    const out = [];
    for (let i = 0; i < this.#size; i++) out.push({ mask: this.#mask[i], rss: this.#rss[i] });
    return out.sort((a, b) => a.rss - b.rss || a.mask - b.mask);
  }
}
