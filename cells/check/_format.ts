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

/**
 * A variance inflation factor as the check's findings and view both show it:
 * three significant digits, "infinite" for null (the term is a combination
 * of the others to working precision).
 *
 * @param v The VIF or null.
 * @returns The text.
 * @example
 * ```ts
 * import { fmtVif } from "./_format.ts";
 * if (fmtVif(null) !== "infinite" || fmtVif(12.345) !== "12.3") throw new Error(fmtVif(12.345));
 * ```
 */
export function fmtVif(v: number | null): string {
  return v === null ? "infinite" : formatNumber(v, 3);
}
