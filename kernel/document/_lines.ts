/**
 * Line scanning shared by the parser and the position helpers. A line ends at
 * LF, CRLF or a lone CR (CommonMark §2.1); the last line may have no ending.
 *
 * @module
 */

/** One physical line: `[start, contentEnd)` is its text, `[contentEnd, end)` its ending. */
export interface Line {
  start: number;
  contentEnd: number;
  end: number;
}

/**
 * Splits `source` into lines starting at `from` (past a BOM, for instance).
 *
 * @param source The text.
 * @param from Offset where the first line starts.
 * @returns The lines in order; none for an empty tail.
 */
export function scanLines(source: string, from = 0): Line[] {
  const lines: Line[] = [];
  let start = from;
  const n = source.length;
  while (start < n) {
    let i = start;
    while (i < n) {
      const c = source.charCodeAt(i);
      if (c === 10 || c === 13) break;
      i++;
    }
    let end = i;
    if (i < n) end = source.charCodeAt(i) === 13 && source.charCodeAt(i + 1) === 10 ? i + 2 : i + 1;
    lines.push({ start, contentEnd: i, end });
    start = end;
  }
  return lines;
}

/**
 * Offsets where lines start: `from`, then every offset just past a line ending.
 *
 * @param source The text.
 * @param from Offset of line 1 (1 after a BOM, so the BOM is not counted as a column).
 * @returns Ascending line-start offsets; entry `k` is where line `k + 1` starts.
 */
export function lineStarts(source: string, from = 0): number[] {
  const starts = [from];
  for (let i = from; i < source.length; i++) {
    const c = source.charCodeAt(i);
    if (c === 13 && source.charCodeAt(i + 1) === 10) i++;
    if (c === 10 || c === 13) starts.push(i + 1);
  }
  return starts;
}

/**
 * Index of the last entry of an ascending array that is at most `value`.
 *
 * @param sorted Ascending numbers, first entry at most `value`.
 * @param value The value to place.
 * @returns An index into `sorted` (0 when `value` precedes everything).
 */
export function floorIndex(sorted: readonly number[], value: number): number {
  let lo = 0, hi = sorted.length - 1;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (sorted[mid] <= value) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/**
 * The line ending used most in `source` (ties go to the one seen first).
 *
 * @param source The text.
 * @returns `"\n"`, `"\r\n"` or `"\r"`; `"\n"` when the text has no line ending.
 */
export function dominantEnding(source: string): string {
  const counts = new Map<string, number>();
  for (const line of scanLines(source)) {
    if (line.end === line.contentEnd) continue;
    const e = source.slice(line.contentEnd, line.end);
    counts.set(e, (counts.get(e) ?? 0) + 1);
  }
  let best = "\n", bestN = 0;
  for (const [e, n] of counts) {
    if (n > bestN) [best, bestN] = [e, n];
  }
  return best;
}
