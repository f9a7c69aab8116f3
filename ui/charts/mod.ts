/**
 * Charts, drawn with Observable Plot into SVG strings from plot-ready data,
 * with the browser's document on the live page or linkedom's on the server
 * (so the static record matches the page), in one shared style: units in
 * axis labels, reference lines where they mean something, the same colour
 * for the same fit everywhere ({@link fitColor}).
 *
 * ```
 *  ChartData (chart cell result) ──renderChartSvg──▶ SVG ──ChartFigure──▶ <figure>
 *  check result fields ──checkChartsSvg──▶ 4 × SVG ──SvgFigure──▶ <figure>
 * ```
 *
 * @example
 * ```ts
 * import { chartDocument, checkChartsSvg } from "./mod.ts";
 * const svgs = checkChartsSvg({
 *   fit: "line", fitted: [1, 2, 3, 4], residuals: [0.1, -0.2, 0.15, -0.05],
 *   studentized_internal: [0.8, -1.4, 1.1, -0.4], leverage: [0.7, 0.3, 0.3, 0.7],
 *   cooks_distance: [0.8, 0.4, 0.3, 0.2],
 * }, chartDocument());
 * if (svgs.length !== 4 || !svgs.every((s) => s.startsWith("<svg"))) throw new Error("four charts");
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
} from "./chart_data.ts";
export { FIT_PALETTE, fitColor, fnv1a, INK } from "./palette.ts";
export { CHART_SIZE, renderChart, renderChartSvg } from "./render_chart.ts";
export { chartDocument } from "./svg_document.ts";
export { ChartFigure, type ChartFigureProps, DrawnFigure, SvgFigure } from "./chart_figure.tsx";
export {
  type CheckChartInput,
  checkCharts,
  checkChartsSvg,
  type CheckDensity,
  checkDensity,
  DENSE_ROWS,
  leverageChart,
  normalQuantiles,
  residualsVsFitted,
  scaleLocation,
} from "./residual_charts.ts";
