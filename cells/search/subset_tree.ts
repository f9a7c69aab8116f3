/**
 * Every subset of the candidates, each reached from its parent by one sweep
 * step: the lexicographic tree of Furnival (1971, "All possible regressions
 * with less computation", Technometrics 13:403–408), the regression tree
 * that Furnival & Wilson (1974, "Regressions by leaps and bounds",
 * Technometrics 16:499–511) build their bounds on. No subset is fitted from
 * scratch.
 *
 * ```
 *  {}                    a node holds the cross-products with its subset swept;
 *  ├─ {1}                only the rows and columns after its last candidate are
 *  │  ├─ {1,2}           kept, since its children add later candidates only
 *  │  │  └─ {1,2,3}
 *  │  └─ {1,3}           child S ∪ {l} = parent's block, pivot l eliminated
 *  ├─ {2}                (cross_products.ts `eliminate`): (c − l)²/2 products
 *  │  └─ {2,3}
 *  └─ {3}
 * ```
 *
 * Cost: the 2^(l−1) subsets whose last candidate is l each take about
 * (c − l + 1)²/2 multiply–adds, about 3·2^c over the whole tree, against
 * (c + 1)²/2 for every step of a Gray-code walk; and a path from the root is
 * at most c steps long, so rounding never builds up the way it would over
 * millions of alternate forward and reverse sweeps. One matrix per depth is
 * kept (depth-first), m² doubles each.
 *
 * Within one size every criterion here (AIC, AICc, BIC with n and k fixed,
 * adjusted R² with p fixed) is monotone in the residual sum of squares, so
 * a node only offers its RSS to its size's {@link Kept} list; the
 * criteria are computed afterwards, for the kept subsets only.
 *
 * Collinearity: a pivot at or below {@link PIVOT_TOLERANCE} (the share of
 * the candidate's length that the subset leaves unexplained, 1/VIF) marks
 * the child aliased. It is not swept (no division by a number near 0); it
 * and all its descendants, which contain it, are counted as aliased and
 * ranked after every estimable subset.
 *
 * @module
 */
import { eliminate } from "./cross_products.ts";

/**
 * Pivots at or below this (1 − R² of a candidate on the subset before it;
 * a variance inflation factor above 1e10) mark a subset aliased: its fit
 * would lose about ten digits (common practice, no source for the value).
 */
export const PIVOT_TOLERANCE = 1e-10;

/** How many aliased subsets a search names. */
const NAMED_ALIASED = 5;

/** Subsets between two progress reports. */
const PROGRESS_EVERY = 1 << 16;

/** What the tree walk is given. */
export interface TreeInput {
  /** The cross-products, columns in order: the forced terms already eliminated, the candidates, the response last. */
  a: Float64Array;
  /** Order of `a`. */
  m: number;
  /** Index in `a` of the first candidate (the number of forced terms). */
  first: number;
  /** Number of candidates. */
  c: number;
  /** Largest subset size visited. */
  largest: number;
  /** Whether the empty subset is a model (an intercept or forced terms). */
  withEmpty: boolean;
  /** Subsets kept per size. */
  keep: number;
  /** Told the share of subsets visited, now and then. */
  progress?: (fraction: number, visited: number, total: number) => void;
}

/** What the walk found. */
export interface TreeResult {
  /** Per size 0…largest: the kept subsets, smallest RSS first (RSS on the unit scale of the response). */
  kept: { mask: number; rss: number }[][];
  /** Per size: how many subsets are aliased. */
  aliased: number[];
  /** Per size: how many subsets there are (the empty subset counts only when it is a model). */
  subsets: number[];
  /** A few aliased subsets, none containing another (the smallest met, in the order met). */
  aliasedExamples: number[];
}

/**
 * Walks every subset of up to `largest` candidates.
 *
 * @param input The swept cross-products and what to keep.
 * @returns The kept subsets per size and the aliased counts.
 */
export function walkSubsets(input: TreeInput): TreeResult {
  const { m, first, c, largest, keep } = input;
  const y = m - 1;
  const levels = Array.from(
    { length: largest + 1 },
    (_, d) => d === 0 ? input.a : new Float64Array(m * m),
  );
  const kept = Array.from({ length: largest + 1 }, () => new Kept(keep));
  const aliased = new Array<number>(largest + 1).fill(0);
  const subsets = Array.from({ length: largest + 1 }, (_, s) => binomial(c, s));
  if (!input.withEmpty) subsets[0] = 0;
  const total = subsets.reduce((s, x) => s + x, 0);
  const examples: number[] = [];
  let visited = 0, nextReport = PROGRESS_EVERY;
  const count = (k: number) => {
    visited += k;
    if (visited >= nextReport && input.progress) {
      nextReport = visited + PROGRESS_EVERY;
      input.progress(visited / total, visited, total);
    }
  };
  if (input.withEmpty) {
    kept[0].offer(Math.max(input.a[y * m + y], 0), 0);
    count(1);
  }

  /** The children of the node at `depth` whose last candidate (index in `a`) is `last`. */
  const descend = (depth: number, last: number, mask: number): void => {
    const a = levels[depth], size = depth + 1, list = kept[size];
    const leaf = size === largest;
    for (let l = last + 1; l < first + c; l++) {
      const child = mask | (1 << (l - first));
      const pivot = a[l * m + l];
      if (!(pivot > PIVOT_TOLERANCE)) {
        markAliased(child, size, first + c - 1 - l);
        continue;
      }
      let rss: number;
      if (leaf || l === first + c - 1) {
        rss = a[y * m + y] - a[l * m + y] * a[l * m + y] / pivot;
      } else {
        eliminate(a, levels[size], m, l);
        rss = levels[size][y * m + y];
      }
      // Rounding can take a perfect fit's RSS just below 0.
      list.offer(rss > 0 ? rss : 0, child);
      count(1);
      if (!leaf && l < first + c - 1) descend(size, l, child);
    }
  };

  /** Counts an aliased node and its descendants (it plus any of the `after` later candidates). */
  const markAliased = (mask: number, size: number, after: number) => {
    let all = 0;
    for (let t = 0; size + t <= largest && t <= after; t++) {
      const k = binomial(after, t);
      aliased[size + t] += k;
      all += k;
    }
    // Keep the smallest: a new set inside a kept one replaces it; one holding a kept set is not new.
    if (!examples.some((e) => (e & mask) === e)) {
      const kept = examples.filter((e) => (e & mask) !== mask);
      if (kept.length < NAMED_ALIASED) examples.splice(0, examples.length, ...kept, mask);
    }
    count(all);
  };

  if (largest > 0) descend(0, first - 1, 0);
  input.progress?.(1, visited, total);
  return { kept: kept.map((k) => k.sorted()), aliased, subsets, aliasedExamples: examples };
}

/**
 * The binomial coefficient C(n, k), exact for the sizes a search meets (n ≤ 25).
 *
 * @param n Items.
 * @param k Chosen.
 * @returns C(n, k); 0 outside 0 ≤ k ≤ n.
 * @example
 * ```ts
 * import { binomial } from "./subset_tree.ts";
 * if (binomial(25, 12) !== 5200300 || binomial(3, 4) !== 0) throw new Error("C(25, 12)");
 * ```
 */
export function binomial(n: number, k: number): number {
  if (k < 0 || k > n) return 0;
  let r = 1;
  for (let i = 1; i <= k; i++) r = r * (n - k + i) / i;
  return Math.round(r);
}

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
 */
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
   * import { Kept } from "./subset_tree.ts";
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
