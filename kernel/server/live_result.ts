/**
 * A cell's result as the live channel carries it: the kind's summary less the
 * per-row fields that no view on the page reads (ui/page_fields.ts), unless
 * an inline value of the document names them; a large check's charts come
 * counted (`density`) instead of as five per-row arrays.
 *
 * ```
 *  summary (RUN-JSON result, complete) ──liveResult──▶ { result: shallow copy
 *                                                         without the omitted fields,
 *                                                         omitted: their names }
 * ```
 *
 * Why: on a 10,000-row table the complete results of six fits and a check
 * are about 4 MB of JSON per run, 90 ms to write on the server and as much
 * to read in the page, for arrays that nothing shows. RUN-JSON keeps every
 * field; this is only the page's copy. The compute worker makes it
 * (cells/worker.ts passes this function to serveComputeWorker) for a
 * Session started with `page: true`, so the complete summary never crosses
 * to the server's thread at all.
 *
 * @module
 */
import { pageExtras, pageOmits } from "../../ui/page_fields.ts";

/** A result ready for the page. */
export interface LiveResult {
  result: unknown;
  /** Fields left out (present in the complete result), in the kind's list order. */
  omitted: string[];
}

/**
 * The page's copy of a result.
 *
 * @param kind The cell's kind.
 * @param result The complete result (the kind's summary); not changed.
 * @param wanted Top-level fields of this cell that inline values name (kept).
 * @returns The result without the fields the page does without, and their names.
 * @example
 * ```ts
 * import { liveResult } from "./live_result.ts";
 * const full = { r2: 0.99, residuals: [0.1, -0.1], fitted: [1, 2], rows: [1, 2] };
 * const live = liveResult("fit", full, new Set(["fitted"]));
 * if ("residuals" in (live.result as object) || !("fitted" in (live.result as object))) {
 *   throw new Error("omits");
 * }
 * if (live.omitted.join() !== "residuals,rows" || !("residuals" in full)) throw new Error("names");
 * ```
 */
export function liveResult(
  kind: string,
  result: unknown,
  wanted: ReadonlySet<string> = new Set(),
): LiveResult {
  if (result === null || typeof result !== "object" || Array.isArray(result)) {
    return { result, omitted: [] };
  }
  const extra = pageExtras(kind, result);
  const omit = [...pageOmits(kind), ...(extra?.omit ?? [])]
    .filter((f, i, all) => all.indexOf(f) === i && Object.hasOwn(result, f) && !wanted.has(f));
  if (omit.length === 0 && extra === null) return { result, omitted: [] };
  const copy: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(result)) if (!omit.includes(k)) copy[k] = v;
  Object.assign(copy, extra?.add ?? {});
  return { result: copy, omitted: omit };
}
