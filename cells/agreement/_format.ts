/**
 * How the agreement kind prints an estimate and its interval, in the CLI
 * summary and on the page alike: to the place of its standard error's
 * second significant digit (GUM §7.2.6, as every kind rounds), and where a
 * method gives no standard error (Passing–Bablok's ranks, the limits of
 * agreement's bootstrap) to the place a standard error of a quarter of the
 * interval's width would give.
 *
 * @module
 */
import { formatEstimate, formatIntervalAt } from "../shared/format.ts";
import type { Estimated } from "./result.ts";

/** The scale digits follow: the SE, else a quarter of the first closed interval's width. */
export function roundingScale(e: Estimated): number | null {
  if (e.std_error !== null && e.std_error > 0) return e.std_error;
  const i = e.intervals.find((i) => i.lower !== null && i.upper !== null);
  if (i === undefined) return null;
  const w = (i.upper! - i.lower!) / 4;
  return w > 0 ? w : null;
}

/**
 * `1.031 (0.998 … 1.062)`.
 *
 * @param e The estimate and its intervals (the first is shown).
 * @returns The text; an open limit reads "open".
 * @example
 * ```ts
 * import { formatEstimated } from "./_format.ts";
 * const s = formatEstimated({ estimate: 1.0312, std_error: 0.0154,
 *   intervals: [{ method: "t", level: 0.95, lower: 0.9993, upper: 1.0631 }] });
 * if (s !== "1.031 (0.999 … 1.063)") throw new Error(s);
 * ```
 */
export function formatEstimated(e: Estimated): string {
  const u = roundingScale(e);
  const i = e.intervals[0];
  const limits = i === undefined
    ? ""
    : ` (${
      formatIntervalAt([i.lower, i.upper], u, e.estimate, { open: "", sep: " … ", close: "" })
        .replaceAll("—", "open")
    })`;
  return `${formatEstimate(e.estimate, u)}${limits}`;
}
