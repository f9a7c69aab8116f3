/**
 * A large check's residual charts counted once, in the compute worker: the
 * live page's copy of a check above DENSE_ROWS rows carries these counts
 * (about 40 kB) instead of five per-row arrays (about 800 kB); the page
 * draws them (`residual_charts.ts`). Pure computation, no drawing library.
 *
 * Plotting positions (i − 3/8)/(n + 1/4) (Blom 1958, *Statistical Estimates
 * and Transformed Beta-Variables*; from memory).
 *
 * @module
 */
import { standardNormal } from "../../kernel/stats/mod.ts";
import type { ChartBins } from "../shared/chart_data.ts";
import { countCells } from "../shared/count_cells.ts";
import { cellEdges, cellOf, density, DENSITY_GRID, max, min } from "../shared/density.ts";

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

/** The residual figure's panels of a large check, counted into cells (`scale`: |studentized| against fitted). */
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

/**
 * Counts of the values, in rank order, against their normal quantiles: the
 * point of rank i (0 the smallest) is (Φ⁻¹(position(i)), its value), its
 * column found by the CDF. The values need not be sorted: the rows of the
 * grid are ordered as the values are, so the values in row j are those of
 * ranks c₀ + … + c_{j−1} up to c₀ + … + c_j − 1 (c_j how many values fall in
 * row j), and counting them by row gives each rank its row without a sort
 * (100,000 values: a sort took about 7 ms of each update of a large check).
 *
 * @param values Finite values, in any order (at least one).
 * @param q0 The first column's left edge (the normal quantile of rank 0).
 * @param q1 The last column's right edge (that of rank n − 1).
 * @param position The plotting position of a rank.
 * @returns The counted cells; the same as counting the sorted values point by point.
 * @example
 * ```ts
 * import { quantileDensity } from "./density.ts";
 * const p = (i: number) => (i + 0.625) / 4.25;
 * const a = quantileDensity([3, 1, 2, 0], -1, 1, p), b = quantileDensity([0, 1, 2, 3], -1, 1, p);
 * if (JSON.stringify(a) !== JSON.stringify(b)) throw new Error("order matters");
 * ```
 */
export function quantileDensity(
  values: ArrayLike<number>,
  q0: number,
  q1: number,
  position: (i: number) => number,
): ChartBins {
  const n = values.length;
  const xEdges = cellEdges(q0, q1, DENSITY_GRID.nx);
  const yEdges = cellEdges(min(values), max(values), DENSITY_GRID.ny);
  const pEdges = xEdges.map((e) => standardNormal.cdf(e));
  const inRow = new Int32Array(DENSITY_GRID.ny);
  for (let i = 0; i < n; i++) inRow[cellOf(values[i], yEdges)]++;
  const xc = new Int32Array(n), yc = new Int32Array(n);
  let k = 0, j = 0, rowEnd = inRow[0];
  for (let i = 0; i < n; i++) {
    while (k < DENSITY_GRID.nx - 1 && position(i) >= pEdges[k + 1]) k++;
    while (i >= rowEnd) rowEnd += inRow[++j];
    xc[i] = k;
    yc[i] = j;
  }
  return countCells(xc, yc, xEdges, yEdges);
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
 * import { checkDensity } from "./density.ts";
 * const few = { fit: "f", fitted: [1, 2], residuals: [0, 0], studentized_internal: [0, 0],
 *   leverage: [0.5, 0.5], cooks_distance: [0, 0] };
 * if (checkDensity(few) !== null) throw new Error("two rows draw dots");
 * ```
 */
export function checkDensity(r: CheckChartInput): CheckDensity | null {
  // Typed arrays and plain loops throughout: this runs in the compute worker
  // on every update of a large check (10,000 rows: about 2 ms, against 11 ms
  // with pairs of arrays and a comparator sort). Each chart's pairs go into
  // the same kept buffers, counted before the next chart's are copied: at
  // 100,000 rows five new arrays of 0.8 MB took about 12 ms of each update.
  const { fitted, residuals, studentized_internal: st, leverage: h } = r;
  if (
    finiteCount(fitted, residuals) <= DENSE_ROWS || finiteCount(fitted, st) <= DENSE_ROWS ||
    finiteCount(h, st) <= DENSE_ROWS
  ) return null;
  const byFitted = density(...finitePairs(fitted, residuals));
  const scale = density(...finitePairs(fitted, st, Math.abs));
  const [hx, ry] = finitePairs(h, st);
  let hMax = -Infinity, rMax = -Infinity;
  for (let i = 0; i < hx.length; i++) {
    if (hx[i] > hMax) hMax = hx[i];
    if (Math.abs(ry[i]) > rMax) rMax = Math.abs(ry[i]);
  }
  const leverage = density(hx, ry);
  const s = finite(st);
  const n = s.length;
  const lo = min(s), hi = max(s);
  const position = (i: number) => (i + 1 - 0.375) / (n + 0.25);
  const q0 = standardNormal.quantile(position(0)), q1 = standardNormal.quantile(position(n - 1));
  let trace = 0;
  for (const v of h) if (v !== null && Number.isFinite(v)) trace += v; // NaN: none (typed arrays)
  return {
    residuals: byFitted,
    quantiles: quantileDensity(s, q0, q1, position),
    scale,
    leverage,
    line: [Math.min(q0, lo), Math.max(q1, hi)],
    trace,
    hMax,
    rMax,
  };
}

/** Buffers the pairs are copied into, kept from update to update (grown when too short). */
let bufferX = new Float64Array(0), bufferY = new Float64Array(0);

function buffers(m: number): [Float64Array, Float64Array] {
  if (bufferX.length < m) [bufferX, bufferY] = [new Float64Array(m), new Float64Array(m)];
  return [bufferX, bufferY];
}

/** How many rows have both values finite. */
function finiteCount(a: (number | null)[], b: (number | null)[]): number {
  const m = Math.min(a.length, b.length);
  let n = 0;
  for (let i = 0; i < m; i++) {
    const u = a[i], v = b[i];
    if (u !== null && v !== null && Number.isFinite(u) && Number.isFinite(v)) n++;
  }
  return n;
}

/**
 * The rows where both values are finite (y through `f` when given), in the
 * kept buffers: valid until the next call.
 */
function finitePairs(
  a: (number | null)[],
  b: (number | null)[],
  f?: (v: number) => number,
): [Float64Array, Float64Array] {
  const m = Math.min(a.length, b.length);
  const [x, y] = buffers(m);
  let n = 0;
  for (let i = 0; i < m; i++) {
    const u = a[i], v = b[i];
    if (u === null || v === null || !Number.isFinite(u) || !Number.isFinite(v)) continue;
    x[n] = u;
    y[n++] = f ? f(v) : v;
  }
  return [x.subarray(0, n), y.subarray(0, n)];
}

/**
 * The finite values, in row order (the quantile plot needs their ranks only:
 * no sort), in the kept buffer: valid until the next call.
 */
function finite(a: (number | null)[]): Float64Array {
  const out = buffers(a.length)[0];
  let n = 0;
  for (const v of a) if (v !== null && Number.isFinite(v)) out[n++] = v;
  return out.subarray(0, n);
}
