/**
 * Charts, drawn with Observable Plot into SVG strings from plot-ready data,
 * with the browser's document on the live page or linkedom's on the server
 * (so the static record matches the page), in one shared style: units in
 * axis labels, reference lines where they mean something, the same colour
 * for the same fit everywhere ({@link fitColor}).
 *
 * ```
 *  ChartData (chart cell result) ──renderChartSvg──▶ SVG ──ChartFigure──▶ <figure>
 *  (a kind's own charts, such as check's residual charts, live in its folder
 *   and draw with the same pieces: _svg.ts, _density.ts, the shared palette)
 * ```
 *
 * @module
 */
export type {
  ChartAxis,
  ChartBand,
  ChartBins,
  ChartCurve,
  ChartData,
  ChartResiduals,
  ChartResidualSeries,
} from "../../cells/shared/chart_data.ts";
export { FIT_PALETTE, fitColor, fnv1a, INK } from "../../cells/shared/palette.ts";
export { CHART_SIZE, renderChart, renderChartSvg } from "./render_chart.ts";
export { chartDocument } from "./svg_document.ts";
export { ChartFigure, type ChartFigureProps, DrawnFigure, SvgFigure } from "./chart_figure.tsx";
