/**
 * The chart cell's view: the chart as inline SVG (drawn by ui/charts from
 * the result alone), a one-line key of the fits drawn, and a key of the
 * bands: each band's swatch as drawn (solid edges for the mean's band,
 * dashed and lighter for a new observation's), its label (fit, level,
 * which band, method) and the quantile it used.
 *
 * @module
 */
import type { VNode } from "preact";
import type { PageFace, ViewProps } from "../../kernel/contract/mod.ts";
import type { ChartBand, ChartData } from "../shared/chart_data.ts";
import { ChartFigure } from "../../ui/charts/chart_figure.tsx";

/**
 * Renders a chart result.
 *
 * @param props The cell name and its result.
 * @returns The block's content.
 */
export function ChartView({ name, result }: ViewProps<ChartData>): VNode {
  const bands = result.bands ?? (result.band ? [result.band] : []);
  return (
    <section class="plumb-chart-cell" aria-label={`Chart ${name}`}>
      <ChartFigure data={result} caption={caption(result)} />
      {bands.length > 0 && (
        <ul class="plumb-chart-bands" aria-label="bands" style="list-style:none;padding:0;margin:0">
          {bands.map((b) => <BandKey key={b.kind} band={b} />)}
        </ul>
      )}
    </section>
  );
}

/** One band's line of the key: its swatch, its label, and the quantile with its name. */
function BandKey({ band }: { band: ChartBand }): VNode {
  const observation = band.kind === "observation";
  const q = band.quantile === null || band.quantile === undefined
    ? ""
    : ` · q = ${Number(band.quantile.toPrecision(4))}${
      band.quantile_of ? `, ${band.quantile_of}` : ""
    }`;
  return (
    <li class="plumb-chart-band" data-band={band.kind}>
      <svg
        width="22"
        height="10"
        viewBox="0 0 22 10"
        aria-hidden="true"
        style="vertical-align:middle"
      >
        <rect
          x="0"
          y="1"
          width="22"
          height="8"
          fill={band.color}
          fill-opacity={observation ? 0.07 : 0.14}
        />
        {[1, 9].map((y) => (
          <line
            key={y}
            x1="0"
            x2="22"
            y1={y}
            y2={y}
            stroke={band.color}
            stroke-width={observation ? 0.9 : 0.6}
            stroke-dasharray={observation ? "4,3" : undefined}
          />
        ))}
      </svg>{" "}
      <span>{band.label}</span>
      <small>{q}</small>
      {band.note && <small>{` · ${band.note}`}</small>}
      {band.new_observation && <small>{` · new observation: ${band.new_observation}`}</small>}
    </li>
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
