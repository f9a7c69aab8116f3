/**
 * The Preact component that shows a chart: the SVG from
 * {@link renderChartSvg} inlined into a `<figure>`. Rendering is a pure
 * function of the data, so the live page and the static record (rendered on
 * the server with linkedom) show the same markup.
 *
 * @module
 */
import type { VNode } from "preact";
import type { ChartData } from "./chart_data.ts";
import { renderChartSvg } from "./render_chart.ts";
import { chartDocument } from "./svg_document.ts";

/** Props of {@link ChartFigure}. */
export interface ChartFigureProps {
  data: ChartData;
  /** The document to draw with (default: the browser's, or linkedom's on the server). */
  document?: Document;
  /** A caption under the chart (optional). */
  caption?: string;
}

/**
 * Shows a chart as inline SVG.
 *
 * @param props The chart data and, optionally, the document and a caption.
 * @returns A `<figure class="plumb-chart-figure">`.
 */
export function ChartFigure({ data, document, caption }: ChartFigureProps): VNode {
  const svg = renderChartSvg(data, document ?? chartDocument());
  return <SvgFigure svg={svg} caption={caption} />;
}

/**
 * Shows ready SVG markup (for instance from the residual chart helpers) in a figure.
 *
 * @param props The SVG string (from our own renderers only) and an optional caption.
 * @returns A `<figure class="plumb-chart-figure">`.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { SvgFigure } from "./chart_figure.tsx";
 * const html = renderToString(SvgFigure({ svg: "<svg></svg>", caption: "c" }));
 * if (!html.includes("<svg></svg>") || !html.includes("<figcaption>c</figcaption>")) throw new Error(html);
 * ```
 */
export function SvgFigure({ svg, caption }: { svg: string; caption?: string }): VNode {
  return (
    <figure class="plumb-chart-figure">
      <div class="plumb-chart-svg" dangerouslySetInnerHTML={{ __html: svg }} />
      {caption ? <figcaption>{caption}</figcaption> : null}
    </figure>
  );
}
