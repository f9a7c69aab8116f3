/**
 * The `chart` cell kind: a table's rows with fitted curves, a confidence
 * band of the mean and an optional residual panel, all computed in the
 * worker; more than `bin_above` rows (about 5,000) are drawn as a 2-D
 * density. Options are described in `spec.ts`; the data shape in
 * `ui/charts/chart_data.ts`.
 *
 * ```chart overview
 * on: cycles
 * x: cycle
 * y: capacity
 * fits: [line, root]
 * band: root
 * ```
 *
 * @example
 * ```ts
 * import { chartKind } from "./mod.ts";
 * if (chartKind.kind !== "chart" || chartKind.output !== "Chart") throw new Error("unexpected");
 * ```
 *
 * @module
 */
import type { CellKind } from "../../kernel/contract/mod.ts";
import type { ChartData } from "../shared/chart_data.ts";
import { CHART_OPTIONS, type ChartSpec, parseChartSpec } from "./spec.ts";
import { type ChartOutput, runChart } from "./run.ts";
import { summarizeChart } from "./result.ts";
import type { TemplateContext } from "../../kernel/contract/mod.ts";
import { cellsOf, fitColumns, numberColumns, tableFor, tableOf } from "../shared/template_cells.ts";

export type { ChartSpec } from "./spec.ts";
export type { ChartOutput } from "./run.ts";
export { CHART_OPTIONS, DEFAULT_BIN_ABOVE } from "./spec.ts";

/** The `chart` kind record. */
export const chartKind: CellKind<ChartSpec, ChartOutput, ChartData> = {
  kind: "chart",
  body: "yaml",
  output: "Chart",
  description: "draws a table's rows with fitted curves, a confidence band and residuals",
  parse: parseChartSpec,
  inputs: (spec) => [
    { name: spec.on, accepts: ["Table"], path: ["on"] },
    ...spec.fits.map((f, i) => ({ name: f, accepts: ["Fit"] as const, path: ["fits", i] })),
    ...(spec.band !== null && !spec.fits.includes(spec.band)
      ? [{ name: spec.band, accepts: ["Fit"] as const, path: ["band"] }]
      : []),
  ],
  run: runChart,
  summary: (out) => summarizeChart(out),
  line: (r) =>
    `${r.y.column} against ${r.x.column} · ${
      r.binned ? `${r.rows} rows binned` : `${r.points} points`
    } · ${r.curves.length} ${r.curves.length === 1 ? "curve" : "curves"}${
      (r.bands ?? []).length > 0
        ? ` · ${r.bands.map((b) => b.label).join("; ")}`
        : r.band
        ? ` · band ${r.band.fit}`
        : ""
    }`,
  options: CHART_OPTIONS,
  template: chartTemplate,
};

/** A new chart: the last fit's table, its predictor across, its response up, the fit drawn. */
function chartTemplate(ctx: TemplateContext): string {
  const fit = cellsOf(ctx, "Fit").at(-1);
  const table = (fit && tableOf(ctx, fit)) ?? tableFor(ctx, 2);
  const cols = numberColumns(table);
  const own = fit ? fitColumns(ctx, fit) : { response: null, predictors: [] };
  const x = own.predictors[0] ?? cols[0] ?? "x";
  const y = own.response !== null && cols.includes(own.response)
    ? own.response
    : cols.find((c) => c !== x) ?? "y";
  const fits = fit && tableOf(ctx, fit) === table ? `fits: [${fit.name}]\n` : "";
  return `on: ${table?.name ?? "table1"}\nx: ${x}\ny: ${y}\n${fits}`;
}
