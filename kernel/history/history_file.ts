/**
 * The run history file beside a document (`fade.md` → `fade.history.jsonl`):
 * JSON Lines, each record a head line, one line a cell and an end line, every
 * line carrying its record id (the format is in _history_lines.ts and
 * docs/history.md).
 *
 * Appending is crash-safe and needs leave to write two names only, the
 * history and {@link historyTempPath}:
 *
 * ```
 *  read the file, sort it into records (_history_scan.ts)
 *  ├─ clean and within `keep` ──▶ shared lock; ONE write with O_APPEND (a line break first if
 *  │                              the last line has none); fsync. A crash leaves at most the
 *  │                              new record cut short, at the end, where the reader says so
 *  └─ a record cut short, or more than `keep` ──▶ exclusive lock; the file still as read
 *         (inode, size, time)? the newest `keep` records and the new one to .<name>.tmp,
 *         fsync, rename over the file, fsync the folder; otherwise start again
 * ```
 *
 * The locks (advisory, on the history file) keep Plumb's own processes from
 * renaming a file away under an append or under another rewrite; whoever
 * waited finds the file renamed and starts again. A repair never leaves a cut
 * record in the middle of the file, so a crash at any moment leaves at most
 * the last record cut short. The reader drops a record written twice.
 *
 * @module
 */
import { sha256Hex } from "../hash.ts";
import { historyFailure } from "./_history_failure.ts";
import { recordLines } from "./_history_lines.ts";
import { readGroup, scanHistory } from "./_history_scan.ts";
import { type Appended, appendOnce, MAX_TRIES, snapshot } from "./_history_write.ts";
import type { HistoryRead, HistoryRecord } from "./types.ts";
import { historyTempPath } from "./paths.ts";
export { historyPath, historyTempPath } from "./paths.ts";

export { HistoryFileError } from "./_history_failure.ts";
export type { Appended } from "./_history_write.ts";

/**
 * A record id: the UTC time, `-`, and 8 hex digits of the SHA-256 of the
 * record's content (its lines as written with an empty id, say).
 *
 * @param time ISO 8601 UTC.
 * @param body The record's content, serialised.
 * @returns The id.
 * @example
 * ```ts
 * import { recordId } from "./history_file.ts";
 * const id = await recordId("2026-12-04T18:55:02.000Z", "");
 * // SHA-256 of nothing starts e3b0c442 (FIPS 180-4 test vector).
 * if (id !== "2026-12-04T18:55:02.000Z-e3b0c442") throw new Error(id);
 * ```
 */
export async function recordId(time: string, body: string): Promise<string> {
  return `${time}-${(await sha256Hex(new TextEncoder().encode(body))).slice(0, 8)}`;
}

/**
 * A record as the history file holds it: head, cells, end, each line ending
 * in a line break. Keys come in a fixed order, so the same record always
 * gives the same text.
 *
 * @param record The record.
 * @returns The text.
 */
export function serialiseRecord(record: HistoryRecord): string {
  return recordLines(record).join("\n") + "\n";
}

/** Options of {@link appendRecord}. */
export interface AppendOptions {
  /** The most records the history keeps (at least 1; default: no bound). */
  keep?: number;
}

/**
 * Appends a record to a history file (created when absent): one write and an
 * fsync, or an atomic rewrite when an earlier record was cut short or the
 * history would exceed `keep` records.
 *
 * @param path The history file.
 * @param record The record.
 * @param opts How many records to keep.
 * @returns What was done.
 * @throws {HistoryFileError} One sentence naming the file and the reason
 *   (`… could not be written: the folder is read-only`); the file is then as it was.
 * @example
 * ```ts
 * import { appendRecord, readHistory } from "./history_file.ts";
 * const dir = await Deno.makeTempDir(), path = `${dir}/a.history.jsonl`;
 * const record = {
 *   record: "2026-12-04T00:00:00.000Z-00000000", time: "2026-12-04T00:00:00.000Z", plumb: "0",
 *   document: { path: "a.md", sha256: "ab" }, files: [], level: 0.95, cells: [],
 * };
 * const done = await appendRecord(path, record, { keep: 10 });
 * if (!done.written || (await readHistory(path)).records[0].record !== record.record) throw new Error();
 * await Deno.remove(dir, { recursive: true });
 * ```
 */
export async function appendRecord(
  path: string,
  record: HistoryRecord,
  opts: AppendOptions = {},
): Promise<Appended> {
  const keep = Math.max(1, Math.floor(opts.keep ?? Infinity));
  const bytes = new TextEncoder().encode(serialiseRecord(record));
  try {
    for (let tries = 1; tries <= 10 * MAX_TRIES; tries++) {
      const done = await appendOnce(
        path,
        historyTempPath(path),
        record,
        bytes,
        keep,
        tries >= MAX_TRIES,
      );
      if (done) return done;
    }
    throw new Error("other processes kept replacing it");
  } catch (err) {
    throw historyFailure(path, "written", err);
  }
}

/**
 * Reads a history file whole: its complete records, oldest first (by time,
 * then id), and a sentence for each part left out (a record cut short, a
 * line that is not JSON or not of the format). A missing file is an empty
 * history.
 *
 * @param path The history file.
 * @returns The records and the problems.
 * @throws {HistoryFileError} When the file exists but cannot be read (`… could not be read: …`).
 * @example
 * ```ts
 * import { readHistory } from "./history_file.ts";
 * const read = await readHistory("/no/such/folder/a.history.jsonl");
 * if (read.records.length !== 0 || read.problems.length !== 0) throw new Error();
 * ```
 */
export async function readHistory(path: string): Promise<HistoryRead> {
  const bytes = await readBytes(path);
  const scan = scanHistory(bytes);
  const records: HistoryRecord[] = [];
  const problems = [...scan.problems];
  for (const g of scan.complete) {
    const r = readGroup(bytes, g);
    if ("problem" in r) problems.push(r.problem);
    else records.push(r);
  }
  return { records, problems: problems.sort((a, b) => a.no - b.no).map((p) => p.text) };
}

/**
 * The newest complete record of a history, reading only its cell lines.
 *
 * @param path The history file.
 * @returns The record, or null when the history holds none.
 * @throws {HistoryFileError} When the file exists but cannot be read.
 */
export async function lastRecord(path: string): Promise<HistoryRecord | null> {
  const bytes = await readBytes(path);
  const { complete } = scanHistory(bytes);
  for (let i = complete.length - 1; i >= 0; i--) {
    const r = readGroup(bytes, complete[i]);
    if (!("problem" in r)) return r;
  }
  return null;
}

async function readBytes(path: string): Promise<Uint8Array> {
  try {
    return (await snapshot(path))?.bytes ?? new Uint8Array();
  } catch (err) {
    throw historyFailure(path, "read", err);
  }
}
