/**
 * Counting points into a grid of equal cells: the residual charts above
 * DENSE_ROWS rows, and the chart cell's binned layers, are drawn from counts
 * (one pass, O(n + nx·ny); common practice, no source). Pure computation:
 * the compute worker counts, the page draws (ui/charts/_density.ts).
 *
 * @module
 */
import type { ChartBins } from "./chart_data.ts";
import { countCells } from "./count_cells.ts";

/** Cells across and down a residual chart (about 7 px × 6 px on 320 × 260). */
export const DENSITY_GRID = { nx: 40, ny: 32 } as const;

/**
 * Equal cell edges over [lo, hi] (a degenerate extent is widened by ±0.5).
 *
 * @param lo Smallest value.
 * @param hi Largest value.
 * @param n Number of cells.
 * @returns n + 1 edges.
 */
export function cellEdges(lo: number, hi: number, n: number): number[] {
  if (!(hi > lo)) [lo, hi] = [lo - 0.5, hi + 0.5];
  return Array.from({ length: n + 1 }, (_, i) => i === n ? hi : lo + (hi - lo) * (i / n));
}

/**
 * The cell of a value (the last cell is closed on the right).
 *
 * @param v The value, within the edges.
 * @param edges Equal cell edges from {@link cellEdges}.
 * @returns The cell index.
 */
export function cellOf(v: number, edges: readonly number[]): number {
  const n = edges.length - 1;
  const t = (v - edges[0]) / (edges[n] - edges[0]);
  return Math.min(n - 1, Math.max(0, Math.floor(t * n)));
}

/**
 * Counts (x, y) pairs into the residual charts' grid over their extent.
 *
 * @param x x values (finite).
 * @param y y values (finite, same length).
 * @returns The counted cells.
 */
export function density(x: ArrayLike<number>, y: ArrayLike<number>): ChartBins {
  const xEdges = cellEdges(min(x), max(x), DENSITY_GRID.nx);
  const yEdges = cellEdges(min(y), max(y), DENSITY_GRID.ny);
  const xc = new Int32Array(x.length), yc = new Int32Array(y.length);
  for (let i = 0; i < x.length; i++) {
    xc[i] = cellOf(x[i], xEdges);
    yc[i] = cellOf(y[i], yEdges);
  }
  return countCells(xc, yc, xEdges, yEdges);
}

/**
 * The x and y extents of counted cells, for the chart's scales.
 *
 * @param b The cells.
 * @returns [first edge, last edge] in x and in y.
 */
export function densityDomains(b: ChartBins): { x: [number, number]; y: [number, number] } {
  return { x: [b.x[0], b.x[b.x.length - 1]], y: [b.y[0], b.y[b.y.length - 1]] };
}

/** Smallest value (no spread of a long array into arguments). */
export function min(v: ArrayLike<number>): number {
  let m = Infinity;
  for (let i = 0; i < v.length; i++) if (v[i] < m) m = v[i];
  return m;
}

/** Largest value. */
export function max(v: ArrayLike<number>): number {
  let m = -Infinity;
  for (let i = 0; i < v.length; i++) if (v[i] > m) m = v[i];
  return m;
}
