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
import { fitColor, INK } from "../shared/palette.ts";
import { stackPanels } from "../../ui/charts/_svg.ts";
import { densityRect } from "../../ui/charts/_density.ts";
import { density, densityDomains, max } from "../shared/density.ts";
import { type CheckChartInput, DENSE_ROWS, quantileDensity } from "./density.ts";
import type { ChartBins } from "../shared/chart_data.ts";

export { type CheckChartInput, type CheckDensity, checkDensity, DENSE_ROWS } from "./density.ts";

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
