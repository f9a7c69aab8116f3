/**
 * The Preact components that show a chart in a `<figure>`. Rendering is a
 * pure function of the data, so the live page and the static record (drawn
 * on the server with linkedom) show the same SVG.
 *
 * Two ways in, one markup: on the server (and under `deno test`) the SVG is
 * inlined as markup; on the live page {@link DrawnFigure} draws with the
 * page's own document and inserts the element Plot made, skipping the
 * markup round trip (write `outerHTML`, and for Preact's innerHTML check
 * read it back, then parse it again), which cost the page about a third of
 * its chart time on every update.
 *
 * @module
 */
import type { VNode } from "preact";
import { useLayoutEffect, useRef } from "preact/hooks";
import type { ChartData } from "./chart_data.ts";
import { renderChart } from "./render_chart.ts";
import { chartDocument } from "./svg_document.ts";

/** True in a browser page (a document and animation frames), false on the server and in tests. */
const LIVE = typeof globalThis.document !== "undefined" &&
  typeof globalThis.requestAnimationFrame === "function";

/** Props of {@link ChartFigure}. */
export interface ChartFigureProps {
  data: ChartData;
  /** The document to draw with (default: the browser's, or linkedom's on the server). */
  document?: Document;
  /** A caption under the chart (optional). */
  caption?: string;
}

/**
 * Shows a chart cell's chart.
 *
 * @param props The chart data and, optionally, the document and a caption.
 * @returns A `<figure class="plumb-chart-figure">`.
 */
export function ChartFigure({ data, document, caption }: ChartFigureProps): VNode {
  if (document !== undefined) {
    return <SvgFigure svg={renderChart(data, document).outerHTML} caption={caption} />;
  }
  return <DrawnFigure draw={(d) => renderChart(data, d)} data={data} caption={caption} />;
}

/** Props of {@link DrawnFigure}. */
export interface DrawnFigureProps {
  /** Draws the chart with a document (the page's, or linkedom's on the server). */
  draw: (document: Document) => Element;
  /** What the drawing depends on: drawn again only when this changes (by identity). */
  data: unknown;
  caption?: string;
}

/**
 * Shows a drawn chart: inserted as an element on the live page, inlined as
 * markup elsewhere.
 *
 * @param props The drawing function, its data and an optional caption.
 * @returns A `<figure class="plumb-chart-figure">`.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { DrawnFigure } from "./chart_figure.tsx";
 * const draw = (d: Document) => d.createElementNS("http://www.w3.org/2000/svg", "svg");
 * const html = renderToString(DrawnFigure({ draw, data: 1 }));
 * if (!html.includes("<svg")) throw new Error(html);
 * ```
 */
export function DrawnFigure({ draw, data, caption }: DrawnFigureProps): VNode {
  if (!LIVE) return <SvgFigure svg={draw(chartDocument()).outerHTML} caption={caption} />;
  return <LiveFigure draw={draw} data={data} caption={caption} />;
}

function LiveFigure({ draw, data, caption }: DrawnFigureProps): VNode {
  const box = useRef<HTMLDivElement>(null);
  // Before the browser paints (and before a mutation observer hears of the
  // block's new state), so a block never shows its new state with an old chart.
  useLayoutEffect(() => {
    box.current?.replaceChildren(draw(globalThis.document));
  }, [data]);
  return (
    <figure class="plumb-chart-figure">
      <div class="plumb-chart-svg" ref={box} />
      {caption ? <figcaption>{caption}</figcaption> : null}
    </figure>
  );
}

/**
 * Shows ready SVG markup (from our own renderers only) in a figure.
 *
 * @param props The SVG string and an optional caption.
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
