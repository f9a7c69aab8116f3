/**
 * Plot-ready chart data: what the `chart` cell's worker computes and its
 * summary carries (the RUN-JSON `chart` result), and what
 * {@link renderChartSvg} draws. Everything is already computed (grids,
 * curves, bands, bins); the renderer only draws.
 *
 * ```
 *  ┌ main panel ───────────────────────────┐
 *  │ points  or  bins (2-D density)        │   x.domain × y.domain
 *  │ bands (one fit)  curves (each fit)    │
 *  └───────────────────────────────────────┘
 *  ┌ residual panel (optional) ────────────┐
 *  │ residual per row (or per x bin), 0 ── │
 *  └───────────────────────────────────────┘
 * ```
 *
 * @module
 */

/** One axis: the column, its label with unit, and its scale. */
export interface ChartAxis {
  column: string;
  unit: string | null;
  /** The axis label, unit in parentheses: `capacity (mAh)`. */
  label: string;
  log: boolean;
  /** [min, max] of what is drawn on this axis. */
  domain: [number, number];
}

/** Binned points: counts on an nx × ny grid of equal cells (equal in log space on a log axis). */
export interface ChartBins {
  /** Cell edges, nx + 1 values. */
  x: number[];
  /** Cell edges, ny + 1 values. */
  y: number[];
  /** Non-empty cells only: [column index, row index, count]. */
  cells: [number, number, number][];
  /** The largest count. */
  max: number;
}

/** A fitted curve on the grid. */
export interface ChartCurve {
  fit: string;
  color: string;
  /** The model as written. */
  model: string;
  /** Curve values at `grid` (null where the model is undefined). */
  y: (number | null)[];
}

/** A band of one fit on the grid: of the mean (confidence band) or of a new observation (prediction band). */
export interface ChartBand {
  fit: string;
  color: string;
  /** Confidence level, e.g. 0.95. */
  level: number;
  /** Of the mean response, or of a new observation. */
  kind: "mean" | "observation";
  /** Each x on its own, or every x of the plotted range at once. */
  coverage: "pointwise" | "simultaneous";
  /** "delta, pointwise", "Scheffé, simultaneous", "bootstrap sup-t, simultaneous, B = 2000". */
  method: string;
  /** q in fit ± q·se. */
  quantile: number;
  /** The quantile named, e.g. `√(2·F(0.95; 2, 8))`. */
  quantile_of: string;
  /** What the method rests on here (Working–Hotelling, linearised, …), or null. */
  note: string | null;
  /** A new observation's variance in words (bands of a new observation), else null. */
  new_observation: string | null;
  /** The label drawn: fit, level, which band and method. */
  label: string;
  lo: (number | null)[];
  hi: (number | null)[];
}

/** One fit's residuals, per row (or per x bin when binned: the mean residual). */
export interface ChartResidualSeries {
  fit: string;
  color: string;
  x: number[];
  r: number[];
}

/** The residual panel under the main panel. */
export interface ChartResiduals {
  /** Axis label, e.g. `residual of capacity (mAh)`. */
  label: string;
  /** True when each series holds per-bin means rather than rows. */
  binned: boolean;
  series: ChartResidualSeries[];
}

/** The `chart` cell's result (RUN-JSON `chart`, extended). */
export interface ChartData {
  /** Marks drawn: points or bins, each curve and band, residual series, reference lines. */
  marks: number;
  /** Points drawn one by one (0 when binned). */
  points: number;
  binned: boolean;
  /** Rows plotted (finite x and y, positive on a log axis). */
  rows: number;
  /** Non-empty bins drawn (0 when not binned). */
  bins_drawn: number;
  title: string | null;
  x: ChartAxis;
  y: ChartAxis;
  /** Points as two parallel lists, when not binned. */
  data: { x: number[]; y: number[] } | null;
  bins: ChartBins | null;
  /** x values the curves and the band are evaluated at. */
  grid: number[];
  curves: ChartCurve[];
  /** The first of `bands` (kept for readers of the first release), or null. */
  band: ChartBand | null;
  /** Every band drawn: the mean's first, then a new observation's. */
  bands: ChartBand[];
  residuals: ChartResiduals | null;
}
