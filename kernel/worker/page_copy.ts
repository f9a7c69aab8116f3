/**
 * A cell's result as the live page gets it: the kind's summary less the
 * per-row fields that no view on the page reads (the kind's `page.omit`),
 * unless an inline value of the document names them, and with the kind's
 * stand-ins for large fields (`page.condense`: a large check's charts come
 * counted instead of as five per-row arrays).
 *
 * ```
 *  summary (RUN-JSON result, complete) ──pageCopy──▶ { result: shallow copy
 *                                                      without the omitted fields,
 *                                                      omitted: their names }
 * ```
 *
 * Why: on a 10,000-row table the complete results of six fits and a check
 * are about 4 MB of JSON per run, 90 ms to write on the server and as much
 * to read in the page, for arrays that nothing shows. RUN-JSON keeps every
 * field; this is only the page's copy, made in the compute worker for a
 * Session started with `page: true`, so the complete summary never crosses
 * to the server's thread at all.
 *
 * @module
 */
import type { AnyKind } from "../contract/mod.ts";

/** A result ready for the page. */
export interface PageResult {
  result: unknown;
  /** Fields left out (present in the complete result), in the kind's list order. */
  omitted: string[];
}

/** Stand-ins for large fields and the fields they replace (`PageCopy.condense`). */
export type Condensed = { add: Record<string, unknown>; omit: readonly string[] };

/**
 * The fields a kind's `summary` need not build for the page: its `page.omit`
 * and the fields stand-ins made from the output replace (`condenseOutput`),
 * less those an inline value names.
 *
 * @param kind The kind record.
 * @param keep Top-level fields that inline values name.
 * @param condensed Stand-ins made from the output, or null.
 * @returns The fields to leave out.
 */
export function pageLeavesOut(
  kind: AnyKind,
  keep: ReadonlySet<string>,
  condensed: Condensed | null = null,
): Set<string> {
  const omit = [...(kind.page?.omit ?? []), ...(condensed?.omit ?? [])];
  return new Set(omit.filter((f: string) => !keep.has(f)));
}

/**
 * The page's copy of a result.
 *
 * @param kind The cell's kind record.
 * @param result The complete result (the kind's summary); not changed.
 * @param wanted Top-level fields of this cell that inline values name (kept).
 * @returns The result without the fields the page does without, and their names.
 * @example
 * ```ts
 * import { pageCopy } from "./page_copy.ts";
 * const kind = { page: { omit: ["fitted", "residuals", "rows"] } } as never;
 * const full = { r2: 0.99, residuals: [0.1, -0.1], fitted: [1, 2], rows: [1, 2] };
 * const live = pageCopy(kind, full, new Set(["fitted"]));
 * if ("residuals" in (live.result as object) || !("fitted" in (live.result as object))) {
 *   throw new Error("omits");
 * }
 * if (live.omitted.join() !== "residuals,rows" || !("residuals" in full)) throw new Error("names");
 * ```
 */
export function pageCopy(
  kind: AnyKind,
  result: unknown,
  wanted: ReadonlySet<string> = new Set(),
  condensed?: Condensed | null,
): PageResult {
  if (result === null || typeof result !== "object" || Array.isArray(result)) {
    return { result, omitted: [] };
  }
  const extra = condensed ?? kind.page?.condense?.(result) ?? null;
  const omit = [...(kind.page?.omit ?? []), ...(extra?.omit ?? [])]
    .filter((f, i, all) => all.indexOf(f) === i && Object.hasOwn(result, f) && !wanted.has(f));
  if (omit.length === 0 && extra === null) return { result, omitted: [] };
  const copy: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(result)) if (!omit.includes(k)) copy[k] = v;
  Object.assign(copy, extra?.add ?? {});
  return { result: copy, omitted: omit };
}
