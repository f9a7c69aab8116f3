/**
 * The check figure's panels about single rows: residuals in row order
 * (independence) and the rows that steer the fit (leverage, studentized
 * residual and Cook's distance, against the thresholds the findings use).
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import { fisherF } from "../../kernel/stats/mod.ts";
import { fitColor, INK } from "../shared/palette.ts";
import { formatNumber, formatP } from "../shared/format.ts";
import { referenceX, referenceY } from "../../ui/charts/_style.ts";
import {
  cells,
  drawPoints,
  type FigureInput,
  flaggedRows,
  panel,
  points,
  unitLabel,
} from "./_figure_parts.ts";
import type { CheckPanel } from "./residual_charts.ts";

/** Do neighbouring rows agree? Residuals in row order, joined; null above DENSE_ROWS (counted). */
export function orderPanel(r: FigureInput, document: Document): CheckPanel | null {
  if (r.density) return null;
  const p = points(r.residuals.map((_, i) => r.rows?.[i] ?? i + 1), r.residuals);
  if (p.length > 5000 || p.length === 0) return null;
  const drawn = drawPoints(p, new Set(), r);
  const join = Plot.line(p, {
    x: (d: number[]) => d[0],
    y: (d: number[]) => d[1],
    stroke: fitColor(r.fit),
    strokeWidth: 0.8,
    strokeOpacity: 0.7,
    ariaDescription: "residuals joined in row order",
  });
  const dw = r.durbin_watson_test, runs = r.runs;
  const a = r.significance ?? 0.05;
  const pDw = dw ? Math.min(dw.p_value, dw.p_value_negative) : null;
  const dwFlag = pDw !== null && pDw < a, runsFlag = !!runs && runs.p_value < a;
  const flagged = dwFlag || runsFlag;
  const note = runs && (runsFlag || !dwFlag)
    ? `${runs.runs} sign runs, ${formatNumber(runs.expected, 3)} expected: p = ${
      formatP(runs.p_value)
    }${runsFlag ? ", a finding" : ""}`
    : r.durbin_watson != null
    ? `Durbin–Watson d = ${formatNumber(r.durbin_watson, 3)}: p = ${formatP(pDw)}${
      dwFlag ? ", a finding" : ""
    }`
    : null;
  const svg = panel(
    document,
    r.rows ? "row of the table" : "used row",
    unitLabel("residual", r.sigma_unit),
    drawn,
    [
      ...referenceY(0, "", false, "zero residual"),
      join,
    ],
  );
  return { title: "Do neighbouring rows agree?", note, flagged, svg };
}

/**
 * Does any row steer the fit? Studentized residual against leverage, the
 * check's thresholds drawn (leverage 2p/n, residual ±3), each ring's area
 * in proportion to the row's Cook's distance, the rows findings name filled
 * and numbered; the note states the Cook's distance rule.
 */
export function influencePanel(r: FigureInput, document: Document): CheckPanel {
  const pts = r.density ? [] : points(r.leverage, r.studentized_internal);
  const trace = r.density?.trace ?? r.leverage.reduce<number>((s, h) => s + (h ?? 0), 0);
  const p = r.p ?? Math.round(trace);
  const n = r.n ?? r.leverage?.length ?? 0;
  const cut = 2 * p / n;
  const flags = flaggedRows(r, [
    "influential",
    "high-leverage",
    "outlier",
    "determined-by-one-row",
  ]);
  const drawn = r.density ? cells(r.density.leverage) : drawPoints(pts, flags, r);
  const hMax = Math.min(
    1,
    Math.max(cut * 1.3, r.density?.hMax ?? 0, ...pts.map((d) => d[0])) * 1.08,
  );
  const rMax = Math.max(3.4, r.density?.rMax ?? 0, ...pts.map((d) => Math.abs(d[1]))) * 1.08;
  const sized: Plot.Markish[] = drawn.dense ? [] : [Plot.dot(pts, {
    x: (d: number[]) => d[0],
    y: (d: number[]) => d[1],
    r: (d: number[]) => Math.sqrt(Math.max(0, r.cooks_distance[d[2]] ?? 0)),
    stroke: INK,
    strokeOpacity: 0.35,
    ariaDescription: "ring area in proportion to Cook's distance",
  })];
  const marks = [
    ...(cut < hMax ? referenceX(cut, `2p/n = ${formatNumber(cut, 2)}`) : []),
    ...referenceY(3, "+3", true),
    ...referenceY(-3, "−3", true),
    ...sized,
  ];
  const median = n > p ? fisherF(p, n - p).quantile(0.5) : null;
  const infl = (r.findings ?? []).find((f) => f.code === "influential");
  const rule = median === null
    ? null
    : `Cook's D above ${formatNumber(Math.max(4 / n, median), 3)}`;
  const note = rule &&
    (infl ? `${rule}: rows ${infl.rows.slice(0, 5).join(", ")}` : `${rule}: no row`);
  const svg = panel(document, "leverage", "studentized residual", drawn, marks, {
    x: { domain: [0, hMax], nice: false },
    y: { domain: [-rMax, rMax], nice: false },
  });
  return { title: "Does any row steer the fit?", note, flagged: infl !== undefined, svg };
}
