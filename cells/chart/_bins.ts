/**
 * Binning for large charts: a 2-D histogram of the points on an nx × ny grid
 * of equal cells (equal in log space on a log axis), and per-x-bin means of
 * residuals. One pass over the rows, O(n + nx·ny). Common practice, no source.
 *
 * @module
 */
import type { ChartBins } from "../shared/chart_data.ts";
import { countCells } from "../shared/count_cells.ts";

/** Columns × rows of the density grid: about 4 px × 5 px cells on a 640 × 400 chart. */
export const BIN_GRID = { nx: 80, ny: 50 } as const;

/**
 * Cell edges over [lo, hi].
 *
 * @param lo Domain start.
 * @param hi Domain end (a degenerate domain is widened by ±0.5, ×/÷ 2 on a log axis).
 * @param n Number of cells.
 * @param log Equal cells in log space.
 * @returns n + 1 edges.
 */
export function binEdges(lo: number, hi: number, n: number, log: boolean): number[] {
  if (lo === hi) [lo, hi] = log ? [lo / 2, hi * 2] : [lo - 0.5, hi + 0.5];
  const a = log ? Math.log(lo) : lo, b = log ? Math.log(hi) : hi;
  return Array.from({ length: n + 1 }, (_, i) => {
    if (i === 0) return lo;
    if (i === n) return hi;
    const t = a + (b - a) * (i / n);
    return log ? Math.exp(t) : t;
  });
}

/** Index of the cell of value v among edges (last cell closed on the right). */
function cellIndex(v: number, edges: number[], log: boolean): number {
  const n = edges.length - 1;
  const a = log ? Math.log(edges[0]) : edges[0], b = log ? Math.log(edges[n]) : edges[n];
  const t = ((log ? Math.log(v) : v) - a) / (b - a);
  return Math.min(n - 1, Math.max(0, Math.floor(t * n)));
}

/**
 * Counts points into cells.
 *
 * @param x x values (finite, positive on a log axis).
 * @param y y values, same length.
 * @param xEdges Cell edges in x.
 * @param yEdges Cell edges in y.
 * @param logX Whether the x cells are equal in log space.
 * @param logY Whether the y cells are equal in log space.
 * @returns The non-empty cells and the largest count.
 * @example
 * ```ts
 * import { binEdges, binPoints } from "./_bins.ts";
 * const e = binEdges(0, 1, 2, false);
 * const b = binPoints([0.1, 0.2, 0.9], [0.1, 0.1, 0.9], e, e, false, false);
 * if (JSON.stringify(b.cells) !== "[[0,0,2],[1,1,1]]") throw new Error(JSON.stringify(b.cells));
 * ```
 */
export function binPoints(
  x: ArrayLike<number>,
  y: ArrayLike<number>,
  xEdges: number[],
  yEdges: number[],
  logX: boolean,
  logY: boolean,
): ChartBins {
  const xCell = new Int32Array(x.length), yCell = new Int32Array(x.length);
  for (let i = 0; i < x.length; i++) {
    xCell[i] = cellIndex(x[i], xEdges, logX);
    yCell[i] = cellIndex(y[i], yEdges, logY);
  }
  return countCells(xCell, yCell, xEdges, yEdges);
}

/**
 * Mean of `r` per x cell, at each non-empty cell's centre.
 *
 * @param x x values.
 * @param r Values to average, same length (non-finite ones are skipped).
 * @param xEdges Cell edges in x.
 * @param logX Whether cells are equal in log space (centres geometric).
 * @returns Centres and means of the non-empty cells.
 */
export function binMeans(
  x: ArrayLike<number>,
  r: ArrayLike<number>,
  xEdges: number[],
  logX: boolean,
): { x: number[]; r: number[] } {
  const n = xEdges.length - 1;
  const sum = new Float64Array(n), count = new Int32Array(n);
  for (let i = 0; i < x.length; i++) {
    if (!Number.isFinite(x[i]) || !Number.isFinite(r[i])) continue;
    const k = cellIndex(x[i], xEdges, logX);
    sum[k] += r[i];
    count[k]++;
  }
  const out = { x: [] as number[], r: [] as number[] };
  for (let k = 0; k < n; k++) {
    if (count[k] === 0) continue;
    const a = xEdges[k], b = xEdges[k + 1];
    out.x.push(logX ? Math.sqrt(a * b) : (a + b) / 2);
    out.r.push(sum[k] / count[k]);
  }
  return out;
}
