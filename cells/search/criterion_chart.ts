/**
 * The search's chart: the criterion of the models it kept against the
 * number of candidates they hold, drawn with Observable Plot in Plumb's
 * chart look (ui/charts/_style.ts). The best model of each size is a ring
 * on a thin line through the sizes; the others kept are faint small rings
 * above (or, for adjusted R², below) it; the best overall is filled and
 * named.
 *
 * ```
 *  BIC ┤ ∘
 *      │  ○                 ∘ ∘
 *      │   ○┄┄       ┄┄┄○┄┄┄○     ○ best of its size   ∘ others kept
 *      │      ┄●┄┄○┄┄           ● best overall
 *      └──────────────────────────
 *        0   2   4   6   8   candidates in the model
 * ```
 *
 * Pure function of the result: the live page draws it with the browser's
 * document, the static record with linkedom's.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import { INK } from "../shared/palette.ts";
import { stackPanels } from "../../ui/charts/_svg.ts";
import { axisX, axisY, PLOT_BASE, rings, SMALL_TEXT } from "../../ui/charts/_style.ts";
import type { SearchResult } from "./result.ts";

/** Size of the chart, px. */
export const CRITERION_CHART_SIZE = { width: 420, height: 220 } as const;

/**
 * Draws the criterion against subset size.
 *
 * @param r The search result.
 * @param document The DOM document to build with (the browser's, or linkedom's).
 * @returns The `<svg>` element (not attached).
 * @example
 * ```ts
 * import { renderCriterionChart } from "./criterion_chart.ts";
 * import { chartDocument } from "../../ui/charts/mod.ts";
 * const m = (size: number, criterion: number) => ({ size, criterion, chosen: [], predictors: [] });
 * const r = { criterion: "BIC", response_unit: null, by: "bic",
 *   sizes: [{ size: 0, best: [m(0, 20)] }, { size: 1, best: [m(1, 12), m(1, 15)] }],
 *   best: [m(1, 12)] } as never;
 * const svg = renderCriterionChart(r, chartDocument());
 * if (!svg.outerHTML.includes("candidates in the model")) throw new Error(svg.outerHTML);
 * ```
 */
export function renderCriterionChart(r: SearchResult, document: Document): SVGSVGElement {
  const kept = r.sizes.flatMap((s) =>
    s.best.flatMap((m, i) => m.criterion === null ? [] : [{ size: s.size, value: m.criterion, i }])
  );
  const firsts = kept.filter((p) => p.i === 0);
  const others = kept.filter((p) => p.i > 0);
  const best = r.best[0];
  const marks: Plot.Markish[] = [
    Plot.dot(others, {
      x: "size",
      y: "value",
      r: 1.6,
      stroke: INK,
      strokeOpacity: 0.4,
      fill: "none",
      ariaDescription: "other models kept",
    }),
    Plot.line(firsts, { x: "size", y: "value", stroke: INK, strokeWidth: 1, strokeOpacity: 0.5 }),
    rings(firsts.map((p) => p.size), firsts.map((p) => p.value), "best of its size"),
  ];
  if (best !== undefined && best.criterion !== null) {
    const at = { x: [best.size], y: [best.criterion] };
    marks.push(
      Plot.dot([0], { ...at, r: 3.2, fill: INK, ariaDescription: "best overall" }),
      Plot.text([0], {
        ...at,
        text: ["best"],
        dy: r.larger_is_better ? 10 : -10,
        fill: INK,
        fontSize: SMALL_TEXT,
      }),
    );
  }
  const sizes = r.sizes.map((s) => s.size);
  const label = r.by === "loo" && r.response_unit
    ? `${r.criterion} (${r.response_unit})`
    : r.criterion;
  const panel = Plot.plot({
    document,
    ...PLOT_BASE,
    width: CRITERION_CHART_SIZE.width,
    height: CRITERION_CHART_SIZE.height,
    marginLeft: 64,
    marginRight: 16,
    marginTop: 14,
    marginBottom: 40,
    x: axisX("candidates in the model", {
      type: "linear",
      ticks: sizes.length <= 13 ? sizes : 8,
      tickFormat: "d",
      inset: 10,
    }),
    y: axisY(label, { ticks: 4, nice: true }),
    marks,
  });
  return stackPanels(document, [panel], CRITERION_CHART_SIZE.width, {
    label: `${r.criterion} of the best models by number of candidates`,
  });
}
