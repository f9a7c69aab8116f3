/**
 * Root brackets by scanning and refinement by bisection, for the inverse
 * prediction of `predict` (common practice, no source: a grid scan finds
 * every sign change wider than the grid step; bisection halves a bracket
 * until its ends are adjacent doubles).
 *
 * @module
 */

/** A root: a bracket [lo, hi] of a sign change, or an exact zero at a grid point (lo = hi). */
export type Bracket = [number, number];

/**
 * Every sign change of h over `steps` equal steps of [a, b]. Points where h
 * is not finite break the scan (no bracket spans them).
 *
 * @param h The function.
 * @param a Left end.
 * @param b Right end.
 * @param steps Number of grid steps.
 * @returns The brackets, left to right.
 */
export function scanSignChanges(
  h: (x: number) => number,
  a: number,
  b: number,
  steps: number,
): Bracket[] {
  const out: Bracket[] = [];
  let xPrev = NaN, hPrev = NaN;
  for (let i = 0; i <= steps; i++) {
    const x = i === steps ? b : a + (b - a) * (i / steps);
    const hx = h(x);
    if (hx === 0) out.push([x, x]);
    else if (
      Number.isFinite(hx) && Number.isFinite(hPrev) && hPrev !== 0 && (hx < 0) !== (hPrev < 0)
    ) out.push([xPrev, x]);
    xPrev = x;
    hPrev = Number.isFinite(hx) ? hx : NaN;
  }
  return out;
}

/**
 * Refines a sign-change bracket to adjacent doubles by bisection.
 *
 * @param h The function (finite, of opposite signs at the ends).
 * @param bracket The bracket.
 * @returns The end (or midpoint found) where |h| is smaller.
 */
export function bisectRoot(h: (x: number) => number, [lo, hi]: Bracket): number {
  if (lo === hi) return lo;
  let hLo = h(lo), hHi = h(hi);
  for (let i = 0; i < 2200; i++) {
    const mid = lo + (hi - lo) / 2;
    if (mid === lo || mid === hi) break;
    const hm = h(mid);
    if (hm === 0) return mid;
    if (!Number.isFinite(hm)) break;
    if ((hm < 0) === (hLo < 0)) [lo, hLo] = [mid, hm];
    else [hi, hHi] = [mid, hm];
  }
  return Math.abs(hLo) <= Math.abs(hHi) ? lo : hi;
}

/**
 * The first place, walking from `from` towards `to` in `steps` steps, where
 * h stops being ≤ 0 (or stops being finite), refined by bisection.
 *
 * @param h The function, ≤ 0 at `from`.
 * @param from Start.
 * @param to End of the walk.
 * @param steps Number of steps.
 * @returns The crossing, or null when h stays ≤ 0 up to `to`.
 */
export function firstExit(
  h: (x: number) => number,
  from: number,
  to: number,
  steps: number,
): number | null {
  let inside = from;
  for (let i = 1; i <= steps; i++) {
    const x = i === steps ? to : from + (to - from) * (i / steps);
    const hx = h(x);
    if (hx <= 0) {
      inside = x;
      continue;
    }
    if (!Number.isFinite(hx)) return bisectFinite(h, inside, x);
    return bisectRoot(h, [inside, x]);
  }
  return null;
}

/** The last point before h turns non-finite between `inside` (h ≤ 0) and `out`. */
function bisectFinite(h: (x: number) => number, inside: number, out: number): number {
  for (let i = 0; i < 2200; i++) {
    const mid = inside + (out - inside) / 2;
    if (mid === inside || mid === out) break;
    const hm = h(mid);
    if (hm > 0) return bisectRoot(h, [inside, mid]);
    if (hm <= 0) inside = mid;
    else out = mid;
  }
  return inside;
}
