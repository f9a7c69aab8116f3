/**
 * The four standard residual charts of a `check` cell, drawn from the
 * RUN-JSON `check` result fields, in the shared chart style:
 *
 * 1. residuals against fitted values, with the zero line;
 * 2. normal quantile plot of the internally studentized residuals against
 *    standard normal quantiles at Blom's plotting positions
 *    (i − 3/8)/(n + 1/4) (Blom 1958, *Statistical Estimates and Transformed
 *    Beta-Variables*; from memory), with the 1:1 line;
 * 3. scale–location: √|studentized residual| against fitted values;
 * 4. leverage against studentized residual, with contours of Cook's
 *    distance D at 0.5 and 1: D = r²·h / (p(1 − h)) (Cook 1977,
 *    *Technometrics* 19, 15–18), so r = ±√(D·p·(1 − h)/h); p = Σhᵢ, the
 *    trace of the hat matrix (common practice, no source).
 *
 * More than {@link DENSE_ROWS} rows are drawn as 2-D counts on a grid of
 * equal cells (`_density.ts`) rather than one dot per row; the quantile
 * plot then finds each row's column from the normal CDF at the column edges
 * (the plotting positions are increasing), without a quantile per row. Null entries (undefined values,
 * e.g. at leverage 1) are left out.
 *
 * @module
 */
import * as Plot from "@observablehq/plot";
import { standardNormal } from "../../kernel/stats/mod.ts";
import { fitColor, INK } from "./palette.ts";
import { stackPanels } from "./_svg.ts";
import {
  cellEdges,
  cellOf,
  density,
  DENSITY_GRID,
  densityDomains,
  densityRect,
  max,
} from "./_density.ts";
import { countCells } from "./count_cells.ts";
import type { ChartBins } from "./chart_data.ts";

/** The `check` result fields these charts read (RUN-JSON `check`). */
export interface CheckChartInput {
  /** The fit's name: its colour and the charts' titles. */
  fit: string;
  fitted: (number | null)[];
  residuals: (number | null)[];
  studentized_internal: (number | null)[];
  leverage: (number | null)[];
  cooks_distance: (number | null)[];
  /**
   * The four charts already counted ({@link checkDensity}): the live page's
   * copy of a large check carries this instead of the per-row arrays.
   */
  density?: CheckDensity;
}

/** The four residual charts of a large check, counted into cells. */
export interface CheckDensity {
  residuals: ChartBins;
  quantiles: ChartBins;
  scale: ChartBins;
  leverage: ChartBins;
  /** Ends of the quantile plot's 1:1 line. */
  line: [number, number];
  /** Σhᵢ, the trace of the hat matrix (p), for Cook's distance contours. */
  trace: number;
  /** Largest leverage and largest |studentized residual| drawn. */
  hMax: number;
  rMax: number;
}

/** Rows above which the residual charts draw counts instead of dots. */
export const DENSE_ROWS = 5000;

const SIZE = { width: 320, height: 260 } as const;

type Pair = [number, number];

function pairs(a: (number | null)[], b: (number | null)[]): Pair[] {
  const out: Pair[] = [];
  for (let i = 0; i < Math.min(a.length, b.length); i++) {
    const x = a[i], y = b[i];
    if (x !== null && y !== null && Number.isFinite(x) && Number.isFinite(y)) out.push([x, y]);
  }
  return out;
}

/** The points' mark, and for a density the extents the chart's scales must cover. */
interface Scatter {
  mark: Plot.Markish;
  domains: { x: [number, number]; y: [number, number] } | null;
}

function scatter(p: Pair[], color: string): Scatter {
  if (p.length > DENSE_ROWS) return dense(density(p.map((d) => d[0]), p.map((d) => d[1])));
  return {
    mark: Plot.dot(p, { x: (d: Pair) => d[0], y: (d: Pair) => d[1], r: 2, fill: color }),
    domains: null,
  };
}

function dense(b: ChartBins): Scatter {
  return { mark: densityRect(b), domains: densityDomains(b) };
}

function panel(
  document: Document,
  title: string,
  x: string,
  y: string,
  marks: Plot.Markish[],
  points: Scatter,
  extra: Record<string, unknown> = {},
  note: string | null = null,
): SVGSVGElement {
  const d = points.domains;
  const svg = Plot.plot({
    document,
    className: "plumb-plot",
    ...SIZE,
    marginLeft: 52,
    x: { label: x, nice: true, ...(d ? { domain: d.x } : {}) },
    y: { label: y, grid: true, nice: true, ...(d ? { domain: d.y } : {}) },
    color: { range: ["#d9d9d9", "#262626"] },
    marks: [...marks, points.mark],
    ...extra,
  });
  return stackPanels(document, [svg], SIZE.width, { title, note, label: title });
}

/**
 * Residuals against fitted values, with the zero line.
 *
 * @param r The check result fields.
 * @param document The DOM document (the browser's, or linkedom's).
 * @returns The `<svg>` element (not attached).
 */
export function residualsVsFitted(r: CheckChartInput, document: Document): SVGSVGElement {
  return panel(
    document,
    `Residuals against fitted, ${r.fit}`,
    "fitted",
    "residual",
    [
      Plot.ruleY([0], { stroke: INK, ariaDescription: "zero residual" }),
    ],
    r.density ? dense(r.density.residuals) : scatter(pairs(r.fitted, r.residuals), fitColor(r.fit)),
  );
}

/**
 * Normal quantile plot of the studentized residuals, with the 1:1 line.
 *
 * @param r The check result fields.
 * @param document The DOM document.
 * @returns The `<svg>` element (not attached).
 */
export function normalQuantiles(r: CheckChartInput, document: Document): SVGSVGElement {
  const q = r.density ? null : quantileParts(r);
  const line = r.density?.line ?? q!.line;
  const points = r.density
    ? dense(r.density.quantiles)
    : q!.bins
    ? dense(q!.bins)
    : scatter(q!.pairs(), fitColor(r.fit));
  return panel(document, `Normal quantiles, ${r.fit}`, "normal quantile", "studentized residual", [
    Plot.line([[line[0], line[0]], [line[1], line[1]]], {
      stroke: INK,
      strokeDasharray: "4,3",
      ariaDescription: "1:1 line",
    }),
  ], points);
}

/** The quantile plot's 1:1 line, and its counted cells above DENSE_ROWS (else its points). */
function quantileParts(r: CheckChartInput) {
  const s = r.studentized_internal.filter((v): v is number => v !== null && Number.isFinite(v))
    .sort((a, b) => a - b);
  const n = s.length;
  const position = (i: number) => (i + 1 - 0.375) / (n + 0.25);
  const ends = n
    ? [standardNormal.quantile(position(0)), standardNormal.quantile(position(n - 1))]
    : [];
  const line: [number, number] = n
    ? [Math.min(ends[0], s[0]), Math.max(ends[1], s[n - 1])]
    : [0, 1];
  return {
    line,
    bins: n > DENSE_ROWS ? quantileDensity(s, ends[0], ends[1], position) : null,
    pairs: () => s.map((v, i): Pair => [standardNormal.quantile(position(i)), v]),
  };
}

/** Counts of the sorted values against their normal quantiles, columns found by the CDF. */
function quantileDensity(
  sorted: ArrayLike<number>,
  q0: number,
  q1: number,
  position: (i: number) => number,
): ChartBins {
  const xEdges = cellEdges(q0, q1, DENSITY_GRID.nx);
  const yEdges = cellEdges(sorted[0], sorted[sorted.length - 1], DENSITY_GRID.ny);
  const pEdges = xEdges.map((e) => standardNormal.cdf(e));
  const xc = new Int32Array(sorted.length), yc = new Int32Array(sorted.length);
  let k = 0;
  for (let i = 0; i < sorted.length; i++) {
    while (k < DENSITY_GRID.nx - 1 && position(i) >= pEdges[k + 1]) k++;
    xc[i] = k;
    yc[i] = cellOf(sorted[i], yEdges);
  }
  return countCells(xc, yc, xEdges, yEdges);
}

/**
 * Scale–location: √|studentized residual| against fitted values.
 *
 * @param r The check result fields.
 * @param document The DOM document.
 * @returns The `<svg>` element (not attached).
 */
export function scaleLocation(r: CheckChartInput, document: Document): SVGSVGElement {
  const points = r.density ? dense(r.density.scale) : scatter(scalePairs(r), fitColor(r.fit));
  return panel(document, `Scale–location, ${r.fit}`, "fitted", "√|studentized residual|", [
    Plot.ruleY([0], { stroke: INK, strokeOpacity: 0.4 }),
  ], points);
}

function scalePairs(r: CheckChartInput): Pair[] {
  return pairs(r.fitted, r.studentized_internal).map(([f, s]): Pair => [f, Math.sqrt(Math.abs(s))]);
}

/**
 * Studentized residual against leverage, with Cook's distance contours at 0.5 and 1.
 *
 * @param r The check result fields.
 * @param document The DOM document.
 * @returns The `<svg>` element (not attached).
 */
export function leverageChart(r: CheckChartInput, document: Document): SVGSVGElement {
  const d0 = r.density;
  const pts = d0 ? [] : pairs(r.leverage, r.studentized_internal);
  const p = d0?.trace ?? r.leverage.reduce<number>((a, h) => a + (h ?? 0), 0);
  const hMax = Math.min(0.999, Math.max(0.05, d0?.hMax ?? max(pts.map((d) => d[0]))) * 1.05);
  const contours: Plot.Markish[] = [];
  for (const d of [0.5, 1]) {
    for (const sign of [1, -1]) {
      const line = Array.from({ length: 60 }, (_, i): Pair => {
        const h = (hMax * (i + 1)) / 60;
        return [h, sign * Math.sqrt((d * p * (1 - h)) / h)];
      });
      contours.push(Plot.line(line, {
        x: (v: Pair) => v[0],
        y: (v: Pair) => v[1],
        stroke: INK,
        strokeDasharray: d === 1 ? "6,3" : "2,3",
        ariaDescription: `Cook's distance ${d}`,
      }));
    }
  }
  const rMax = Math.max(3, d0?.rMax ?? max(pts.map((d) => Math.abs(d[1])))) * 1.1;
  return panel(
    document,
    `Leverage, ${r.fit}`,
    "leverage",
    "studentized residual",
    [
      Plot.ruleY([0], { stroke: INK, strokeOpacity: 0.4 }),
      ...contours,
    ],
    d0 ? dense(d0.leverage) : scatter(pts, fitColor(r.fit)),
    {
      x: { label: "leverage", domain: [0, hMax] },
      y: { label: "studentized residual", grid: true, domain: [-rMax, rMax] },
      clip: true,
    },
    "dashed: Cook's distance 0.5 (short dashes) and 1 (long)",
  );
}

/**
 * All four residual charts as markup, in the standard order.
 *
 * @param r The check result fields.
 * @param document The DOM document.
 * @returns Four SVG strings: residuals vs fitted, normal quantiles, scale–location, leverage.
 */
export function checkChartsSvg(r: CheckChartInput, document: Document): string[] {
  return checkCharts(r, document).map((e) => e.outerHTML);
}

/**
 * All four residual charts as elements of `document`, in the standard order.
 *
 * @param r The check result fields.
 * @param document The DOM document.
 * @returns Four `<svg>` elements: residuals vs fitted, normal quantiles, scale–location, leverage.
 */
export function checkCharts(r: CheckChartInput, document: Document): SVGSVGElement[] {
  return [
    residualsVsFitted(r, document),
    normalQuantiles(r, document),
    scaleLocation(r, document),
    leverageChart(r, document),
  ];
}

/**
 * Counts the four charts' points once, for a check large enough that every
 * chart is drawn as a density (each with more than {@link DENSE_ROWS} points).
 * The server sends this to the page instead of five arrays of n values.
 *
 * @param r The check result fields.
 * @returns The counted charts, or null when some chart would draw dots.
 * @example
 * ```ts
 * import { checkDensity } from "./residual_charts.ts";
 * const few = { fit: "f", fitted: [1, 2], residuals: [0, 0], studentized_internal: [0, 0],
 *   leverage: [0.5, 0.5], cooks_distance: [0, 0] };
 * if (checkDensity(few) !== null) throw new Error("two rows draw dots");
 * ```
 */
export function checkDensity(r: CheckChartInput): CheckDensity | null {
  // Typed arrays and plain loops throughout: this runs in the compute worker
  // on every update of a large check (10,000 rows: about 2 ms, against 11 ms
  // with pairs of arrays and a comparator sort).
  const fitted = finitePairs(r.fitted, r.residuals);
  const scale = finitePairs(r.fitted, r.studentized_internal, (s) => Math.sqrt(Math.abs(s)));
  const lev = finitePairs(r.leverage, r.studentized_internal);
  if (fitted.n <= DENSE_ROWS || scale.n <= DENSE_ROWS || lev.n <= DENSE_ROWS) return null;
  const s = finiteSorted(r.studentized_internal);
  const n = s.length;
  if (n <= DENSE_ROWS) return null;
  const position = (i: number) => (i + 1 - 0.375) / (n + 0.25);
  const q0 = standardNormal.quantile(position(0)), q1 = standardNormal.quantile(position(n - 1));
  let trace = 0, hMax = -Infinity, rMax = -Infinity;
  for (const h of r.leverage) trace += h ?? 0;
  for (let i = 0; i < lev.n; i++) {
    if (lev.x[i] > hMax) hMax = lev.x[i];
    if (Math.abs(lev.y[i]) > rMax) rMax = Math.abs(lev.y[i]);
  }
  return {
    residuals: density(fitted.x, fitted.y),
    quantiles: quantileDensity(s, q0, q1, position),
    scale: density(scale.x, scale.y),
    leverage: density(lev.x, lev.y),
    line: [Math.min(q0, s[0]), Math.max(q1, s[n - 1])],
    trace,
    hMax,
    rMax,
  };
}

/** The rows where both values are finite, as two typed arrays (y through `f` when given). */
function finitePairs(
  a: (number | null)[],
  b: (number | null)[],
  f?: (v: number) => number,
): { x: Float64Array; y: Float64Array; n: number } {
  const m = Math.min(a.length, b.length);
  const x = new Float64Array(m), y = new Float64Array(m);
  let n = 0;
  for (let i = 0; i < m; i++) {
    const u = a[i], v = b[i];
    if (u === null || v === null || !Number.isFinite(u) || !Number.isFinite(v)) continue;
    x[n] = u;
    y[n++] = f ? f(v) : v;
  }
  return { x: x.subarray(0, n), y: y.subarray(0, n), n };
}

/** The finite values, sorted ascending (a typed array sorts numerically without a comparator). */
function finiteSorted(a: (number | null)[]): Float64Array {
  const out = new Float64Array(a.length);
  let n = 0;
  for (const v of a) if (v !== null && Number.isFinite(v)) out[n++] = v;
  return out.subarray(0, n).sort();
}
