/**
 * Number formatting shared by the kinds' lines, messages and views and by
 * the page around them (cell headers), so a number reads the same in every
 * block of the page and the record. The one home: a kind or the page that
 * needs another form adds it here, named for what it does.
 *
 * @module
 */

/**
 * `sig` significant digits, plain notation for 1e-4 ≤ |x| < 1e6, else an exponent.
 *
 * @param x The number, or null (shown as a dash).
 * @param sig Significant digits.
 * @returns The text.
 * @example
 * ```ts
 * import { formatNumber } from "./format.ts";
 * if (formatNumber(2512.345) !== "2512" || formatNumber(3.2e-7, 2) !== "3.2e-7") throw new Error();
 * ```
 */
export function formatNumber(x: number | null, sig = 4): string {
  if (x === null || Number.isNaN(x)) return "—";
  if (!Number.isFinite(x)) return x > 0 ? "∞" : "−∞";
  if (x === 0) return "0";
  const a = Math.abs(x);
  if (a >= 1e-4 && a < 1e6) return String(Number(x.toPrecision(sig)));
  return x.toExponential(sig - 1).replace("e+", "e");
}

/**
 * A p-value that keeps its size: 3.2e-27 is shown as such, never as 0.
 *
 * @param p The p-value, or null.
 * @returns The text.
 */
export function formatP(p: number | null): string {
  if (p === null) return "—";
  return p < 1e-4 ? p.toExponential(1).replace("e+", "e") : formatNumber(p, 2);
}

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
 * R² with enough decimals that 1 − R² keeps two significant digits (at least
 * four decimals), so 0.999994 is not shown as 1.0000.
 *
 * @param r2 R², or null.
 * @returns The text.
 */
export function formatR2(r2: number | null): string {
  if (r2 === null) return "—";
  const gap = 1 - r2;
  const decimals = gap > 0 ? Math.min(12, Math.max(4, Math.ceil(-Math.log10(gap)) + 1)) : 4;
  return r2.toFixed(decimals);
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
 * `[lo, hi]` with `sig` digits, or "—".
 *
 * @param v The interval, or null.
 * @param sig Significant digits.
 * @returns The text.
 */
export function formatInterval(v: [number, number] | null, sig = 5): string {
  return v === null ? "—" : `[${formatNumber(v[0], sig)}, ${formatNumber(v[1], sig)}]`;
}
