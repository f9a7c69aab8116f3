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
import { basename, dirname, extname, join } from "node:path";
import { sha256Hex } from "../hash.ts";
import { syncFolder } from "../server/atomic_write.ts";
import { at, failedAt, historyFailure } from "./_history_failure.ts";
import { recordLines } from "./_history_lines.ts";
import { type Group, readGroup, type Scan, scanHistory } from "./_history_scan.ts";
import type { HistoryRead, HistoryRecord } from "./types.ts";

export { HistoryFileError } from "./_history_failure.ts";

/**
 * The history file of a document: beside it, its extension replaced by `.history.jsonl`.
 *
 * @param documentPath The document's file.
 * @returns The history file's path.
 * @example
 * ```ts
 * import { historyPath } from "./history_file.ts";
 * if (historyPath("/lab/fade.md") !== "/lab/fade.history.jsonl") throw new Error(historyPath("/lab/fade.md"));
 * ```
 */
export function historyPath(documentPath: string): string {
  const name = basename(documentPath);
  return join(
    dirname(documentPath),
    `${name.slice(0, name.length - extname(name).length)}.history.jsonl`,
  );
}

/**
 * The one temporary name a rewrite of the history uses, beside it: a fixed
 * name, so that leave to write it can be given ahead (a stale one from a
 * crash is overwritten).
 *
 * @param path The history file.
 * @returns `.<name>.tmp` in the same folder.
 * @example
 * ```ts
 * import { historyTempPath } from "./history_file.ts";
 * if (historyTempPath("/lab/fade.history.jsonl") !== "/lab/.fade.history.jsonl.tmp") throw new Error();
 * ```
 */
export function historyTempPath(path: string): string {
  return join(dirname(path), `.${basename(path)}.tmp`);
}

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

/** What {@link appendRecord} did. */
export interface Appended {
  /** The record is in the file now (false: it was there already). */
  written: boolean;
  /** Complete records in the file now. */
  records: number;
  /** The oldest records dropped to keep `keep`. */
  dropped: number;
  /** Records cut short by an earlier crash, and unreadable lines, removed by the rewrite. */
  repaired: number;
}

/** Options of {@link appendRecord}. */
export interface AppendOptions {
  /** The most records the history keeps (at least 1; default: no bound). */
  keep?: number;
}

const MAX_TRIES = 5;

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
      const done = await appendOnce(path, record, bytes, keep, tries >= MAX_TRIES);
      if (done) return done;
    }
    throw new Error("other processes kept replacing it");
  } catch (err) {
    throw historyFailure(path, "written", err);
  }
}

/**
 * One attempt; null when another process replaced or changed the file
 * meanwhile. After `MAX_TRIES` attempts (`plain`) it appends without rewriting.
 */
async function appendOnce(
  path: string,
  record: HistoryRecord,
  bytes: Uint8Array,
  keep: number,
  plain: boolean,
): Promise<Appended | null> {
  const before = await snapshot(path);
  const scan = scanHistory(before?.bytes ?? new Uint8Array());
  const records = scan.complete.length;
  if (scan.complete.some((g) => g.id === record.record)) {
    return { written: false, records, dropped: 0, repaired: 0 };
  }
  if (before && !plain && (scan.cut > 0 || records + 1 > keep)) {
    return await rewrite(path, before, scan, { record, bytes }, keep);
  }
  if (!await appendBytes(path, bytes, before === null)) return null;
  return { written: true, records: records + 1, dropped: 0, repaired: 0 };
}

/** The file's bytes and what it was when read (the same handle's stat); null when there is none. */
async function snapshot(path: string): Promise<{ bytes: Uint8Array; info: Deno.FileInfo } | null> {
  let file: Deno.FsFile;
  try {
    file = await Deno.open(path, { read: true });
  } catch (err) {
    if (err instanceof Deno.errors.NotFound) return null;
    throw failedAt("reading", err);
  }
  try {
    for (let tries = 1;; tries++) {
      const info = await at("reading", file.stat());
      // Into a buffer of the file's size: Deno.readFile grows its buffer, twice as slow on 40 MB.
      const bytes = new Uint8Array(info.size);
      let got = 0;
      for (let n: number | null = 0; n !== null && got < bytes.length; got += n ?? 0) {
        n = await at("reading", file.read(bytes.subarray(got)));
      }
      const more = await at("reading", file.read(new Uint8Array(1)));
      if ((got === info.size && more === null) || tries === MAX_TRIES) {
        return { bytes: bytes.subarray(0, got), info };
      }
      await file.seek(0, Deno.SeekMode.Start); // appended to while being read: again
    }
  } finally {
    file.close();
  }
}

/**
 * Writes the bytes at the end of the file in one call and flushes them,
 * holding a shared lock so that no rewrite renames the file away meanwhile.
 *
 * @returns False, having written nothing, when the file was renamed away before the lock was held.
 */
async function appendBytes(path: string, bytes: Uint8Array, create: boolean): Promise<boolean> {
  const file = await at(
    create ? "folder" : "file",
    Deno.open(path, { read: true, append: true, create: true }),
  );
  try {
    await file.lock(false);
    const info = await file.stat();
    if (!await isNamed(file, path)) return false;
    let out = bytes;
    if (info.size > 0) {
      // A last line without its line break (a write cut short, an editor): ours starts on a new line.
      const lastByte = new Uint8Array(1);
      await file.seek(-1, Deno.SeekMode.End);
      await file.read(lastByte);
      if (lastByte[0] !== 10) out = concat([NEWLINE, bytes]);
    }
    // O_APPEND: the one write lands at the end as a whole, after any other process's.
    let done = await at("file", file.write(out));
    while (done < out.length) done += await at("file", file.write(out.subarray(done)));
    await at("file", file.sync());
  } finally {
    file.close(); // and the lock with it
  }
  if (create) await syncFolder(dirname(path));
  return true;
}

/**
 * Replaces the file by its newest `keep` complete records, the new one among
 * them, in time order; records cut short and unreadable lines go, records of
 * a newer format stay. An exclusive lock on the file, held from the check
 * that it is still as read until the rename, keeps appends and other
 * rewrites out (they then find the file renamed and start again).
 *
 * @returns What was done, or null when the file changed since it was read.
 */
async function rewrite(
  path: string,
  before: { bytes: Uint8Array; info: Deno.FileInfo },
  scan: Scan,
  added: { record: HistoryRecord; bytes: Uint8Array },
  keep: number,
): Promise<Appended | null> {
  type Part = { time: string; id: string; parts: Uint8Array[] };
  const own = (g: Group): Part => ({ time: g.head!.time, id: g.id, parts: linesOf(scan.bytes, g) });
  const all: Part[] = [...scan.complete.map(own), {
    time: added.record.time,
    id: added.record.record,
    parts: [added.bytes],
  }];
  all.sort(byTime);
  const kept = all.slice(-keep);
  const content = concat([...kept, ...scan.newer.map(own)].sort(byTime).flatMap((p) => p.parts));
  // Opened for appending, as an append would: a read-only history stays as it is.
  let file: Deno.FsFile;
  try {
    file = await Deno.open(path, { append: true });
  } catch (err) {
    if (err instanceof Deno.errors.NotFound) return null; // removed since read: start again
    throw failedAt("file", err);
  }
  try {
    await file.lock(true);
    if (!await isNamed(file, path) || !sameVersion(await file.stat(), before.info)) return null;
    const temp = historyTempPath(path);
    await writeWhole(temp, content, before.info.mode ?? undefined);
    try {
      await at("folder", Deno.rename(temp, path));
    } catch (err) {
      await Deno.remove(temp).catch(() => {});
      throw err;
    }
    await syncFolder(dirname(path));
  } finally {
    file.close();
  }
  return {
    written: kept.some((p) => p.id === added.record.record),
    records: kept.length,
    dropped: all.length - kept.length,
    repaired: scan.cut + scan.damaged,
  };
}

/** Whether the open file is still the one the path names. */
async function isNamed(file: Deno.FsFile, path: string): Promise<boolean> {
  const held = await file.stat();
  const now = await Deno.stat(path).catch(() => null);
  return now !== null && (held.ino === null || (held.ino === now.ino && held.dev === now.dev));
}

/** A record's distinct lines, each with its line break. */
function linesOf(bytes: Uint8Array, g: Group): Uint8Array[] {
  return g.lines.flatMap((l) => [bytes.subarray(l.start, l.end), NEWLINE]);
}

const NEWLINE = Uint8Array.of(10);

/** Writes the temporary file whole (a stale one is overwritten) and flushes it. */
async function writeWhole(
  temp: string,
  bytes: Uint8Array,
  mode: number | undefined,
): Promise<void> {
  try {
    const file = await at(
      "folder",
      Deno.open(temp, { write: true, create: true, truncate: true, mode: mode ?? 0o644 }),
    );
    try {
      for (let done = 0; done < bytes.length;) {
        done += await at("folder", file.write(bytes.subarray(done)));
      }
      await at("folder", file.sync());
    } finally {
      file.close();
    }
    if (mode !== undefined && Deno.build.os !== "windows") {
      await at("folder", Deno.chmod(temp, mode & 0o7777));
    }
  } catch (err) {
    await Deno.remove(temp).catch(() => {});
    throw err;
  }
}

function sameVersion(a: Deno.FileInfo, b: Deno.FileInfo): boolean {
  // Appends grow a file and change its time; an editor's save changes its time.
  return a.size === b.size && a.ino === b.ino && a.dev === b.dev &&
    a.mtime?.getTime() === b.mtime?.getTime();
}

function byTime(a: { time: string; id: string }, b: { time: string; id: string }): number {
  return a.time < b.time ? -1 : a.time > b.time ? 1 : a.id < b.id ? -1 : a.id > b.id ? 1 : 0;
}

function concat(parts: Uint8Array[]): Uint8Array {
  const out = new Uint8Array(parts.reduce((n, p) => n + p.length, 0));
  let at = 0;
  for (const p of parts) {
    out.set(p, at);
    at += p.length;
  }
  return out;
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
