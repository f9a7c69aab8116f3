import { deepEqual, equal, ok, rejects } from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { studentT } from "../../kernel/stats/mod.ts";
import type { Fit } from "../fit/fit.ts";
import { addFit, addTable, type Cells, lcg, runChartCell } from "./_testing.ts";
import { chartKind } from "./mod.ts";

// Small straight-line data (invented), x = 1..5.
const XS = [1, 2, 3, 4, 5], YS = [1.1, 1.9, 3.2, 3.8, 5.1];

async function lineCells(): Promise<Cells> {
  const cells: Cells = {};
  await addTable(cells, "t", {
    columns: ["x", "y", "label"],
    rows: XS.map((x, i) => [x, YS[i], `r${i}`]),
    units: { x: "s", y: "mV" },
  });
  await addFit(cells, "line", "t", "y = a + b*x");
  await addFit(cells, "root", "t", "y = q0 + a*sqrt(x)");
  return cells;
}

async function refusal(cells: Cells, options: Record<string, unknown>): Promise<CellError> {
  let caught: unknown;
  await rejects(async () => {
    try {
      await runChartCell(cells, options);
    } catch (e) {
      caught = e;
      throw e;
    }
  }, CellError);
  return caught as CellError;
}

Deno.test("runChart() refuses an unknown column at its option, suggesting the near miss", async () => {
  const e = await refusal(await lineCells(), { on: "t", x: "xx", y: "y" });
  equal(e.message, `Cannot chart "c": unknown column "xx": did you mean "x"?`);
  deepEqual(e.path, ["x"]);
  const f = await refusal(await lineCells(), { on: "t", x: "x", y: "speed" });
  equal(f.message, `Cannot chart "c": unknown column "speed": table "t" has "x", "y", "label"`);
  deepEqual(f.path, ["y"]);
});

Deno.test("runChart() refuses a text column on an axis", async () => {
  const e = await refusal(await lineCells(), { on: "t", x: "label", y: "y" });
  equal(e.message, `Cannot chart "c": column "label" holds text, and the x axis needs numbers`);
  deepEqual(e.path, ["x"]);
});

Deno.test("runChart() refuses a fit on another table, at the fit's place in the list", async () => {
  const cells = await lineCells();
  await addTable(cells, "u", { columns: ["x", "y"], rows: [[1, 2], [2, 3], [3, 5]] });
  await addFit(cells, "other", "u", "y = a + b*x");
  const e = await refusal(cells, { on: "t", x: "x", y: "y", fits: ["line", "other"] });
  equal(
    e.message,
    `Cannot draw fit "other" in chart "c": it was fitted on table "u", and the chart draws table "t"`,
  );
  deepEqual(e.path, ["fits", 1]);
  const b = await refusal(cells, { on: "t", x: "x", y: "y", band: "other" });
  deepEqual(b.path, ["band"]);
});

Deno.test("runChart() refuses a fit with two predictors, naming them", async () => {
  const cells: Cells = {};
  await addTable(cells, "t", {
    columns: ["x", "z", "y"],
    rows: [[1, 3, 2], [2, 1, 3], [3, 4, 5], [4, 1, 4], [5, 5, 7]],
  });
  await addFit(cells, "two", "t", "y = a + b*x + c*z");
  const e = await refusal(cells, { on: "t", x: "x", y: "y", fits: ["two"] });
  equal(
    e.message,
    `Cannot draw fit "two" in chart "c": it has 2 predictors "x" and "z", and a curve over "x" needs a fit with one predictor`,
  );
});

Deno.test("runChart() refuses a fit of another response or predictor", async () => {
  const cells = await lineCells();
  await addFit(cells, "inverse", "t", "x = a + b*y");
  const e = await refusal(cells, { on: "t", x: "x", y: "y", fits: ["inverse"] });
  equal(
    e.message,
    `Cannot draw fit "inverse" in chart "c": it models "x", and the chart's y is "y"`,
  );
});

Deno.test("runChart() evaluates each curve on the grid as the fit's model at those x", async () => {
  const cells = await lineCells();
  const { out } = await runChartCell(cells, { on: "t", x: "x", y: "y", fits: ["line", "root"] });
  const d = out.data;
  equal(d.grid[0], 1);
  equal(d.grid[d.grid.length - 1], 5);
  const root = (cells.root as Fit).estimates, line = (cells.line as Fit).estimates;
  // The models written out by hand (identity with the fit's own evaluation, common practice, no source).
  d.grid.forEach((x, i) => {
    ok(Math.abs(d.curves[0].y[i]! - (line[0] + line[1] * x)) <= 1e-12);
    ok(Math.abs(d.curves[1].y[i]! - (root[0] + root[1] * Math.sqrt(x))) <= 1e-12);
  });
  equal(d.x.label, "x (s)");
  equal(d.y.label, "y (mV)");
  equal(d.points, 5);
  equal(d.binned, false);
  equal(d.marks, 3);
});

Deno.test("runChart() band of a straight line matches t·s·√(1/n + (x0 − x̄)²/Sxx)", async () => {
  const cells = await lineCells();
  const { out } = await runChartCell(cells, { on: "t", x: "x", y: "y", band: "line" });
  const d = out.data, fit = cells.line as Fit;
  const n = 5, xbar = 3, sxx = 10;
  const s = fit.statistics.sigma!;
  const t = studentT(n - 2).upperQuantile(0.025);
  // t(0.975; 3) = 3.182 (NIST/SEMATECH e-Handbook §1.3.6.7.2 table).
  ok(Math.abs(t - 3.182) < 5e-4);
  const i = 40, x0 = d.grid[i];
  // Interval of the mean response of a straight line (Draper & Smith, Applied Regression Analysis, §1.4; from memory).
  const half = t * s * Math.sqrt(1 / n + (x0 - xbar) ** 2 / sxx);
  const mean = d.curves[0].y[i]!;
  ok(Math.abs(d.band!.hi[i]! - (mean + half)) < 1e-12, `${d.band!.hi[i]} vs ${mean + half}`);
  ok(Math.abs(d.band!.lo[i]! - (mean - half)) < 1e-12);
  equal(d.band!.level, 0.95);
  equal(d.curves.length, 1, "the band's fit is drawn as a curve too");
});

Deno.test("runChart() back-transforms a log response, curve and band end by end", async () => {
  const cells = await lineCells();
  await addFit(cells, "logline", "t", "log(y) = a + b*x");
  const { out } = await runChartCell(cells, { on: "t", x: "x", y: "y", band: "logline" });
  const d = out.data, fit = cells.logline as Fit;
  const [a, b] = fit.estimates;
  const i = 100, x0 = d.grid[i];
  ok(Math.abs(d.curves[0].y[i]! - Math.exp(a + b * x0)) < 1e-12);
  // On the log scale the band is symmetric about a + b·x0 (exp is monotone; common practice, no source).
  const up = Math.log(d.band!.hi[i]!) - (a + b * x0);
  const down = (a + b * x0) - Math.log(d.band!.lo[i]!);
  ok(up > 0 && Math.abs(up - down) < 1e-12);
});

async function manyRows(n: number): Promise<Cells> {
  const r = lcg(42);
  const cells: Cells = {};
  const rows = Array.from({ length: n }, () => {
    const x = 100 * r();
    return [x, 3 + 0.5 * x + (r() - 0.5) * 4];
  });
  await addTable(cells, "big", { columns: ["x", "y"], rows });
  await addFit(cells, "line", "big", "y = a + b*x");
  return cells;
}

Deno.test("runChart() bins more rows than the threshold and counts what it draws", async () => {
  const cells = await manyRows(6000);
  const { out } = await runChartCell(cells, {
    on: "big",
    x: "x",
    y: "y",
    fits: ["line"],
    residuals: true,
  });
  const d = out.data;
  equal(d.binned, true);
  equal(d.points, 0);
  equal(d.data, null);
  equal(d.rows, 6000);
  equal(d.bins!.cells.reduce((s, c) => s + c[2], 0), 6000, "every row is in one cell");
  equal(d.bins_drawn, d.bins!.cells.length);
  ok(d.bins_drawn <= 80 * 50);
  equal(d.residuals!.binned, true);
  ok(d.residuals!.series[0].x.length <= 80);
  const summary = chartKind.summary(out, {} as never);
  ok(JSON.stringify(summary).length < 200_000, "the summary stays compact");
});

Deno.test("runChart() draws every point up to the threshold", async () => {
  const cells = await manyRows(5000);
  const { out } = await runChartCell(cells, { on: "big", x: "x", y: "y" });
  equal(out.data.binned, false);
  equal(out.data.points, 5000);
  const lower = await runChartCell(cells, { on: "big", x: "x", y: "y", bin_above: 100 });
  equal(lower.out.data.binned, true);
});

Deno.test("runChart() leaves out rows ≤ 0 on a log axis with a warning", async () => {
  const cells: Cells = {};
  await addTable(cells, "t", { columns: ["x", "y"], rows: [[0, 1], [1, 2], [10, 3], [100, 4]] });
  const { out, warnings } = await runChartCell(cells, { on: "t", x: "x", y: "y", log: "x" });
  equal(out.data.points, 3);
  deepEqual(warnings, [`Chart "c" leaves out 1 row with a value ≤ 0 on a log axis`]);
  equal(out.data.grid[0], 1);
  ok(Math.abs(out.data.grid[80] - 10) < 1e-12, "log-spaced grid: the middle of 1…100 is 10");
});

Deno.test("chartKind.summary() rounds to 7 significant digits", async () => {
  const cells = await lineCells();
  const { out } = await runChartCell(cells, { on: "t", x: "x", y: "y", fits: ["root"] });
  const r = chartKind.summary(out, {} as never);
  for (const v of r.curves[0].y) ok(v === null || Number(v.toPrecision(7)) === v);
  equal(chartKind.line(r), "y against x · 5 points · 1 curve");
});

/** A chart of table "t" with fit "line" and its residual panel. */
const LINE_WITH_RESIDUALS = { on: "t", x: "x", y: "y", fits: ["line"], residuals: true };

Deno.test("runChart() leaves out a row with a missing value and gives plain arrays", async () => {
  const cells: Cells = {};
  await addTable(cells, "t", {
    columns: ["x", "y"],
    rows: [[1, 1.1], [2, null], [3, 3.2], [4, 3.8], [5, 5.1]],
  });
  await addFit(cells, "line", "t", "y = a + b*x");
  const { out } = await runChartCell(cells, LINE_WITH_RESIDUALS);
  deepEqual(out.data.data, { x: [1, 3, 4, 5], y: [1.1, 3.2, 3.8, 5.1] });
  const series = out.data.residuals!.series[0];
  deepEqual(series.x, [1, 3, 4, 5]);
  ok(Array.isArray(series.r) && series.r.length === 4);
  // The summary is plain JSON: arrays stay arrays (a typed array would become an object).
  const r = chartKind.summary(out, {} as never);
  ok(Array.isArray(r.residuals!.series[0].x) && Array.isArray(r.data!.x));
});

Deno.test("runChart() with every row drawn reads the table's columns without changing them", async () => {
  const cells = await lineCells();
  const before = JSON.stringify(cells.t);
  const { out } = await runChartCell(cells, LINE_WITH_RESIDUALS);
  deepEqual(out.data.data, { x: XS, y: YS });
  deepEqual(out.data.residuals!.series[0].x, XS);
  ok(Array.isArray(out.data.residuals!.series[0].r));
  equal(JSON.stringify(cells.t), before);
});
