/**
 * Running a chart cell: table (+ fits) → plot-ready {@link ChartData}.
 *
 * ```
 *  table ─columns x, y─▶ rows with finite x, y (positive on a log axis)
 *     ├─ rows ≤ bin_above: points           └─ more: 2-D density (BIN_GRID)
 *  fits ─drawnFits─▶ curves on a grid over the x range ─┬─ bands of one fit (_bands.ts):
 *                                                      │  mean and/or new observation
 *                                                      └─ residual panel
 * ```
 *
 * Everything is computed here, in the worker; the view only draws.
 *
 * @module
 */
import { plainArray } from "../../kernel/arrays.ts";
import { CellError } from "../../kernel/errors.ts";
import type { CellOutput, NumberColumn, RunContext, Table } from "../../kernel/contract/mod.ts";
import type { ChartAxis, ChartBand, ChartData, ChartResiduals } from "../shared/chart_data.ts";
import { fitColor } from "../shared/palette.ts";
import { numberColumnOf } from "../shared/number_column.ts";
import type { ChartSpec } from "./spec.ts";
import { type DrawnFit, drawnFits } from "./_fit_layers.ts";
import { curveOn, gridOver } from "./_curves.ts";
import { bandsOf } from "./_bands.ts";
import { BIN_GRID, binEdges, binMeans, binPoints } from "./_bins.ts";

/** Points of the grid the curves and the band are evaluated at. */
export const GRID_POINTS = 161;

/** The `Chart` value: the plot-ready data at full precision (the summary rounds it). */
export interface ChartOutput extends CellOutput {
  type: "Chart";
  data: ChartData;
}

/**
 * Computes a chart's points or bins, curves, bands and residual panel.
 *
 * @param spec The normalised options.
 * @param ctx Inputs (the table under `spec.on`, the fits), settings, warning sink.
 * @returns The chart.
 * @throws {CellError} At the option concerned: no table, an unknown or
 *   non-numeric column (with a suggestion), no row to draw, a fit that cannot
 *   be drawn (see `_fit_layers.ts`), a residual panel without fits.
 */
export function runChart(spec: ChartSpec, ctx: RunContext): ChartOutput {
  const table = ctx.inputs[spec.on] as Table | undefined;
  if (table === undefined || table.type !== "Table") {
    throw new CellError(`Cannot chart "${ctx.name}": cell "${spec.on}" gives no table`, ["on"]);
  }
  const xc = numberColumn(ctx.name, table, spec.on, spec.x, "x");
  const yc = numberColumn(ctx.name, table, spec.on, spec.y, "y");
  const fits = drawnFits(spec, ctx);
  if (spec.residuals && fits.length === 0) {
    throw new CellError(
      `Cannot draw residuals in chart "${ctx.name}": name the fits in "fits"`,
      ["residuals"],
    );
  }
  const { x, y } = plottedRows(spec, ctx, xc.values, yc.values);
  const xDomain = extent(x);
  const grid = gridOver(xDomain[0], xDomain[1], GRID_POINTS, spec.logX);
  const curves = fits.map((d) => ({
    fit: d.name,
    color: fitColor(d.name),
    model: d.fit.model.text,
    y: finiteOrNull(curveOn(d.fit, grid, d.inverse), spec.logY),
  }));
  const bands = bandsFor(spec, ctx, fits, grid);
  const binned = x.length > spec.binAbove;
  const yDomain = extentOfAll([
    y,
    ...curves.map((c) => c.y),
    ...bands.flatMap((b) => [b.lo, b.hi]),
  ]);
  const bins = binned
    ? binPoints(
      x,
      y,
      binEdges(xDomain[0], xDomain[1], BIN_GRID.nx, spec.logX),
      binEdges(yDomain[0], yDomain[1], BIN_GRID.ny, spec.logY),
      spec.logX,
      spec.logY,
    )
    : null;
  const residuals = spec.residuals ? residualPanel(spec, table, fits, [xc, yc], xDomain) : null;
  const marks = 1 + curves.length + bands.length +
    (residuals ? residuals.series.length + 1 : 0);
  const data: ChartData = {
    marks,
    points: binned ? 0 : x.length,
    binned,
    rows: x.length,
    bins_drawn: bins?.cells.length ?? 0,
    title: spec.title,
    x: axis(spec.x, xc.unit, spec.logX, xDomain),
    y: axis(spec.y, yc.unit, spec.logY, yDomain),
    data: binned ? null : { x: plainArray(x), y: plainArray(y) },
    bins,
    grid: plainArray(grid),
    curves,
    band: bands[0] ?? null,
    bands,
    residuals,
  };
  return { type: "Chart", data };
}

function numberColumn(
  name: string,
  table: Table,
  on: string,
  column: string,
  option: "x" | "y",
): NumberColumn {
  const needs = `the ${option} axis needs numbers`;
  return numberColumnOf(table, column, {
    cannot: `Cannot chart "${name}"`,
    on,
    needs,
    path: [option],
  });
}

/**
 * Rows with finite x and y, positive on a log axis; a warning counts those
 * left out for log. When every row is drawn, the table's own columns (no
 * copy: a chart over 100,000 rows would otherwise build and copy 1.6 MB on
 * each update); else new arrays of the rows kept, sized by a first count.
 */
function plottedRows(spec: ChartSpec, ctx: RunContext, xs: Float64Array, ys: Float64Array) {
  const drawn = (i: number) =>
    Number.isFinite(xs[i]) && Number.isFinite(ys[i]) &&
    !(spec.logX && xs[i] <= 0) && !(spec.logY && ys[i] <= 0);
  let kept = 0, nonPositive = 0;
  for (let i = 0; i < xs.length; i++) {
    if (drawn(i)) kept++;
    else if (Number.isFinite(xs[i]) && Number.isFinite(ys[i])) nonPositive++;
  }
  if (nonPositive > 0) {
    ctx.warn(
      `Chart "${ctx.name}" leaves out ${nonPositive} ${
        nonPositive === 1 ? "row" : "rows"
      } with a value ≤ 0 on a log axis`,
    );
  }
  if (kept === 0) {
    throw new CellError(
      `Cannot chart "${ctx.name}": no row of "${spec.on}" has numbers in both "${spec.x}" and "${spec.y}"`,
      ["x"],
    );
  }
  if (kept === xs.length) return { x: xs, y: ys };
  const [x, y] = keptRows(xs, ys, kept, drawn);
  return { x, y };
}

/** The values of `a` and `b` at the rows `keep` accepts (`count` of them), as new arrays. */
function keptRows(
  a: ArrayLike<number>,
  b: ArrayLike<number>,
  count: number,
  keep: (i: number) => boolean,
): [Float64Array, Float64Array] {
  const x = new Float64Array(count), y = new Float64Array(count);
  for (let i = 0, k = 0; k < count; i++) {
    if (!keep(i)) continue;
    x[k] = a[i];
    y[k++] = b[i];
  }
  return [x, y];
}

/** The bands of the `band` fit, as plot-ready data (ends null where not finite or ≤ 0 on a log y). */
function bandsFor(
  spec: ChartSpec,
  ctx: RunContext,
  fits: DrawnFit[],
  grid: Float64Array,
): ChartBand[] {
  if (spec.band === null) return [];
  const d = fits.find((f) => f.name === spec.band)!;
  return bandsOf(spec, ctx, d, grid).map((b) => ({
    fit: d.name,
    color: fitColor(d.name),
    level: b.level,
    kind: b.kind,
    coverage: b.coverage,
    method: b.method,
    quantile: b.quantile,
    quantile_of: b.quantileOf,
    note: b.note,
    new_observation: b.newObservation,
    label: bandLabel(d.name, b.kind, b.level, b.method),
    lo: finiteOrNull(b.lo, spec.logY),
    hi: finiteOrNull(b.hi, spec.logY),
  }));
}

/**
 * A band's label, as the chart and its key show it.
 *
 * @param fit The fit's name.
 * @param kind Of the mean, or of a new observation.
 * @param level The level.
 * @param method The method in words.
 * @returns e.g. `root: 95% band of the mean (Scheffé, simultaneous)`.
 */
export function bandLabel(
  fit: string,
  kind: "mean" | "observation",
  level: number,
  method: string,
): string {
  const pct = `${Number((level * 100).toPrecision(6))}%`;
  const of = kind === "mean" ? "band of the mean" : "band of a new observation";
  return `${fit}: ${pct} ${of} (${method})`;
}

function residualPanel(
  spec: ChartSpec,
  table: Table,
  fits: DrawnFit[],
  [xc, yc]: [NumberColumn, NumberColumn],
  xDomain: [number, number],
): ChartResiduals {
  const binned = fits.some((d) => d.fit.residuals.length > spec.binAbove);
  const edges = binEdges(xDomain[0], xDomain[1], BIN_GRID.nx, spec.logX);
  const series = fits.map((d) => {
    const { x, r } = residualRows(d, xc, table, spec.logX);
    const s = binned ? binMeans(x, r, edges, spec.logX) : { x: plainArray(x), r: plainArray(r) };
    return { fit: d.name, color: fitColor(d.name), ...s };
  });
  const responses = new Set(fits.map((d) => d.fit.responseText));
  const label = fits.every((d) => d.plain)
    ? `residual${yc.unit ? ` (${yc.unit})` : ""}`
    : responses.size === 1
    ? `residual of ${[...responses][0]}`
    : "residual (each fit's own scale)";
  return { label, binned, series };
}

/**
 * A fit's x (its predictor, or the table's x on its rows for a constant
 * model) and residuals, the rows with both finite (x positive on a log x
 * axis): the fit's own arrays when every row is kept, as on most updates.
 */
function residualRows(d: DrawnFit, xc: NumberColumn, table: Table, logX: boolean) {
  let xs: ArrayLike<number> = d.fit.columns[0];
  if (xs === undefined) {
    const index = new Map(Array.from(table.rows, (row, i) => [row, i]));
    xs = Array.from(d.fit.rows, (row) => xc.values[index.get(row) ?? -1] ?? NaN);
  }
  const res = d.fit.residuals;
  const kept = (i: number) =>
    Number.isFinite(xs[i]) && Number.isFinite(res[i]) && !(logX && xs[i] <= 0);
  let count = 0;
  for (let i = 0; i < res.length; i++) if (kept(i)) count++;
  if (count === res.length && xs.length === res.length) return { x: xs, r: res };
  const [x, r] = keptRows(xs, res, count, kept);
  return { x, r };
}

function axis(column: string, unit: string | null, log: boolean, domain: [number, number]) {
  const label = unit ? `${column} (${unit})` : column;
  return { column, unit, label, log, domain } satisfies ChartAxis;
}

function extent(values: ArrayLike<number>): [number, number] {
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return [lo, hi];
}

/** The smallest and largest value over several arrays, nulls skipped. */
function extentOfAll(arrays: ArrayLike<number | null>[]): [number, number] {
  let lo = Infinity, hi = -Infinity;
  for (const a of arrays) {
    for (let i = 0; i < a.length; i++) {
      const v = a[i];
      if (v === null) continue;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  return [lo, hi];
}

function finiteOrNull(values: Float64Array, positive: boolean): (number | null)[] {
  const out = new Array<number | null>(values.length);
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    out[i] = Number.isFinite(v) && (!positive || v > 0) ? v : null;
  }
  return out;
}
