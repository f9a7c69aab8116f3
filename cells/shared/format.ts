/**
 * Number formatting shared by the kinds' lines, messages and views, so a
 * number reads the same in every block of the page and the record.
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
 * `[lo, hi]` with `sig` digits, or "—".
 *
 * @param v The interval, or null.
 * @param sig Significant digits.
 * @returns The text.
 */
export function formatInterval(v: [number, number] | null, sig = 5): string {
  return v === null ? "—" : `[${formatNumber(v[0], sig)}, ${formatNumber(v[1], sig)}]`;
}
