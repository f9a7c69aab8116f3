/**
 * Lack-of-fit F test from replicated predictor values (pure error).
 *
 * Method: Draper & Smith, *Applied Regression Analysis*, 3rd ed. (1998),
 * §2.1 "Lack of fit and pure error" (section from memory): rows with
 * identical predictor values form m groups; SS_PE = Σ_groups Σ wᵢ(yᵢ − ȳ_g)²
 * (ȳ_g the group's weighted mean) with n − m df; SS_LOF = RSS − SS_PE with
 * m − p df; F = (SS_LOF/(m − p))/(SS_PE/(n − m)) against F(m − p, n − m).
 *
 * @module
 */
import { fisherF } from "./fisher_f.ts";

/** The test with its sums of squares. */
export interface LackOfFit {
  f: number;
  df1: number;
  df2: number;
  p_value: number;
  ss_lack_of_fit: number;
  ss_pure_error: number;
  /** Number of distinct predictor rows (m). */
  levels: number;
}

/**
 * Lack-of-fit test; exists only when predictor rows repeat.
 *
 * @param columns The predictor columns of the rows used (a row's values define its group).
 * @param y The response (on the fitted scale).
 * @param residuals eᵢ = yᵢ − ŷᵢ.
 * @param p Number of estimated mean parameters.
 * @param weights wᵢ per row, or null.
 * @returns The test; null without replicates (n = m), with m ≤ p, or with zero pure error.
 * @example
 * ```ts
 * import { lackOfFit } from "./lack_of_fit.ts";
 * // x = 1, 1, 2, 2, 3, 3 with y = x² ± 0.1 fitted by a line (hand computation: SS_PE = 0.06).
 * const x = new Float64Array([1, 1, 2, 2, 3, 3]), y = new Float64Array([0.9, 1.1, 3.9, 4.1, 8.9, 9.1]);
 * const e = y.map((v, i) => v - (4 * x[i] - 10 / 3));
 * const t = lackOfFit([x], y, e, 2, null);
 * if (t === null || Math.abs(t.ss_pure_error - 0.06) > 1e-12 || t.df1 !== 1 || t.df2 !== 3) throw new Error();
 * ```
 */
export function lackOfFit(
  columns: readonly Float64Array[],
  y: Float64Array,
  residuals: Float64Array,
  p: number,
  weights: Float64Array | null,
): LackOfFit | null {
  const n = y.length;
  if (columns.length === 1 && strictlyIncreasing(columns[0])) return null; // no replicates
  // One predictor: the number itself is the key (Map's SameValueZero groups exactly as String()
  // does: 0 with −0, NaN with NaN), without building a string per row.
  const groups = new Map<number | string, number[]>();
  const one = columns.length === 1 ? columns[0] : null;
  for (let i = 0; i < n; i++) {
    const key = one ? one[i] : columns.map((c) => String(c[i])).join("\u0000");
    const g = groups.get(key);
    if (g) g.push(i);
    else groups.set(key, [i]);
  }
  const m = groups.size, w = (i: number) => weights ? weights[i] : 1;
  if (m >= n || m <= p) return null;
  let ssPe = 0;
  for (const g of groups.values()) {
    let sw = 0, swy = 0;
    for (const i of g) {
      sw += w(i);
      swy += w(i) * y[i];
    }
    for (const i of g) ssPe += w(i) * (y[i] - swy / sw) ** 2;
  }
  let rss = 0;
  for (let i = 0; i < n; i++) rss += w(i) * residuals[i] * residuals[i];
  if (!(ssPe > 0)) return null;
  const df1 = m - p, df2 = n - m;
  const ssLof = Math.max(0, rss - ssPe);
  const f = (ssLof / df1) / (ssPe / df2);
  return {
    f,
    df1,
    df2,
    p_value: fisherF(df1, df2).upper(f),
    ss_lack_of_fit: ssLof,
    ss_pure_error: ssPe,
    levels: m,
  };
}

/** Whether every value is larger than the one before (then no two rows share a value). */
function strictlyIncreasing(x: Float64Array): boolean {
  for (let i = 1; i < x.length; i++) if (!(x[i - 1] < x[i])) return false;
  return true;
}
