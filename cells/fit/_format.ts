/**
 * Number formatting for the one-line summary and the view.
 *
 * @module
 */

/** `sig` significant digits, plain notation for 1e-4 ≤ |x| < 1e6, else exponent. */
export function formatNumber(x: number | null, sig = 4): string {
  if (x === null || Number.isNaN(x)) return "—";
  if (!Number.isFinite(x)) return x > 0 ? "∞" : "−∞";
  if (x === 0) return "0";
  const a = Math.abs(x);
  if (a >= 1e-4 && a < 1e6) return String(Number(x.toPrecision(sig)));
  return x.toExponential(sig - 1).replace("e+", "e");
}

/**
 * R² with enough decimals that 1 − R² keeps two significant digits (at least
 * four decimals), so 0.999994 is not shown as 1.0000.
 */
export function formatR2(r2: number | null): string {
  if (r2 === null) return "—";
  const gap = 1 - r2;
  const decimals = gap > 0 ? Math.min(12, Math.max(4, Math.ceil(-Math.log10(gap)) + 1)) : 4;
  return r2.toFixed(decimals);
}
