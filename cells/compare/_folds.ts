/**
 * Seeded assignment of rows to cross-validation folds.
 *
 * Method: a Fisher–Yates shuffle (Knuth, *TAOCP* vol. 2, §3.4.2, Algorithm P)
 * driven by Mulberry32 (Tommy Ettinger, 2017, public domain; from memory), a
 * 32-bit generator that is small, fast and the same on every platform; then
 * the shuffled position modulo k gives the fold, so fold sizes differ by at
 * most one.
 *
 * @module
 */
import { mulberry32 } from "../../kernel/random.ts";

/**
 * Fold number of each row.
 *
 * @param n Rows.
 * @param k Folds (at most n).
 * @param seed The document's seed.
 * @returns fold[i] in 0…k−1 for row i.
 * @example
 * ```ts
 * import { assignFolds } from "./_folds.ts";
 * const f = assignFolds(10, 3, 1);
 * if ([0, 1, 2].map((j) => f.filter((x) => x === j).length).join() !== "4,3,3") throw new Error(String(f));
 * ```
 */
export function assignFolds(n: number, k: number, seed: number): Int32Array {
  const next = mulberry32(seed);
  const order = Int32Array.from({ length: n }, (_, i) => i);
  for (let i = n - 1; i > 0; i--) {
    const j = Math.floor(next() * (i + 1));
    const t = order[i];
    order[i] = order[j];
    order[j] = t;
  }
  const fold = new Int32Array(n);
  order.forEach((row, pos) => (fold[row] = pos % k));
  return fold;
}
