/**
 * Near-miss suggestions ("did you mean …") by Damerau–Levenshtein distance
 * (optimal string alignment variant: adjacent transpositions count as one edit).
 *
 * @module
 */

/**
 * Edit distance between two strings, counting insertions, deletions,
 * substitutions and adjacent transpositions as one edit each.
 *
 * @param a First string.
 * @param b Second string.
 * @returns The number of edits turning `a` into `b`.
 * @example
 * ```ts
 * import { editDistance } from "./suggest.ts";
 * if (editDistance("cylce", "cycle") !== 1) throw new Error("transposition is one edit");
 * ```
 */
export function editDistance(a: string, b: string): number {
  const m = a.length, n = b.length;
  // Three rolling rows suffice for the transposition look-back.
  let prev2 = new Array<number>(n + 1).fill(0);
  let prev = Array.from({ length: n + 1 }, (_, j) => j);
  let cur = new Array<number>(n + 1).fill(0);
  for (let i = 1; i <= m; i++) {
    cur[0] = i;
    for (let j = 1; j <= n; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let d = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) {
        d = Math.min(d, prev2[j - 2] + 1);
      }
      cur[j] = d;
    }
    [prev2, prev, cur] = [prev, cur, prev2];
  }
  return prev[n];
}

/**
 * The candidate nearest to `word`, if it is close enough to be a plausible typo.
 *
 * @param word What was written.
 * @param candidates What exists.
 * @param maxDistance Largest edit distance still suggested (default: 1 for
 *   words up to 4 characters, 2 for longer ones).
 * @returns The nearest candidate, or `undefined` when none is close.
 * @example
 * ```ts
 * import { nearest } from "./suggest.ts";
 * if (nearest("fti", ["fit", "table"]) !== "fit") throw new Error("expected fit");
 * ```
 */
export function nearest(
  word: string,
  candidates: Iterable<string>,
  maxDistance?: number,
): string | undefined {
  const limit = maxDistance ?? (word.length <= 4 ? 1 : 2);
  let best: string | undefined;
  let bestD = Infinity;
  for (const c of candidates) {
    if (c === word) continue;
    const d = Math.min(editDistance(word, c), editDistance(word.toLowerCase(), c.toLowerCase()));
    if (d < bestD) {
      bestD = d;
      best = c;
    }
  }
  return bestD <= limit ? best : undefined;
}

/**
 * `: did you mean "x"` for a near miss, or the empty string.
 *
 * @param word What was written.
 * @param candidates What exists.
 * @returns A message tail to append to an error.
 */
export function didYouMean(word: string, candidates: Iterable<string>): string {
  const n = nearest(word, candidates);
  return n === undefined ? "" : `: did you mean "${n}"?`;
}
