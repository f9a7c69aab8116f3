/**
 * The check's numbers: three significant digits through the one shared
 * formatter (cells/shared/format.ts), the precision its findings and view
 * are written to.
 *
 * @module
 */
import { formatNumber } from "../shared/format.ts";

/**
 * A number to `sig` significant digits, as `formatNumber`; "—" for null.
 *
 * @param x The number or null.
 * @param sig Significant digits (default 3).
 * @returns The text.
 * @example
 * ```ts
 * import { fmt } from "./_format.ts";
 * if (fmt(0.061234) !== "0.0612" || fmt(null) !== "—") throw new Error(fmt(0.061234));
 * ```
 */
export function fmt(x: number | null, sig = 3): string {
  return formatNumber(x, sig);
}
