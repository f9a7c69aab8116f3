/**
 * `GET /record`: the static record of the live page's latest run, as a
 * file to save (the page's "record" link). The record is drawn by the
 * product's record module (ui/record, given as a URL: the kernel imports no
 * UI code), from the run the page shows, so it needs no second run. The
 * document's hash is taken of its text as run (UTF-8).
 *
 * @module
 */
import { basename } from "node:path";
import type { RunReport } from "../session/session.ts";
import type { LastRun } from "./live_workspace.ts";
import type { ChangeReport } from "../history/types.ts";

/** What a record is gathered from: the document and its run (ui/record `gatherRecord`). */
export interface RunFacts {
  /** The document's path as given. */
  path: string;
  /** Its bytes as read. */
  bytes: Uint8Array;
  /** Its text (the bytes decoded). */
  source: string;
  report: RunReport;
  /** When the run started (ms since 1970) and how long it took. */
  startedMs: number;
  durationMs: number;
  /** `SOURCE_DATE_EPOCH` as found in the environment, if at all. */
  sourceDateEpoch?: string;
  /**
   * What changed since the previous data revision (kernel/history), and what
   * the history could not do; absent or null when the history is off or empty.
   */
  changes?: { report: ChangeReport | null; notes: string[] } | null;
}

/** The record module's face (ui/record/mod.ts), as `plumb export` and this route use it. */
export interface RecordModule {
  gatherRecord(facts: RunFacts): Promise<unknown>;
  renderRecord(input: unknown, options?: { paper?: "a4" | "letter" }): string;
}

/**
 * The record of the latest run as an HTML download.
 *
 * @param last The latest run, or null before the first.
 * @param documentPath The document's path.
 * @param recordUrl The record module, or null when the product has none.
 * @returns 200 with the record; 503 in words before the first run or without a record module.
 */
export async function recordResponse(
  last: LastRun | null,
  documentPath: string,
  recordUrl: URL | null,
): Promise<Response> {
  const text = (status: number, body: string) =>
    new Response(`${body}\n`, {
      status,
      headers: { "content-type": "text/plain; charset=utf-8", "cache-control": "no-store" },
    });
  if (recordUrl === null) return text(503, "This server was started without the record module");
  if (last === null) return text(503, "The document has not been run yet: try again in a moment");
  const record = (await import(recordUrl.href)) as RecordModule;
  const name = basename(documentPath);
  const input = await record.gatherRecord({
    path: name,
    bytes: new TextEncoder().encode(last.source),
    source: last.source,
    report: last.report,
    startedMs: last.startedMs,
    durationMs: last.durationMs,
    changes: last.changes === null
      ? null
      : { report: last.changes.report, notes: last.changes.notes },
  });
  const file = `${name.replace(/\.[^.]*$/, "")}.record.html`.replace(/["\\\r\n]/g, "_");
  return new Response(record.renderRecord(input), {
    headers: {
      "content-type": "text/html; charset=utf-8",
      "content-disposition": `attachment; filename="${file}"`,
      "cache-control": "no-store",
      "x-content-type-options": "nosniff",
    },
  });
}
