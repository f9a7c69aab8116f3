/**
 * The chart cell's result: its plot-ready data with numbers rounded to 7
 * significant digits (far below a pixel; keeps the live messages and the
 * record small) and non-finite values as null.
 *
 * @module
 */
import type { ChartData } from "../shared/chart_data.ts";
import type { ChartOutput } from "./run.ts";

/** Significant digits kept in the result. */
export const RESULT_DIGITS = 7;

/**
 * The RUN-JSON `chart` result of a chart output.
 *
 * @param out The chart output.
 * @returns The rounded data (a new object; counts and text unchanged).
 * @example
 * ```ts
 * import { roundDeep } from "./result.ts";
 * if (JSON.stringify(roundDeep([Math.PI, NaN, { a: 1 / 3 }])) !== '[3.141593,null,{"a":0.3333333}]') {
 *   throw new Error("rounding");
 * }
 * ```
 */
export function summarizeChart(out: ChartOutput): ChartData {
  return roundDeep(out.data) as ChartData;
}

/**
 * Rounds every number in plain JSON data to {@link RESULT_DIGITS} significant digits.
 *
 * @param v Plain JSON data (numbers, strings, booleans, null, arrays, objects).
 * @returns A copy with numbers rounded and non-finite numbers as null.
 */
export function roundDeep(v: unknown): unknown {
  if (typeof v === "number") {
    return Number.isFinite(v)
      ? (Number.isInteger(v) ? v : Number(v.toPrecision(RESULT_DIGITS)))
      : null;
  }
  if (Array.isArray(v)) return v.map(roundDeep);
  if (v !== null && typeof v === "object") {
    return Object.fromEntries(Object.entries(v).map(([k, x]) => [k, roundDeep(x)]));
  }
  return v;
}
