/**
 * Drawing a `chart` cell's data as SVG with Observable Plot, in the browser
 * or on the server (pass linkedom's document): the same code, so the live
 * page and the static record show the same chart.
 *
 * The style every Plumb chart shares (`_style.ts`; DESIGN.md §7a): units in
 * the axis labels, reference lines only where they mean something (zero on a
 * residual panel), data as open rings in neutral ink, each fit in its own
 * colour ({@link fitColor}) and labelled by name at the end of its curve,
 * the labels spread so that none overlaps another (`_labels.ts`).
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import type { ChartData } from "../../cells/shared/chart_data.ts";
import { type Panel, stackPanels } from "./_svg.ts";
import { axisX, axisY, PLOT_BASE, referenceY, rings, SMALL_TEXT } from "./_style.ts";
import { spreadLabels } from "./_labels.ts";

/** Size of the chart: width, main panel height and residual panel height, px. */
export const CHART_SIZE = { width: 640, height: 360, residualHeight: 170 } as const;

const MARGIN_LEFT = 72;

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
 *   band: null, bands: [], residuals: null,
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
  const marginRight = 16 + 6.2 * Math.max(0, ...data.curves.map((c) => c.fit.length));
  const margins = { marginLeft: MARGIN_LEFT, marginRight, marginTop: 16, marginBottom: 44 };
  const x = axisX(data.x.label, {
    type: data.x.log ? "log" : "linear",
    domain: data.x.domain,
    nice: true,
  });
  const main = Plot.plot({
    document,
    ...PLOT_BASE,
    width: CHART_SIZE.width,
    height: CHART_SIZE.height,
    ...margins,
    x,
    y: axisY(data.y.label, { type: data.y.log ? "log" : "linear", nice: true }),
    color: { type: "log", range: ["#e4e4e4", "#262626"], interpolate: "lab" },
    marks: mainMarks(data),
  });
  endLabels(main, data, document);
  const panels: Panel[] = [main];
  if (data.residuals) {
    panels.push(Plot.plot({
      document,
      ...PLOT_BASE,
      width: CHART_SIZE.width,
      height: CHART_SIZE.residualHeight,
      ...margins,
      x,
      y: axisY(data.residuals.label, { nice: true, ticks: 3 }),
      marks: residualMarks(data),
    }));
  }
  return stackPanels(document, panels, CHART_SIZE.width, {
    title: data.title,
    note: note(data),
    label: `${data.y.label} against ${data.x.label}`,
  });
}

/** Least vertical distance between two end labels, px. */
const LABEL_GAP = SMALL_TEXT + 3;

/**
 * Writes each curve's name at its right end, the names spread by
 * {@link spreadLabels} so that none overlaps another.
 */
function endLabels(plot: SVGSVGElement | HTMLElement, data: ChartData, document: Document): void {
  const p = plot as unknown as Plot.Plot;
  const sx = p.scale("x"), sy = p.scale("y");
  if (!sx?.apply || !sy?.apply) return;
  const ends = data.curves.map((c) => {
    const last = c.y.findLastIndex((v) => v !== null);
    return last < 0 ? null : { c, x: sx.apply!(data.grid[last]), y: sy.apply!(c.y[last]) };
  }).filter((e): e is NonNullable<typeof e> => e !== null && Number.isFinite(e.y));
  const placed = spreadLabels(ends.map((e) => e.y), LABEL_GAP, 10, CHART_SIZE.height - 44);
  const g = document.createElementNS("http://www.w3.org/2000/svg", "g");
  g.setAttribute("aria-label", "curve labels");
  g.setAttribute("font-size", String(SMALL_TEXT + 1));
  ends.forEach((e, i) => {
    const t = document.createElementNS("http://www.w3.org/2000/svg", "text");
    t.setAttribute("x", String(e.x + 10));
    t.setAttribute("y", String(placed[i]));
    t.setAttribute("dy", "0.32em");
    t.setAttribute("fill", e.c.color);
    t.setAttribute("aria-description", `label ${e.c.fit}`);
    t.textContent = e.c.fit;
    g.appendChild(t);
  });
  plot.appendChild(g);
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
  } else if (data.data) marks.push(rings(data.data.x, data.data.y, "rows"));
  const g = data.grid;
  // Older results carry only `band`. A new observation's band is drawn lighter with dashed
  // edges, the mean's band over it with solid ones: the two differ by shape, not colour alone.
  for (const band of data.bands ?? (data.band ? [data.band] : [])) {
    const observation = band.kind === "observation";
    marks.push(Plot.areaY(g, {
      x: g,
      y1: band.lo,
      y2: band.hi,
      fill: band.color,
      fillOpacity: observation ? 0.07 : 0.14,
      ariaDescription: `band ${band.fit}${observation ? " new observation" : ""}`,
    }));
    for (const edge of [band.lo, band.hi]) {
      marks.push(Plot.line(g, {
        x: g,
        y: edge,
        stroke: band.color,
        strokeWidth: observation ? 0.9 : 0.6,
        strokeOpacity: 0.6,
        strokeDasharray: observation ? "4,3" : undefined,
      }));
    }
  }
  for (const c of data.curves) {
    marks.push(Plot.line(g, {
      x: g,
      y: c.y,
      stroke: c.color,
      strokeWidth: 2,
      ariaDescription: `curve ${c.fit}`,
    }));
  }
  return marks;
}

function residualMarks(data: ChartData): Plot.Markish[] {
  const r = data.residuals!;
  const marks: Plot.Markish[] = [...referenceY(0, "", false, "zero residual")];
  for (const s of r.series) {
    marks.push(
      r.binned
        ? Plot.line(s.x, { x: s.x, y: s.r, stroke: s.color, ariaDescription: `residuals ${s.fit}` })
        : rings(s.x, s.r, `residuals ${s.fit}`, s.color),
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
  for (const band of data.bands ?? (data.band ? [data.band] : [])) {
    parts.push(
      band.label ??
        `band: ${Math.round(band.level * 1000) / 10}% interval of the mean of ${band.fit}`,
    );
  }
  if (data.residuals?.binned) parts.push("residuals: mean per x cell");
  return parts.length ? parts.join(" · ") : null;
}
