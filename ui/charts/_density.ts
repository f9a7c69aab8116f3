/**
 * Density drawing for the residual charts above {@link DENSE_ROWS} rows: the
 * points counted into an nx × ny grid of equal cells over their extent (one
 * pass, O(n + nx·ny); common practice, no source), drawn as rectangles in a
 * dozen shades of grey, darker for more rows, one `<path>` per shade.
 * Counting here instead of with Plot's bin transform, and drawing a dozen
 * paths instead of a rectangle per cell, takes the four 10,000-row charts
 * from about 250 ms to a few tens (Deno with linkedom).
 *
 * The counting itself is `cells/shared/density.ts`.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import type { ChartBins } from "../../cells/shared/chart_data.ts";

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
