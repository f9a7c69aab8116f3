/**
 * Density drawing for the residual charts above {@link DENSE_ROWS} rows: the
 * points counted into an nx × ny grid of equal cells over their extent (one
 * pass, O(n + nx·ny); common practice, no source), drawn as rectangles in a
 * dozen shades of grey, darker for more rows, one `<path>` per shade.
 * Counting here instead of with Plot's bin transform, and drawing a dozen
 * paths instead of a rectangle per cell, takes the four 10,000-row charts
 * from about 250 ms to a few tens (Deno with linkedom).
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
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

/** Shades of grey the counts are drawn in, light (fewest rows) to dark (most). */
export const DENSITY_SHADES = 12;

const LIGHT = [0xd9, 0xd9, 0xd9], DARK = [0x26, 0x26, 0x26];

/** The grey of shade k of {@link DENSITY_SHADES} (k = 0 lightest), as #rrggbb. */
function shade(k: number): string {
  const t = k / (DENSITY_SHADES - 1);
  const hex = (i: number) =>
    Math.round(LIGHT[i] + (DARK[i] - LIGHT[i]) * t).toString(16).padStart(2, "0");
  return `#${hex(0)}${hex(1)}${hex(2)}`;
}

type Scale = (v: number) => number;

/**
 * The counted cells as a Plot mark: one `<path>` per shade, each holding the
 * rectangles of its cells, so a 10,000-row chart is a dozen elements rather
 * than a thousand rectangles (the browser builds and lays out far less).
 * Counts map linearly onto the shades between the fewest and the most rows
 * in a cell. The chart's x and y domains must cover the cells' edges
 * ({@link densityDomains}).
 *
 * @param b The cells.
 * @returns A Plot mark (a render function).
 */
export function densityRect(b: ChartBins): Plot.Markish {
  let least = Infinity;
  for (const c of b.cells) if (c[2] < least) least = c[2];
  const span = b.max - least;
  return (
    _index: number[],
    scales: { x?: Scale; y?: Scale },
    _values: unknown,
    _dimensions: unknown,
    context: { document: Document },
  ) => {
    const doc = context.document;
    const ns = "http://www.w3.org/2000/svg";
    const g = doc.createElementNS(ns, "g");
    g.setAttribute("aria-label", "rows counted into cells");
    const x = scales.x!, y = scales.y!;
    const paths: string[][] = Array.from({ length: DENSITY_SHADES }, () => []);
    const at = (v: number) => Math.round(v * 100) / 100;
    // Each edge scaled once (the grid has ~40 × 32 cells, each with four edges).
    const xs = b.x.map((v) => at(x(v))), ys = b.y.map((v) => at(y(v)));
    for (const [i, j, c] of b.cells) {
      const k = span > 0
        ? Math.round(((c - least) / span) * (DENSITY_SHADES - 1))
        : DENSITY_SHADES - 1;
      paths[k].push(`M${xs[i]},${ys[j]}H${xs[i + 1]}V${ys[j + 1]}H${xs[i]}Z`);
    }
    paths.forEach((d, k) => {
      if (d.length === 0) return;
      const path = doc.createElementNS(ns, "path");
      path.setAttribute("fill", shade(k));
      path.setAttribute("d", d.join(""));
      g.appendChild(path);
    });
    return g as unknown as SVGElement;
  };
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
