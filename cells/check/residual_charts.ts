/**
 * The check's residual figure: one panel for each question the check asks
 * of the residuals, titled by that question, with the test that answers it
 * and its verdict written under the title, the thresholds drawn as the
 * findings state them and the rows a finding names filled and numbered.
 *
 * ```
 *  ┌ Is a trend left? ───────┬ Does the scatter change? ┐  residual, |studentized|
 *  │ residual vs fitted      │ |r| vs fitted, line at 3 │  against fitted, each with
 *  │ + mean of each group    │ + mean of each group     │  the mean of groups of rows
 *  ├ Near normal? ───────────┼ Neighbours alike? ───────┤
 *  │ sorted r vs normal      │ residual in row order    │
 *  │ quantile, 95% band      │ (up to DENSE_ROWS rows)  │
 *  ├ Does a row steer? ──────┴──────────────────────────┘
 *  │ r vs leverage: lines at 2p/n and ±3, ring area ∝ Cook's D
 * ```
 *
 * Quantile plot: sorted internally studentized residuals against standard
 * normal quantiles at Blom's positions (i − 3/8)/(n + 1/4) (Blom 1958,
 * *Statistical Estimates and Transformed Beta-Variables*; from memory), with
 * a pointwise 95% band z ± 1.96·√(P(1 − P)/n)/φ(z) for the i-th order
 * statistic (Fox 2008, *Applied Regression Analysis*, 2nd ed., §3.1.3; from
 * memory). Above DENSE_ROWS rows the panels draw counted cells
 * (`density.ts`) and the row-order panel is left out.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import { standardNormal } from "../../kernel/stats/mod.ts";
import { fitColor, FLAG_INK, INK } from "../shared/palette.ts";
import { formatP } from "../shared/format.ts";
import { gridPanels } from "../../ui/charts/_svg.ts";
import { referenceY } from "../../ui/charts/_style.ts";
import { influencePanel, orderPanel } from "./_row_panels.ts";
import { DENSE_ROWS, quantileDensity } from "./density.ts";
import {
  cells,
  drawPoints,
  type FigureInput,
  flaggedRows,
  groupMeans,
  meanLine,
  PANEL,
  panel,
  points,
  unitLabel,
} from "./_figure_parts.ts";

export { type CheckChartInput, type CheckDensity, checkDensity, DENSE_ROWS } from "./density.ts";
export type { FigureInput } from "./_figure_parts.ts";

/** A panel with its question and what the check says on it. */
export interface CheckPanel {
  title: string;
  note: string | null;
  flagged: boolean;
  svg: SVGSVGElement;
}

/** "test: p = 0.41", and whether that p is under the check's significance level. */
function verdict(name: string, p: number | null | undefined, r: FigureInput): [string, boolean] {
  if (p === null || p === undefined) return [`${name}: not computed`, false];
  const a = r.significance ?? 0.05;
  return [`${name}: p = ${formatP(p)}${p < a ? ` < ${a}, a finding` : ""}`, p < a];
}

/** Is a trend left in the residuals? Residual against fitted with the mean of each group. */
export function trendPanel(r: FigureInput, document: Document): CheckPanel {
  const u = r.sigma_unit;
  const p = r.density ? [] : points(r.fitted, r.residuals);
  const drawn = r.density
    ? cells(r.density.residuals)
    : drawPoints(p, flaggedRows(r, ["outlier"]), r);
  const [note, flagged] = r.lack_of_fit
    ? verdict("lack of fit against replicates", r.lack_of_fit.p_value, r)
    : verdict("curvature test (RESET)", r.reset?.p_value, r);
  const marks = [
    ...referenceY(0, "", false, "zero residual"),
    ...meanLine(p.length > DENSE_ROWS ? [] : groupMeans(p), fitColor(r.fit)),
  ];
  const svg = panel(document, unitLabel("fitted", u), unitLabel("residual", u), drawn, marks);
  return { title: "Is a trend left in the residuals?", note, flagged, svg };
}

/** Does the scatter change with the level? |studentized residual| against fitted. */
export function spreadPanel(r: FigureInput, document: Document): CheckPanel {
  const p = r.density
    ? []
    : points(r.fitted, r.studentized_internal.map((v) => v === null ? null : Math.abs(v)));
  const drawn = r.density ? cells(r.density.scale) : drawPoints(p, flaggedRows(r, ["outlier"]), r);
  const [note, flagged] = verdict(
    `constant variance (Breusch–Pagan, ${r.breusch_pagan?.variant ?? "koenker"})`,
    r.breusch_pagan?.p_value,
    r,
  );
  const marks = [
    ...referenceY(3, "3: outlier beyond", true),
    ...meanLine(p.length > DENSE_ROWS ? [] : groupMeans(p), fitColor(r.fit)),
  ];
  const svg = panel(
    document,
    unitLabel("fitted", r.sigma_unit),
    "|studentized residual|",
    drawn,
    marks,
    {
      y: drawn.dense
        ? {}
        : { domain: [0, Math.max(3.4, ...p.map((d) => d[1] * 1.05))], nice: false },
    },
  );
  return { title: "Does the scatter change with the level?", note, flagged, svg };
}

/** Are the residuals near normal? Sorted studentized residuals against normal quantiles. */
export function normalPanel(r: FigureInput, document: Document): CheckPanel {
  const s = (r.density ? [] : r.studentized_internal)
    .filter((v): v is number => v !== null && Number.isFinite(v))
    .sort((a, b) => a - b);
  const n = s.length;
  const position = (i: number) => (i + 1 - 0.375) / (n + 0.25);
  const z = Array.from({ length: n }, (_, i) => standardNormal.quantile(position(i)));
  const drawn = r.density
    ? cells(r.density.quantiles)
    : n > DENSE_ROWS
    ? cells(quantileDensity(s, z[0], z[n - 1], position))
    : drawPoints(s.map((v, i) => [z[i], v, -1]), new Set(), r);
  const band = n > DENSE_ROWS ? [] : z.map((q, i) => {
    const half = 1.96 * Math.sqrt(position(i) * (1 - position(i)) / n) /
      (Math.exp(-q * q / 2) / Math.sqrt(2 * Math.PI));
    return [q, q - half, q + half];
  });
  const ends = r.density?.line ??
    (n ? [Math.min(z[0], s[0]), Math.max(z[n - 1], s[n - 1])] : [0, 1]);
  const marks: Plot.Markish[] = [
    Plot.areaY(band, {
      x: (d: number[]) => d[0],
      y1: (d: number[]) => d[1],
      y2: (d: number[]) => d[2],
      fill: INK,
      fillOpacity: 0.1,
      ariaDescription: "95% band of a normal sample",
    }),
    Plot.line([[ends[0], ends[0]], [ends[1], ends[1]]], {
      stroke: INK,
      strokeDasharray: "1,2",
      ariaDescription: "1:1 line",
    }),
  ];
  const [note, flagged] = verdict("normality (Shapiro–Wilk)", r.shapiro_wilk?.p_value, r);
  const svg = panel(document, "normal quantile", "studentized residual", drawn, marks);
  return { title: "Are the residuals near normal?", note, flagged, svg };
}

/**
 * Every panel of the check's figure, in reading order.
 *
 * @param r The check result (or its page copy).
 * @param document The DOM document (the browser's, or linkedom's).
 * @returns The panels, each with its question and note.
 */
export function checkPanels(r: FigureInput, document: Document): CheckPanel[] {
  const order = orderPanel(r, document);
  return [
    trendPanel(r, document),
    spreadPanel(r, document),
    normalPanel(r, document),
    ...(order ? [order] : []),
    influencePanel(r, document),
  ];
}

/**
 * The check's residual figure: its panels two to a row under one heading.
 *
 * @param r The check result (or its page copy).
 * @param document The DOM document.
 * @returns The `<svg>` element (not attached).
 */
export function checkFigure(r: FigureInput, document: Document): SVGSVGElement {
  const panels = checkPanels(r, document);
  const counted = r.density !== undefined || (r.fitted?.length ?? 0) > DENSE_ROWS;
  const dense = counted
    ? `; ${DENSE_ROWS.toLocaleString("en-US")}+ rows counted into cells (darker: more rows)`
    : "";
  return gridPanels(
    document,
    panels.map((p) => ({ panel: p.svg, title: p.title, note: p.note, flagged: p.flagged })),
    2,
    PANEL.width,
    {
      title: `Residuals of ${r.fit}`,
      note: `filled and numbered: rows a finding names${dense}`,
      label: `Residual figure of fit ${r.fit}`,
    },
    FLAG_INK,
  );
}

/**
 * The figure's panels as markup (for tests and the record).
 *
 * @param r The check result fields.
 * @param document The DOM document.
 * @returns One SVG string per panel.
 */
export function checkChartsSvg(r: FigureInput, document: Document): string[] {
  return checkPanels(r, document).map((p) => p.svg.outerHTML);
}
