/**
 * Counting points into the cells of a grid: the one counting step of every
 * binned chart (the chart cell's density in the worker, the residual charts'
 * density on the page or in the record). No drawing code, so the compute
 * worker can use it without loading Plot.
 *
 * @module
 */
import type { ChartBins } from "./chart_data.ts";

/**
 * Counts points into cells given each point's column and row.
 *
 * @param xCell Column of each point.
 * @param yCell Row of each point (same length).
 * @param xEdges Column edges.
 * @param yEdges Row edges.
 * @returns The non-empty cells and the largest count.
 * @example
 * ```ts
 * import { countCells } from "./count_cells.ts";
 * const b = countCells([0, 0, 1], [0, 0, 1], [0, 1, 2], [0, 1, 2]);
 * if (JSON.stringify(b.cells) !== "[[0,0,2],[1,1,1]]" || b.max !== 2) throw new Error("counts");
 * ```
 */
export function countCells(
  xCell: ArrayLike<number>,
  yCell: ArrayLike<number>,
  xEdges: number[],
  yEdges: number[],
): ChartBins {
  const nx = xEdges.length - 1, ny = yEdges.length - 1;
  const counts = new Int32Array(nx * ny);
  for (let i = 0; i < xCell.length; i++) counts[xCell[i] + nx * yCell[i]]++;
  const cells: [number, number, number][] = [];
  let max = 0;
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const c = counts[i + nx * j];
      if (c > 0) cells.push([i, j, c]);
      if (c > max) max = c;
    }
  }
  return { x: xEdges, y: yEdges, cells, max };
}
