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
 * On the live page a chart is drawn when its block is on or near the screen.
 * Blocks far off screen skip rendering (`content-visibility: auto` in
 * ui/style.ts); a chart whose new data arrives while its block is skipped
 * keeps its last drawing, marked `data-pending`, and is drawn from the
 * newest data as soon as the browser reports the block relevant again
 * (`contentvisibilityautostatechange`, which it does about half a screen
 * before the block scrolls into view) or the page is printed. A 10,000-row
 * update then draws only the charts a reader can see (about 5 ms each with
 * Plot) instead of all of them.
 *
 * A chart inside a closed `<details>` (the drift charts of the "Since the
 * last data" panel, one per parameter of every fit) is not shown either: it
 * waits the same way and is drawn when the disclosure opens (its `toggle`
 * event). With six fits they were about 70 ms of the page's work on every
 * update of a 100,000-row table, redrawn while the next run computed.
 *
 * @module
 */
import type { VNode } from "preact";
import { useEffect, useLayoutEffect, useRef } from "preact/hooks";
import type { ChartData } from "../../cells/shared/chart_data.ts";
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

/** Blocks that skip rendering (content-visibility: auto), as the browser last reported them. */
const skipped = new WeakMap<Element, boolean>();
/** Charts waiting to be drawn from newer data, by their figure box; each value draws it. */
const waiting = new Map<Element, () => void>();

if (LIVE) {
  // Capture: the event is fired at each block and does not bubble.
  globalThis.document.addEventListener("contentvisibilityautostatechange", (e) => {
    const host = e.target as Element;
    const now = (e as Event & { skipped: boolean }).skipped;
    skipped.set(host, now);
    if (now) return;
    for (const [box, draw] of [...waiting]) if (host.contains(box) && !hidden(box, null)) draw();
  }, true);
  // A disclosure opening shows the charts inside it (capture: toggle does not bubble).
  globalThis.document.addEventListener("toggle", (e) => {
    const details = e.target as Element;
    if (!(details instanceof HTMLDetailsElement) || !details.open) return;
    for (const [box, draw] of [...waiting]) {
      if (details.contains(box) && !hidden(box, autoHost(box))) draw();
    }
  }, true);
  globalThis.addEventListener("beforeprint", () => {
    for (const draw of [...waiting.values()]) draw();
  });
}

/**
 * Whether a chart's box is not shown now: its block skips rendering, or a
 * closed `<details>` holds it (the summary of a details is shown; a chart is
 * never in one).
 */
function hidden(el: Element, host: Element | null): boolean {
  if (host !== null && skipped.get(host) === true) return true;
  for (let e = el.parentElement; e !== null; e = e.parentElement) {
    if (e instanceof HTMLDetailsElement && !e.open) return true;
  }
  return false;
}

/** The nearest ancestor with content-visibility: auto, or null. */
function autoHost(el: Element): Element | null {
  for (let e = el.parentElement; e !== null; e = e.parentElement) {
    if (getComputedStyle(e).contentVisibility === "auto") return e;
  }
  return null;
}

function LiveFigure({ draw, data, caption }: DrawnFigureProps): VNode {
  const box = useRef<HTMLDivElement>(null);
  const host = useRef<Element | null | undefined>(undefined);
  const latest = useRef(draw);
  latest.current = draw;
  // Before the browser paints (and before a mutation observer hears of the
  // block's new state), so a block on screen never shows its new state with an old chart.
  useLayoutEffect(() => {
    const el = box.current;
    if (el === null) return;
    if (host.current === undefined) host.current = autoHost(el);
    const paint = () => {
      waiting.delete(el);
      el.removeAttribute("data-pending");
      el.replaceChildren(latest.current(globalThis.document));
    };
    if (!hidden(el, host.current)) paint();
    else {
      waiting.set(el, paint);
      el.setAttribute("data-pending", "");
    }
  }, [data]);
  useEffect(() => {
    const el = box.current;
    return () => void (el && waiting.delete(el));
  }, []);
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
