/**
 * SVG snapshots of chart cells, rendered on the server with linkedom from
 * seeded data (test/snapshots/).
 */
import { chartPage } from "./view.tsx";
import { ok } from "node:assert/strict";
import { renderToString } from "preact-render-to-string";
import { renderChartSvg } from "../../ui/charts/render_chart.ts";
import { chartDocument } from "../../ui/charts/svg_document.ts";
import { assertSvgSnapshot } from "../../ui/charts/_snapshot.ts";
import { addFit, addTable, type Cells, lcg, runChartCell } from "./_testing.ts";
import { chartKind } from "./mod.ts";

const SNAPSHOTS = new URL("../../test/snapshots/", import.meta.url);

async function fade(n: number): Promise<Cells> {
  const r = lcg(7);
  const cells: Cells = {};
  // Invented fade data: q0 − a·√cycle plus seeded noise.
  const rows = Array.from({ length: n }, (_, i) => {
    const cycle = Math.round((600 * (i + 1)) / n);
    return [cycle, 2500 - 9.5 * Math.sqrt(cycle) + (r() - 0.5) * 6];
  });
  await addTable(cells, "cycles", {
    columns: ["cycle", "capacity"],
    rows,
    units: { cycle: "cycles", capacity: "mAh" },
  });
  await addFit(cells, "line", "cycles", "capacity = q0 + a*cycle");
  await addFit(cells, "root", "cycles", "capacity = q0 - a*sqrt(cycle)");
  return cells;
}

Deno.test("renderChartSvg() draws points, curves, band and residuals (snapshot)", async () => {
  const { out } = await runChartCell(await fade(60), {
    on: "cycles",
    x: "cycle",
    y: "capacity",
    fits: ["line", "root"],
    band: "root",
    residuals: true,
    title: "Capacity fade (seeded data)",
  });
  const svg = renderChartSvg(chartKind.summary(out, {} as never), chartDocument());
  ok(svg.includes("capacity (mAh)") && svg.includes("cycle (cycles)"), "units in axis labels");
  await assertSvgSnapshot(svg, new URL("chart-fade.svg", SNAPSHOTS));
});

Deno.test("renderChartSvg() draws the bands of the mean and of a new observation (snapshot)", async () => {
  const { out } = await runChartCell(await fade(40), {
    on: "cycles",
    x: "cycle",
    y: "capacity",
    band: "root",
    band_for: "both",
    band_method: "scheffe",
  });
  const svg = renderChartSvg(chartKind.summary(out, {} as never), chartDocument());
  ok(
    svg.includes("root: 95% band of the mean (Scheffé, simultaneous)"),
    "the mean's band labelled",
  );
  ok(svg.includes("root: 95% band of a new observation (Scheffé, simultaneous)"), "and the other");
  ok(svg.includes('stroke-dasharray="4,3"'), "the new observation's edges dashed");
  await assertSvgSnapshot(svg, new URL("chart-bands.svg", SNAPSHOTS));
});

Deno.test("renderChartSvg() draws a binned chart on log axes (snapshot)", async () => {
  const { out } = await runChartCell(await fade(6000), {
    on: "cycles",
    x: "cycle",
    y: "capacity",
    fits: ["root"],
    log: "x",
  });
  const svg = renderChartSvg(chartKind.summary(out, {} as never), chartDocument());
  ok(/\d,\d{3} rows drawn as density/.test(svg), "the note says the rows are binned");
  await assertSvgSnapshot(svg, new URL("chart-binned.svg", SNAPSHOTS));
});

Deno.test("chartPage.view renders to HTML on the server", async () => {
  const { out } = await runChartCell(await fade(20), {
    on: "cycles",
    x: "cycle",
    y: "capacity",
    fits: ["root"],
  });
  const html = renderToString(
    chartPage.view({ name: "c", result: chartKind.summary(out, {} as never) }),
  );
  ok(html.includes("<svg") && html.includes("20 rows; fits root"), html.slice(0, 200));
});
