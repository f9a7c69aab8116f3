/**
 * The chart cell's view: the chart as inline SVG (drawn by ui/charts from
 * the result alone) and a one-line key of the fits drawn.
 *
 * @module
 */
import type { VNode } from "preact";
import type { PageFace, ViewProps } from "../../kernel/contract/mod.ts";
import type { ChartData } from "../shared/chart_data.ts";
import { ChartFigure } from "../../ui/charts/chart_figure.tsx";

/**
 * Renders a chart result.
 *
 * @param props The cell name and its result.
 * @returns The block's content.
 */
export function ChartView({ name, result }: ViewProps<ChartData>): VNode {
  return (
    <section class="plumb-chart-cell" aria-label={`Chart ${name}`}>
      <ChartFigure data={result} caption={caption(result)} />
    </section>
  );
}

function caption(r: ChartData): string {
  const drawn = r.binned
    ? `${r.rows} rows binned into ${r.bins_drawn} cells`
    : `${r.points} ${r.points === 1 ? "row" : "rows"}`;
  const fits = r.curves.map((c) => c.fit);
  return fits.length ? `${drawn}; fits ${fits.join(", ")}` : drawn;
}

/** The `chart` kind's page face: its view, for the live page and the record. */
export const chartPage: PageFace<ChartData, VNode> = { kind: "chart", view: ChartView };
