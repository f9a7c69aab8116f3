/**
 * Number formatting shared by the kinds' lines, messages and views, the
 * page around them (cell headers) and the command line's summary, so a
 * number reads the same in every block of the page, the record and the
 * terminal. The one home: a kind or the page that needs another form adds
 * it here, named for what it does. No UI library is imported (the compute
 * faces and the CLI use it too); RUN-JSON keeps full precision and never
 * goes through it.
 *
 * Three families:
 *
 * - measured values (`_measured.ts`): an estimate, its standard uncertainty
 *   and its interval limits, rounded as GUM (JCGM 100:2008) §7.2.6 asks:
 *   {@link formatEstimate}, {@link formatUncertainty}, {@link formatIntervalAt};
 * - statistics (`_significant.ts`): significant digits that never print a
 *   value near 1 as 1 and keep a column's distinct values distinct:
 *   {@link formatNumber}, {@link formatNearOne}, {@link formatP},
 *   {@link distinctTexts};
 * - durations, and the phrase forms below.
 *
 * @module
 */
import { formatNearOne, formatP } from "./_significant.ts";

export {
  type DigitPlace,
  formatAtPlace,
  formatEstimate,
  formatIntervalAt,
  formatUncertainty,
  measuredPlace,
  uncertaintyPlace,
} from "./_measured.ts";
export { distinctTexts, formatNearOne, formatNumber, formatP } from "./_significant.ts";

/**
 * A p-value inside a sentence: "p = 0.012", or the bound "p < 0.0001" below
 * 1e-4 (where {@link formatP} shows the size, prose states the bound).
 *
 * @param p The p-value.
 * @returns The phrase.
 * @example
 * ```ts
 * import { formatPPhrase } from "./format.ts";
 * if (formatPPhrase(0.01234) !== "p = 0.012" || formatPPhrase(3e-9) !== "p < 0.0001") throw new Error();
 * ```
 */
export function formatPPhrase(p: number): string {
  return p < 1e-4 ? "p < 0.0001" : `p = ${formatP(p)}`;
}

/**
 * R² (or adjusted R²): {@link formatNearOne}, so 0.9999999904 is not shown as 1.00000.
 *
 * @param r2 R², or null.
 * @returns The text.
 * @example
 * ```ts
 * import { formatR2 } from "./format.ts";
 * if (formatR2(0.9999999904) !== "0.9999999904") throw new Error();
 * ```
 */
export function formatR2(r2: number | null): string {
  return formatNearOne(r2);
}

/**
 * A duration for a cell header: a tenth of a millisecond below 10 ms, whole
 * milliseconds below a second, tenths of a second below a minute, then
 * minutes and seconds. Fixed decimals per range, unlike {@link formatNumber},
 * so the header's width holds still while a cell recomputes.
 *
 * @param ms Milliseconds.
 * @returns "0.4 ms", "12 ms", "1.3 s", "2 min 5 s".
 * @example
 * ```ts
 * import { formatDuration } from "./format.ts";
 * if (formatDuration(1340) !== "1.3 s" || formatDuration(12.4) !== "12 ms") throw new Error();
 * ```
 */
export function formatDuration(ms: number): string {
  if (ms < 10) return `${ms.toFixed(1)} ms`;
  if (ms < 1000) return `${Math.round(ms)} ms`;
  if (ms < 60_000) return `${(ms / 1000).toFixed(1)} s`;
  const s = Math.round(ms / 1000);
  return `${Math.floor(s / 60)} min ${s % 60} s`;
}

/**
 * A value followed by its unit, or the value alone.
 *
 * @param text The formatted value.
 * @param unit The unit, or null/undefined/"" for none.
 * @returns `1.71 mAh`, or `1.71`.
 */
export function withUnit(text: string, unit: string | null | undefined): string {
  return unit ? `${text} ${unit}` : text;
}

/**
 * The unit of a square (a sum of squares, a variance): `mAh²`, `(m/s)²`.
 *
 * @param unit The unit, or null.
 * @returns The squared unit, or null.
 * @example
 * ```ts
 * import { squaredUnit } from "./format.ts";
 * if (squaredUnit("mAh") !== "mAh²" || squaredUnit("m/s") !== "(m/s)²") throw new Error();
 * ```
 */
export function squaredUnit(unit: string | null | undefined): string | null {
  if (!unit) return null;
  return /^[\p{L}°Ωµ]+$/u.test(unit) ? `${unit}²` : `(${unit})²`;
}
