/**
 * Drawing a `chart` cell's data as SVG with Observable Plot, in the browser
 * or on the server (pass linkedom's document): the same code, so the live
 * page and the static record show the same chart.
 *
 * The style every Plumb chart shares (DESIGN.md §7a): units in the axis
 * labels, reference lines only where they mean something (zero on a
 * residual panel), data in neutral ink, each fit in its own colour
 * ({@link fitColor}) and labelled by name at the end of its curve.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import type { ChartData } from "../../cells/shared/chart_data.ts";
import { INK } from "../../cells/shared/palette.ts";
import { type Panel, stackPanels } from "./_svg.ts";

/** Size of the chart: width, main panel height and residual panel height, px. */
export const CHART_SIZE = { width: 640, height: 360, residualHeight: 170 } as const;

const MARGIN_LEFT = 64;

/**
 * Renders a chart's data to SVG markup ({@link renderChart}'s `outerHTML`).
 *
 * @param data The chart cell's result.
 * @param document The DOM document to build with (the browser's, or linkedom's).
 * @returns SVG markup.
 * @example
 * ```ts
 * import { renderChartSvg } from "./render_chart.ts";
 * import { chartDocument } from "./svg_document.ts";
 * const svg = renderChartSvg({
 *   marks: 2, points: 2, binned: false, rows: 2, bins_drawn: 0, title: null,
 *   x: { column: "x", unit: "s", label: "x (s)", log: false, domain: [0, 1] },
 *   y: { column: "y", unit: null, label: "y", log: false, domain: [0, 2] },
 *   data: { x: [0, 1], y: [0, 2] }, bins: null, grid: [0, 1],
 *   curves: [{ fit: "line", color: "#0072B2", model: "y = b*x", y: [0, 2] }],
 *   band: null, residuals: null,
 * }, chartDocument());
 * if (!svg.includes("x (s)")) throw new Error(svg);
 * ```
 */
export function renderChartSvg(data: ChartData, document: Document): string {
  return renderChart(data, document).outerHTML;
}

/**
 * Renders a chart's data to an SVG element of `document`.
 *
 * @param data The chart cell's result.
 * @param document The DOM document to build with (the browser's, or linkedom's).
 * @returns The `<svg>` element (not attached).
 */
export function renderChart(data: ChartData, document: Document): SVGSVGElement {
  const marginRight = 12 + 6.5 * Math.max(0, ...data.curves.map((c) => c.fit.length));
  const margins = { marginLeft: MARGIN_LEFT, marginRight, marginTop: 20, marginBottom: 40 };
  const x = {
    type: data.x.log ? "log" : "linear",
    label: data.x.label,
    domain: data.x.domain,
    nice: true,
  } as const;
  const panels: Panel[] = [
    Plot.plot({
      document,
      className: "plumb-plot",
      width: CHART_SIZE.width,
      height: CHART_SIZE.height,
      ...margins,
      x,
      y: { type: data.y.log ? "log" : "linear", label: data.y.label, grid: true, nice: true },
      color: { type: "log", range: ["#d9d9d9", "#262626"], interpolate: "lab" },
      marks: mainMarks(data),
    }),
  ];
  if (data.residuals) {
    panels.push(Plot.plot({
      document,
      className: "plumb-plot",
      width: CHART_SIZE.width,
      height: CHART_SIZE.residualHeight,
      ...margins,
      x,
      y: { label: data.residuals.label, grid: true, nice: true },
      marks: residualMarks(data),
    }));
  }
  return stackPanels(document, panels, CHART_SIZE.width, {
    title: data.title,
    note: note(data),
    label: `${data.y.label} against ${data.x.label}`,
  });
}

function mainMarks(data: ChartData): Plot.Markish[] {
  const marks: Plot.Markish[] = [];
  if (data.bins) {
    const b = data.bins;
    marks.push(Plot.rect(b.cells, {
      x1: (c: number[]) => b.x[c[0]],
      x2: (c: number[]) => b.x[c[0] + 1],
      y1: (c: number[]) => b.y[c[1]],
      y2: (c: number[]) => b.y[c[1] + 1],
      fill: (c: number[]) => c[2],
      inset: 0,
      ariaDescription: "binned rows",
    }));
  } else if (data.data) {
    const d = data.data;
    marks.push(Plot.dot(d.x, {
      x: d.x,
      y: d.y,
      r: 2.2,
      fill: INK,
      fillOpacity: 0.7,
      ariaDescription: "rows",
    }));
  }
  const g = data.grid;
  if (data.band) {
    const band = data.band;
    marks.push(Plot.areaY(g, {
      x: g,
      y1: band.lo,
      y2: band.hi,
      fill: band.color,
      fillOpacity: 0.16,
      ariaDescription: `band ${band.fit}`,
    }));
  }
  for (const c of data.curves) {
    marks.push(Plot.line(g, {
      x: g,
      y: c.y,
      stroke: c.color,
      strokeWidth: 1.8,
      ariaDescription: `curve ${c.fit}`,
    }));
    const last = c.y.findLastIndex((v) => v !== null);
    if (last >= 0) {
      marks.push(Plot.text([c.fit], {
        x: [g[last]],
        y: [c.y[last]],
        text: [c.fit],
        fill: c.color,
        textAnchor: "start",
        dx: 5,
        ariaDescription: `label ${c.fit}`,
      }));
    }
  }
  return marks;
}

function residualMarks(data: ChartData): Plot.Markish[] {
  const r = data.residuals!;
  const marks: Plot.Markish[] = [
    Plot.ruleY([0], { stroke: INK, ariaDescription: "zero residual" }),
  ];
  for (const s of r.series) {
    marks.push(
      r.binned
        ? Plot.line(s.x, { x: s.x, y: s.r, stroke: s.color, ariaDescription: `residuals ${s.fit}` })
        : Plot.dot(s.x, {
          x: s.x,
          y: s.r,
          r: 1.8,
          fill: s.color,
          fillOpacity: 0.75,
          ariaDescription: `residuals ${s.fit}`,
        }),
    );
  }
  return marks;
}

function note(data: ChartData): string | null {
  const parts: string[] = [];
  if (data.binned && data.bins) {
    parts.push(
      `${
        data.rows.toLocaleString("en-US")
      } rows drawn as density: darker cells hold more rows (up to ${data.bins.max})`,
    );
  }
  if (data.band) {
    parts.push(
      `band: ${Math.round(data.band.level * 1000) / 10}% interval of the mean of ${data.band.fit}`,
    );
  }
  if (data.residuals?.binned) parts.push("residuals: mean per x cell");
  return parts.length ? parts.join(" · ") : null;
}
