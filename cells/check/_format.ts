/**
 * Number and row-list formatting for findings and the view.
 *
 * @module
 */

/**
 * A number to `sig` significant digits, trailing zeros dropped; "—" for null.
 *
 * @param x The number or null.
 * @param sig Significant digits (default 3).
 * @returns The text.
 */
export function fmt(x: number | null, sig = 3): string {
  if (x === null || !Number.isFinite(x)) return "—";
  if (x === 0) return "0";
  const a = Math.abs(x);
  if (a >= 1e6 || a < 1e-4) return x.toExponential(sig - 1).replace(/\.?0+e/, "e");
  return String(Number(x.toPrecision(sig)));
}

/**
 * "row 3" or "rows 3, 17 and 22".
 *
 * @param rows Source row numbers.
 * @returns The phrase.
 */
export function rowList(rows: readonly number[]): string {
  if (rows.length === 1) return `row ${rows[0]}`;
  return `rows ${rows.slice(0, -1).join(", ")} and ${rows[rows.length - 1]}`;
}

/**
 * A p-value for prose: "p = 0.012" or "p < 0.0001".
 *
 * @param p The p-value.
 * @returns The text.
 */
export function pText(p: number): string {
  return p < 1e-4 ? "p < 0.0001" : `p = ${fmt(p, 2)}`;
}
