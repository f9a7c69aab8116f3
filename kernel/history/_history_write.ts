/**
 * Writing the history file: one append under a shared lock, or a rewrite
 * through its temporary name under an exclusive lock (history_file.ts draws
 * the steps). Every step that touches the disk says what it touched
 * ({@link at}), for the failure's sentence.
 *
 * @module
 */
import { dirname } from "node:path";
import { syncFolder } from "../server/atomic_write.ts";
import { at, failedAt } from "./_history_failure.ts";
import { type Group, type Scan, scanHistory } from "./_history_scan.ts";
import type { HistoryRecord } from "./types.ts";

/** Attempts before an append goes ahead without a rewrite (others keep changing the file). */
export const MAX_TRIES = 5;

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

/**
 * One attempt at appending; null when another process replaced or changed
 * the file meanwhile.
 *
 * @param path The history file.
 * @param temp Its temporary name.
 * @param record The record.
 * @param bytes The record serialised.
 * @param keep The most records to keep.
 * @param plain Append without rewriting (after `MAX_TRIES` attempts).
 * @returns What was done, or null: try again.
 */
export async function appendOnce(
  path: string,
  temp: string,
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
    return await rewrite(path, temp, before, scan, { record, bytes }, keep);
  }
  // Bounded: the count above holds only while the file is as read; the append checks it under
  // an exclusive lock, so that two appenders cannot both add to a file already at `keep`.
  const expect = before && !plain && Number.isFinite(keep) ? before.bytes.length : null;
  if (!await appendBytes(path, bytes, before === null, expect)) return null;
  return { written: true, records: records + 1, dropped: 0, repaired: 0 };
}

/** The file's bytes and what it was when read (the same handle's stat); null when there is none. */
export async function snapshot(
  path: string,
): Promise<{ bytes: Uint8Array; info: Deno.FileInfo } | null> {
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
 * holding a lock so that no rewrite renames the file away meanwhile: shared,
 * or exclusive when the append counts on the file's size.
 *
 * @param expect The size the file must still have (the appender counted its records), or null.
 * @returns False, having written nothing, when the file was renamed away before the lock was
 *   held, or no longer has the expected size.
 */
async function appendBytes(
  path: string,
  bytes: Uint8Array,
  create: boolean,
  expect: number | null,
): Promise<boolean> {
  const file = await at(
    create ? "folder" : "file",
    Deno.open(path, { read: true, append: true, create: true }),
  );
  try {
    await lock(file, expect !== null);
    const info = await file.stat();
    if (!await isNamed(file, path)) return false;
    if (expect !== null && info.size !== expect) return false;
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
  temp: string,
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
    await lock(file, true);
    if (!await isNamed(file, path) || !sameVersion(await file.stat(), before.info)) return null;
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

/** Takes an advisory lock; a file system without locks (some network folders) goes without. */
async function lock(file: Deno.FsFile, exclusive: boolean): Promise<void> {
  try {
    await file.lock(exclusive);
  } catch {
    // Without locks two Plumb processes rewriting at the same moment may lose one record.
  }
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
