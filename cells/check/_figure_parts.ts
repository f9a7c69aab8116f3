/**
 * Pieces of the check's residual figure: the fields it reads, a panel in
 * Plumb's chart look, points (dots or counted cells), the rows a finding
 * names (filled and numbered) and the running mean that shows a trend.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import { FLAG_INK } from "../shared/palette.ts";
import { densityRect } from "../../ui/charts/_density.ts";
import { axisX, axisY, PLOT_BASE, rings, SMALL_TEXT } from "../../ui/charts/_style.ts";
import { density, densityDomains } from "../shared/density.ts";
import { type CheckChartInput, DENSE_ROWS } from "./density.ts";
import type { CheckResult } from "./result.ts";
import type { ChartBins } from "../shared/chart_data.ts";

/** What the figure reads: the chart arrays (or their counts) and, when given, the tests and findings. */
export type FigureInput =
  & CheckChartInput
  & Partial<
    Pick<
      CheckResult,
      | "n"
      | "p"
      | "rows"
      | "sigma_unit"
      | "findings"
      | "significance"
      | "reset"
      | "lack_of_fit"
      | "breusch_pagan"
      | "shapiro_wilk"
      | "durbin_watson"
      | "durbin_watson_test"
      | "runs"
    >
  >;

/** Size of one panel of the figure, px. */
export const PANEL = { width: 330, height: 220 } as const;

/** At most this many flagged rows are numbered in one panel (the largest first). */
const NAMED = 8;

/** x, y and the index of the used row each point comes from. */
export type Point = [number, number, number];

/** Points where both values are finite. */
export function points(a: (number | null)[], b: (number | null)[]): Point[] {
  const out: Point[] = [];
  for (let i = 0; i < Math.min(a.length, b.length); i++) {
    const x = a[i], y = b[i];
    if (x !== null && y !== null && Number.isFinite(x) && Number.isFinite(y)) out.push([x, y, i]);
  }
  return out;
}

/** The points' marks, and for counted cells the extents the panel's scales must cover. */
export interface Drawn {
  marks: Plot.Markish[];
  domains: { x: [number, number]; y: [number, number] } | null;
  dense: boolean;
}

/** Counted cells for a drawn set. */
export function cells(b: ChartBins): Drawn {
  return { marks: [densityRect(b)], domains: densityDomains(b), dense: true };
}

/** Open rings (or counted cells above DENSE_ROWS), flagged rows filled and numbered. */
export function drawPoints(p: Point[], flagged: Set<number>, r: FigureInput): Drawn {
  if (p.length > DENSE_ROWS) return cells(density(p.map((d) => d[0]), p.map((d) => d[1])));
  const x = p.map((d) => d[0]), y = p.map((d) => d[1]);
  const marks: Plot.Markish[] = [rings(x, y, "rows")];
  const hit = p.filter((d) => flagged.has(d[2]))
    .sort((a, b) => Math.abs(b[1]) - Math.abs(a[1])).slice(0, NAMED);
  if (hit.length > 0) {
    marks.push(Plot.dot(hit, {
      x: (d: Point) => d[0],
      y: (d: Point) => d[1],
      r: 3,
      fill: FLAG_INK,
      ariaDescription: "rows a finding names",
    }));
    marks.push(Plot.text(hit, {
      x: (d: Point) => d[0],
      y: (d: Point) => d[1],
      text: (d: Point) => String(r.rows?.[d[2]] ?? d[2] + 1),
      fill: FLAG_INK,
      dx: 6,
      textAnchor: "start",
      fontSize: SMALL_TEXT,
    }));
  }
  return { marks, domains: null, dense: false };
}

/** Indices of the used rows that the findings with these codes name. */
export function flaggedRows(r: FigureInput, codes: string[]): Set<number> {
  const named = new Set<number>();
  for (const f of r.findings ?? []) if (codes.includes(f.code)) f.rows.forEach((x) => named.add(x));
  const out = new Set<number>();
  (r.rows ?? []).forEach((row, i) => named.has(row) && out.add(i));
  return out;
}

/**
 * The mean of y in consecutive groups of equal count along x: a trend the
 * eye would otherwise have to find in the scatter (our choice: about eight
 * rows a group, 3 to 12 groups).
 */
export function groupMeans(p: Point[]): [number, number][] {
  const s = [...p].sort((a, b) => a[0] - b[0]);
  const k = Math.max(3, Math.min(12, Math.round(s.length / 8)));
  if (s.length < 2 * k) return [];
  const out: [number, number][] = [];
  for (let g = 0; g < k; g++) {
    const part = s.slice(Math.floor((g * s.length) / k), Math.floor(((g + 1) * s.length) / k));
    const mean = (j: 0 | 1) => part.reduce((a, d) => a + d[j], 0) / part.length;
    out.push([mean(0), mean(1)]);
  }
  return out;
}

/** The running mean as a line in the fit's colour. */
export function meanLine(m: [number, number][], color: string): Plot.Markish[] {
  if (m.length === 0) return [];
  return [Plot.line(m, {
    x: (d: [number, number]) => d[0],
    y: (d: [number, number]) => d[1],
    stroke: color,
    strokeWidth: 2,
    curve: "monotone-x",
    ariaDescription: "mean of each group of rows along x",
  })];
}

/** A label with its unit in parentheses. */
export function unitLabel(name: string, unit: string | null | undefined): string {
  return unit ? `${name} (${unit})` : name;
}

/** One panel in Plumb's look. */
export function panel(
  document: Document,
  xLabel: string,
  yLabel: string,
  drawn: Drawn,
  marks: Plot.Markish[],
  scales: { x?: Record<string, unknown>; y?: Record<string, unknown> } = {},
): SVGSVGElement {
  const d = drawn.domains;
  return Plot.plot({
    document,
    ...PLOT_BASE,
    ...PANEL,
    marginLeft: 64,
    marginBottom: 42,
    marginRight: 14,
    marginTop: 10,
    x: axisX(xLabel, { nice: true, ticks: 5, ...(d ? { domain: d.x } : {}), ...scales.x }),
    y: axisY(yLabel, { nice: true, ...(d ? { domain: d.y } : {}), ...scales.y }),
    color: { range: ["#e4e4e4", "#262626"] },
    marks: [...marks, ...drawn.marks],
  }) as SVGSVGElement;
}
