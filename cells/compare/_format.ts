/**
 * Number formatting for the verdict, the one-line summary and the view.
 *
 * @module
 */

/**
 * `sig` significant digits, plain notation for 1e-4 ≤ |x| < 1e6, else an exponent.
 *
 * @param x The number, or null (shown as a dash).
 * @param sig Significant digits.
 * @returns The text.
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
