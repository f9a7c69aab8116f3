/**
 * Number formatting for the predict cell's messages, line and view (the
 * fit cell's helper is private to its folder; same rule here).
 *
 * @module
 */

/** `sig` significant digits, plain notation for 1e-4 ≤ |x| < 1e6, else exponent; null → "—". */
export function formatNumber(x: number | null, sig = 4): string {
  if (x === null || Number.isNaN(x)) return "—";
  if (!Number.isFinite(x)) return x > 0 ? "∞" : "−∞";
  if (x === 0) return "0";
  const a = Math.abs(x);
  if (a >= 1e-4 && a < 1e6) return String(Number(x.toPrecision(sig)));
  return x.toExponential(sig - 1).replace("e+", "e");
}

/** `[lo, hi]` with `sig` digits, or "—". */
export function formatInterval(v: [number, number] | null, sig = 5): string {
  return v === null ? "—" : `[${formatNumber(v[0], sig)}, ${formatNumber(v[1], sig)}]`;
}
