import { equal, ok } from "node:assert/strict";
import { checkChartsSvg, checkDensity } from "./residual_charts.ts";
import { chartDocument } from "../../ui/charts/svg_document.ts";
import { assertSvgSnapshot } from "../../ui/charts/_snapshot.ts";

const SNAPSHOTS = new URL("../../test/snapshots/", import.meta.url);

function seeded(n: number) {
  let s = 11;
  // Park–Miller minimal standard generator (Park & Miller 1988, CACM 31(10)).
  const r = () => (s = (s * 16807) % 2147483647) / 2147483647;
  const fitted = Array.from({ length: n }, (_, i) => 10 + i);
  const residuals = fitted.map(() => r() + r() + r() - 1.5);
  const leverage = fitted.map((_, i) => 2 / n + 0.4 * ((i - n / 2) / n) ** 2);
  return {
    fit: "root",
    fitted,
    residuals,
    studentized_internal: residuals.map((v) => v / 0.5),
    leverage,
    cooks_distance: residuals.map(() => 0.01),
  };
}

Deno.test("checkChartsSvg() draws the four residual charts with their reference lines (snapshot)", async () => {
  const svgs = checkChartsSvg(seeded(40), chartDocument());
  equal(svgs.length, 4);
  ok(svgs[0].includes("zero residual"));
  ok(svgs[1].includes("1:1 line"));
  ok(svgs[3].includes("Cook's distance 0.5") && svgs[3].includes("Cook's distance 1"));
  const names = ["fitted", "quantile", "scale", "leverage"];
  for (let i = 0; i < 4; i++) {
    await assertSvgSnapshot(svgs[i], new URL(`check-${names[i]}.svg`, SNAPSHOTS));
  }
});

Deno.test("checkChartsSvg() skips null values (leverage 1)", () => {
  const d = seeded(10);
  d.studentized_internal[3] = null as unknown as number;
  const svgs = checkChartsSvg(d, chartDocument());
  ok(svgs.every((s) => s.startsWith("<svg")));
});

Deno.test("checkChartsSvg() draws the same charts from checkDensity() as from the per-row arrays", () => {
  const d = seeded(6000);
  const density = checkDensity(d);
  ok(density !== null);
  const counted = {
    fit: d.fit,
    fitted: [],
    residuals: [],
    studentized_internal: [],
    leverage: [],
    cooks_distance: [],
    density,
  };
  const doc = chartDocument();
  const a = checkChartsSvg(d, doc), b = checkChartsSvg(counted, doc);
  // Plot numbers its clip paths with a running counter; the drawing is otherwise the same.
  const ids = (svg: string) => svg.replaceAll(/plot-clip-\d+/g, "plot-clip");
  for (let i = 0; i < 4; i++) equal(ids(b[i]), ids(a[i]));
  ok(a[0].includes("rows counted into cells"));
  equal(checkDensity(seeded(40)), null);
});
