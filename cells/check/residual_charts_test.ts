import { equal, ok } from "node:assert/strict";
import { checkChartsSvg, checkDensity, checkFigure, checkPanels } from "./residual_charts.ts";
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

/** The seeded arrays with the fields the page copy of a check carries (rows, unit, findings, tests). */
function withFindings(n: number) {
  const d = seeded(n);
  d.studentized_internal[5] = 3.6;
  return {
    ...d,
    n,
    p: 2,
    rows: d.fitted.map((_, i) => i + 3),
    sigma_unit: "mAh",
    significance: 0.05,
    reset: { f: 0.8, df1: 2, df2: n - 4, p_value: 0.45 },
    breusch_pagan: {
      variant: "koenker" as const,
      statistic: 1,
      df: 1,
      p_value: 0.01,
      f: null,
      f_p_value: null,
      regressors: "design" as const,
    },
    findings: [
      { code: "outlier" as const, rows: [8], message: "Row 8 …" },
      { code: "high-leverage" as const, rows: [3, 42], message: "Rows 3 and 42 …" },
    ],
  };
}

Deno.test("checkFigure() titles each panel by its question and states the verdict under it (snapshot)", async () => {
  const svg = checkFigure(withFindings(40), chartDocument()).outerHTML;
  for (
    const q of [
      "Is a trend left in the residuals?",
      "Does the scatter change with the level?",
      "Are the residuals near normal?",
      "Do neighbouring rows agree?",
      "Does any row steer the fit?",
    ]
  ) ok(svg.includes(q), q);
  ok(svg.includes("constant variance (Breusch–Pagan, koenker): p = 0.01 &lt; 0.05, a finding"));
  ok(svg.includes("fitted (mAh)") && svg.includes("residual (mAh)"), "the fit's unit on the axes");
  ok(!svg.includes("↑") && !svg.includes("→"), "no arrows in axis labels");
  await assertSvgSnapshot(svg, new URL("check-figure.svg", SNAPSHOTS));
});

Deno.test("checkPanels() draws the thresholds the findings state and numbers the rows they name", () => {
  const [trend, spread, , , influence] = checkChartsSvg(withFindings(40), chartDocument());
  ok(spread.includes("3: outlier beyond"), "the outlier threshold on |studentized residual|");
  ok(
    influence.includes("2p/n = 0.1") && influence.includes("+3"),
    "leverage and residual thresholds",
  );
  ok(influence.includes("Cook's distance"), "Cook's distance as ring area");
  // Row 8 (index 5) is an outlier: filled and numbered by its source row in the trend panel.
  ok(trend.includes("rows a finding names") && />8</.test(trend), trend.slice(0, 300));
  ok(/>42</.test(influence) && />3</.test(influence), "high-leverage rows numbered");
});

Deno.test("checkPanels() skips null values (leverage 1)", () => {
  const d = seeded(10);
  d.studentized_internal[3] = null as unknown as number;
  const svgs = checkChartsSvg(d, chartDocument());
  ok(svgs.every((s) => s.startsWith("<svg")));
});

Deno.test("checkPanels() draws the same panels from checkDensity() as from the per-row arrays", () => {
  const d = seeded(6000);
  const density = checkDensity(d);
  ok(density !== null);
  const counted = {
    fit: d.fit,
    n: 6000,
    p: 2,
    fitted: [],
    residuals: [],
    studentized_internal: [],
    leverage: [],
    cooks_distance: [],
    density,
  };
  const doc = chartDocument();
  const a = checkPanels({ ...d, n: 6000, p: 2 }, doc), b = checkPanels(counted, doc);
  // Above DENSE_ROWS the row-order panel is left out either way.
  equal(a.length, 4);
  equal(b.length, 4);
  const ids = (svg: string) => svg.replaceAll(/plot-clip-\d+/g, "plot-clip");
  for (const i of [0, 1, 4 - 1]) equal(ids(b[i].svg.outerHTML), ids(a[i].svg.outerHTML));
  equal(checkDensity(seeded(40)), null);
});
