/**
 * A history record made from a finished run, and whether a run's inputs
 * differ from the last recorded ones (only then is a record appended).
 *
 * @module
 */
import { VERSION } from "../version.ts";
import { hashString } from "../hash.ts";
import type { RunReport } from "../session/types.ts";
import type { HistoryRecord } from "./types.ts";

/** What a record is made of besides the run's report. */
export interface RecordInputs {
  /** The document's path relative to the history file's folder (its file name, mostly). */
  documentPath: string;
  /** Lower-case hex SHA-256 of the document's bytes. */
  documentSha256: string;
  /** The run's report, made with `history: true` (each current cell's `kept`). */
  report: RunReport;
  /** When the run finished (default: now). */
  time?: Date;
}

/**
 * The record of a run. Its id is the UTC time and 8 hex digits of a hash of
 * its content, so two records made in the same millisecond differ.
 *
 * @param input The document, its hash and the run's report.
 * @returns The record (plain JSON).
 * @example
 * ```ts
 * import { makeRecord } from "./record.ts";
 * import { DEFAULT_SETTINGS } from "../document/read_settings.ts";
 * const r = makeRecord({
 *   documentPath: "a.md",
 *   documentSha256: "ab",
 *   report: { settings: DEFAULT_SETTINGS, cells: [], errors: [], files: [], ran: [], superseded: false },
 *   time: new Date(Date.UTC(2026, 11, 4)),
 * });
 * if (!r.record.startsWith("2026-12-04T00:00:00.000Z-") || r.level !== 0.95) throw new Error(r.record);
 * ```
 */
export function makeRecord(input: RecordInputs): HistoryRecord {
  const time = (input.time ?? new Date()).toISOString();
  const body: Omit<HistoryRecord, "record"> = {
    time,
    plumb: VERSION,
    document: { path: input.documentPath, sha256: input.documentSha256 },
    files: input.report.files.map((f) => ({ ...f })),
    level: input.report.settings.confidence,
    cells: input.report.cells.map((c) => ({
      name: c.name,
      kind: c.kind,
      state: c.state === "current" ? "current" : c.state === "held" ? "held" : "failed",
      kept: c.state === "current" && c.kept !== undefined ? c.kept : null,
    })),
  };
  const id = `${time}-${hashString(JSON.stringify(body)).slice(0, 8)}`;
  return { record: id, ...body };
}

/**
 * Whether two records were made from the same inputs: the same document
 * bytes and the same data files with the same bytes.
 *
 * @param a A record.
 * @param b Another record.
 * @returns True when nothing a run reads differs.
 */
export function sameInputs(a: HistoryRecord, b: HistoryRecord): boolean {
  if (a.document.sha256 !== b.document.sha256) return false;
  return sameData(a, b);
}

/**
 * Whether two records read the same data files with the same bytes (the
 * document may differ).
 *
 * @param a A record.
 * @param b Another record.
 * @returns True when the data files are the same set with the same hashes.
 */
export function sameData(a: HistoryRecord, b: HistoryRecord): boolean {
  if (a.files.length !== b.files.length) return false;
  const shas = new Map(a.files.map((f) => [f.path, f.sha256]));
  return b.files.every((f) => shas.get(f.path) === f.sha256);
}
