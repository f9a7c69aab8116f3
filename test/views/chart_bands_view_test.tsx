/**
 * The chart block's band key and the chart's own note (cells/chart/view.tsx,
 * ui/charts/render_chart.ts): each band labelled with its fit, level, which
 * band and method, its quantile named, and drawn so that the band of a new
 * observation differs from the mean's by shape (dashed edges), not colour
 * alone. Results come from real chart runs over the real table and fit kinds.
 */
import { deepEqual, doesNotMatch, equal, match, ok } from "node:assert/strict";
import { renderToString } from "preact-render-to-string";
import { h } from "preact";
import { ChartView } from "../../cells/chart/view.tsx";
import { chartKind } from "../../cells/chart/mod.ts";
import { addFit, addTable, type Cells, runChartCell } from "../../cells/chart/_testing.ts";
import type { ChartData } from "../../cells/shared/chart_data.ts";

async function decay(options: Record<string, unknown>): Promise<ChartData> {
  const cells: Cells = {};
  // Invented decay readings.
  const ys = [6.02, 4.41, 3.62, 2.93, 2.31, 2.05, 1.72, 1.49, 1.43, 1.31];
  await addTable(cells, "d", {
    columns: ["t", "y"],
    rows: ys.map((y, i) => [i, y]),
    units: { t: "h", y: "mg/L" },
  });
  await addFit(cells, "decay", "d", "y = a*exp(-b*t) + c", { a: 5, b: 0.3, c: 1 });
  const { out } = await runChartCell(cells, { on: "d", x: "t", y: "y", band: "decay", ...options });
  return chartKind.summary(out, {} as never);
}

/** The key's items as text (tags dropped). */
function keyItems(html: string): string[] {
  return [...html.matchAll(/<li class="plumb-chart-band"[^>]*>(.*?)<\/li>/gs)].map((m) =>
    m[1].replace(/<[^>]+>/g, "").replace(/&amp;/g, "&").trim()
  );
}

Deno.test("ChartView labels each band with its fit, level, kind and method, and names its quantile", async () => {
  const r = await decay({ band_for: "both", band_method: "scheffe", band_level: 0.9 });
  const html = renderToString(h(ChartView, { name: "fade", result: r }));
  const items = keyItems(html);
  equal(items.length, 2);
  match(
    items[0],
    /^decay: 90% band of the mean \(Scheffé, simultaneous\) · q = [\d.]+, √\(3·F\(0\.9; 3, 7\)\)/,
  );
  match(items[0], /linearised/);
  match(
    items[1],
    /^decay: 90% band of a new observation \(Scheffé, simultaneous\) · q = [\d.]+, √\(4·F\(0\.9; 4, 7\)\)/,
  );
  match(items[1], /new observation: s²\/m for a new observation/);
  // The chart's note (drawn in the SVG, so the record shows it too) carries both labels.
  ok(html.includes("decay: 90% band of the mean (Scheffé, simultaneous)"));
  ok(html.includes("decay: 90% band of a new observation (Scheffé, simultaneous)"));
  // Shape, not colour alone: the new observation's swatch and edges are dashed, the mean's not.
  const swatches = [
    ...html.matchAll(/<li class="plumb-chart-band" data-band="(\w+)">(.*?)<\/svg>/gs),
  ];
  deepEqual(swatches.map((m) => m[1]), ["mean", "observation"]);
  doesNotMatch(swatches[0][2], /stroke-dasharray/);
  match(swatches[1][2], /stroke-dasharray="4,3"/);
  match(html, /stroke-dasharray="4,3"/);
});

Deno.test("ChartView shows the pointwise delta band by default, and no key without a band", async () => {
  const r = await decay({});
  const html = renderToString(h(ChartView, { name: "fade", result: r }));
  const items = keyItems(html);
  equal(items.length, 1);
  match(
    items[0],
    /^decay: 95% band of the mean \(delta, pointwise\) · q = [\d.]+, t\(0\.975; 7\)$/,
  );
  const none = { ...r, band: null, bands: [] };
  doesNotMatch(renderToString(h(ChartView, { name: "fade", result: none })), /plumb-chart-bands/);
});
