/**
 * Which per-row fields of a result the page does without. A fit of 10,000
 * rows carries its fitted values, residuals and row numbers (about 430 kB of
 * JSON), a check eight such arrays (1.5 MB); the page's views read none of a
 * fit's and four of a check's (the residual charts). The server leaves the
 * fields listed here out of the live channel's results (kernel/server/
 * live_result.ts), except those an inline value of the document names, and
 * says which it left out (`CellMessage.omitted`). RUN-JSON (`plumb run
 * --json`) is not affected: it always has every field.
 *
 * Keep this list in step with the views: a view that starts reading one of
 * these fields must take it off the list.
 *
 * A check large enough that all four residual charts are densities (more
 * than 5,000 rows) goes further ({@link pageExtras}): its charts are counted
 * once on the server (`checkDensity`, ui/charts) and the page gets the
 * counted cells (`density`, about 40 kB) instead of the five per-row arrays
 * the charts read (about 800 kB).
 *
 * @module
 */
import { type CheckChartInput, checkDensity } from "./charts/residual_charts.ts";

/** Per kind, the result fields that no view on the page reads. */
export const PAGE_OMITS: Readonly<Record<string, readonly string[]>> = {
  // cells/fit/view.tsx shows parameters and statistics only.
  fit: ["fitted", "residuals", "rows"],
  // cells/check/view.tsx: the charts read fitted, residuals, studentized_internal,
  // leverage and cooks_distance (ui/charts/residual_charts.ts CheckChartInput).
  check: ["rows", "studentized_external", "dffits"],
};

/**
 * The fields of a kind's result the page does without.
 *
 * @param kind The cell's kind.
 * @returns The field names (empty for a kind whose view reads everything).
 * @example
 * ```ts
 * import { pageOmits } from "./page_fields.ts";
 * if (!pageOmits("fit").includes("residuals") || pageOmits("chart").length !== 0) {
 *   throw new Error("omits");
 * }
 * ```
 */
export function pageOmits(kind: string): readonly string[] {
  return Object.hasOwn(PAGE_OMITS, kind) ? PAGE_OMITS[kind] : [];
}

/** The per-row arrays a check's residual charts read, replaced by `density` on the page. */
const CHART_ARRAYS = ["fitted", "residuals", "studentized_internal", "leverage", "cooks_distance"];

/**
 * Fields the page's copy of a result gains, and the fields they stand in for.
 *
 * @param kind The cell's kind.
 * @param result The complete result.
 * @returns `add` (new fields) and `omit` (fields now left out), or null for none.
 * @example
 * ```ts
 * import { pageExtras } from "./page_fields.ts";
 * if (pageExtras("fit", {}) !== null) throw new Error("fits gain nothing");
 * ```
 */
export function pageExtras(
  kind: string,
  result: unknown,
): { add: Record<string, unknown>; omit: string[] } | null {
  if (kind !== "check" || result === null || typeof result !== "object") return null;
  const r = result as CheckChartInput;
  if (!CHART_ARRAYS.every((f) => Array.isArray((r as unknown as Record<string, unknown>)[f]))) {
    return null;
  }
  const density = checkDensity(r);
  return density === null ? null : { add: { density }, omit: CHART_ARRAYS };
}
