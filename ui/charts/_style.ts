/**
 * Plumb's chart look, shared by every chart (the chart cell's, the check's
 * residual figure): the options each Plot call spreads in, and the marks
 * every chart draws the same way.
 *
 * - axis labels sit centred along their axis (the y label turned along it),
 *   with no arrows, the unit in parentheses;
 * - a faint grid across y only, no frame; ticks short, tick labels small;
 * - data as open rings in neutral ink, so curves and bands in fit colours
 *   read through them; flagged rows filled in the flag ink and numbered;
 * - reference lines thin and dashed, each named by a word at its end.
 *
 * Our own design (DESIGN.md §7a asks units on axes and colour never alone).
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import { FLAG_INK, INK } from "../../cells/shared/palette.ts";

/** Font size of tick labels and words on a chart, px. */
export const SMALL_TEXT = 10;

/**
 * An axis of ours: label centred along the axis, no arrow.
 *
 * @param label The label, unit in parentheses.
 * @param extra Further Plot scale options (type, domain, nice).
 * @returns Plot scale options.
 */
export function axisX(label: string, extra: Record<string, unknown> = {}): Plot.ScaleOptions {
  return {
    label,
    labelAnchor: "center",
    labelArrow: "none",
    labelOffset: 32,
    tickSize: 3,
    ticks: 6,
    ...extra,
  } as Plot.ScaleOptions;
}

/**
 * The y axis of ours: label turned along the axis and centred, faint grid, no arrow.
 *
 * @param label The label, unit in parentheses.
 * @param extra Further Plot scale options.
 * @returns Plot scale options.
 */
export function axisY(label: string, extra: Record<string, unknown> = {}): Plot.ScaleOptions {
  return {
    label,
    labelAnchor: "center",
    labelArrow: "none",
    labelOffset: 52,
    tickSize: 0,
    ticks: 5,
    grid: true,
    ...extra,
  } as Plot.ScaleOptions;
}

/** Options every Plot call of ours shares (font size, grid colour, class). */
export const PLOT_BASE = {
  className: "plumb-plot",
  style: { fontSize: `${SMALL_TEXT}px`, color: INK, overflow: "visible" },
} as const;

/**
 * Data as open rings.
 *
 * @param x x values.
 * @param y y values.
 * @param what Accessible description.
 * @param color Ring colour (default the neutral ink).
 * @returns The mark.
 */
export function rings(x: number[], y: number[], what: string, color: string = INK): Plot.Markish {
  return Plot.dot(x, {
    x,
    y,
    r: 2.4,
    stroke: color,
    strokeWidth: 1,
    fill: "white",
    ariaDescription: what,
  });
}

/**
 * A reference line across the panel, dashed, with its word at the right end.
 *
 * @param value The y value.
 * @param word What the line means, as the check states it ("" draws the line alone).
 * @param flag True for a threshold a finding is read against (flag ink), else faint ink.
 * @returns Marks: the rule and its word.
 */
export function referenceY(
  value: number,
  word: string,
  flag = false,
  ariaDescription = word,
): Plot.Markish[] {
  const stroke = flag ? FLAG_INK : INK;
  return [
    Plot.ruleY([value], {
      stroke,
      strokeWidth: 1,
      strokeDasharray: flag ? "5,3" : "1,2",
      ariaDescription,
    }),
    ...(word === "" ? [] : [Plot.text([word], {
      frameAnchor: "right",
      y: [value],
      text: [word],
      fill: stroke,
      dy: -6,
      textAnchor: "end",
      fontSize: SMALL_TEXT - 1,
    })]),
  ];
}

/**
 * The vertical counterpart of {@link referenceY}: a threshold on x, its word at the top.
 *
 * @param value The x value.
 * @param word What the line means.
 * @returns Marks: the rule and its word.
 */
export function referenceX(value: number, word: string): Plot.Markish[] {
  return [
    Plot.ruleX([value], { stroke: FLAG_INK, strokeDasharray: "5,3", ariaDescription: word }),
    Plot.text([word], {
      frameAnchor: "top",
      x: [value],
      text: [word],
      fill: FLAG_INK,
      dx: 4,
      dy: 2,
      textAnchor: "start",
      fontSize: SMALL_TEXT - 1,
    }),
  ];
}
