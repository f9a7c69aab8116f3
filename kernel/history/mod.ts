/**
 * The run history of a document: a record appended beside the document for
 * each run whose inputs differ from the last recorded run, and the change
 * report between two records. Used by `plumb run`, `plumb changes`,
 * `plumb serve` and `plumb export`; docs/history.md describes the file.
 *
 * ```
 *  run report (kept per cell) ──makeRecord──▶ record ──same inputs as the last?──▶ no: appendRecord
 *  readHistory ──▶ records ──changeReport(registry)──▶ { sentences, cells[].changes, trends }
 * ```
 *
 * @module
 */
import { basename } from "node:path";
import type { Registry } from "../contract/mod.ts";
import type { RunReport } from "../session/types.ts";
import { appendRecord, historyPath, readHistory } from "./history_file.ts";
import { makeRecord, sameInputs } from "./record.ts";
import { changeReport, type ReportChoice } from "./report.ts";
import type { ChangeReport, HistoryRead } from "./types.ts";

export {
  type Appended,
  appendRecord,
  HistoryFileError,
  historyPath,
  historyTempPath,
  lastRecord,
  readHistory,
} from "./history_file.ts";
export { makeRecord, sameData, sameInputs } from "./record.ts";
export { changeReport, ChoiceError, type ReportChoice } from "./report.ts";
export type * from "./types.ts";

/** The default number of records a history keeps (front matter `history:`). */
export const DEFAULT_KEEP = 100;

/** What recording a run did, and what changed since the previous data revision. */
export interface Recorded {
  /** The history file. */
  path: string;
  /** True when a record was appended (false: the same inputs as the last record, or a failure). */
  written: boolean;
  /** Records in the history after this run (in memory when the write failed). */
  records: number;
  /** The report against the previous data revision; null with fewer than two records. */
  report: ChangeReport | null;
  /** Sentences on what went wrong: the write failed, a torn record was left out. */
  notes: string[];
}

/** What {@link recordRun} needs. */
export interface RecordRunOptions {
  /** The document's file. */
  document: string;
  /** Lower-case hex SHA-256 of the document's bytes as run. */
  documentSha256: string;
  /** The run's report, made with the session's `history: true`. */
  report: RunReport;
  registry: Registry;
  /** The cells a cell reads directly (for the rows its report mentions). */
  inputsOf?: (cell: string) => readonly string[];
  /** When the run finished (default: now). */
  time?: Date;
  /** Write nothing: report as if the record had been appended (no leave to write). */
  dryRun?: boolean;
  /**
   * The history as this process last left it, kept by a caller that records
   * many runs (the live workspace): while the file's size and modification
   * time are as they were after our own write, it is not read again.
   */
  cache?: HistoryCache;
}

/** The history as a process last wrote it, and the file's size and time then. */
export interface HistoryCache {
  state: { size: number; mtimeMs: number; read: HistoryRead } | null;
}

/** The file's size and modification time, or null when it cannot be stat'ed. */
async function stamp(path: string): Promise<{ size: number; mtimeMs: number } | null> {
  try {
    const s = await Deno.stat(path);
    return { size: s.size, mtimeMs: s.mtime?.getTime() ?? -1 };
  } catch {
    return null;
  }
}

/**
 * Records a run in the document's history (unless its inputs equal the last
 * record's, or the document says `history: off`) and reports what changed
 * since the previous data revision. Never throws for the history's sake: a
 * failed write is a note, and the report is still made with the new record
 * held in memory.
 *
 * @param opts The document, its hash, the run's report and the kinds.
 * @returns What was recorded and the report.
 */
export async function recordRun(opts: RecordRunOptions): Promise<Recorded | null> {
  const keep = opts.report.settings.history ?? DEFAULT_KEEP;
  if (keep === 0) return null;
  const path = historyPath(opts.document);
  const notes: string[] = [];
  let read: HistoryRead;
  const cached = opts.cache?.state ?? null;
  const now = cached ? await stamp(path) : null;
  if (cached && now && now.size === cached.size && now.mtimeMs === cached.mtimeMs) {
    read = cached.read;
  } else {
    try {
      const before = opts.cache ? await stamp(path) : null;
      read = await readHistory(path);
      if (opts.cache) opts.cache.state = before ? { ...before, read } : null;
    } catch (err) {
      notes.push((err as Error).message);
      read = { records: [], problems: [] };
    }
  }
  notes.push(...read.problems);
  const record = makeRecord({
    documentPath: basename(opts.document),
    documentSha256: opts.documentSha256,
    report: opts.report,
    time: opts.time,
  });
  const last = read.records[read.records.length - 1];
  let records = read.records;
  let written = false;
  if (!last || !sameInputs(last, record)) {
    // Trimmed in batches: up to `slack` records beyond `keep` are let stand, so
    // the file is rewritten once every `slack` runs, not on every run once full.
    const slack = Math.max(10, Math.ceil(keep / 10));
    const bound = records.length + 1 > keep + slack ? keep : keep + slack;
    records = [...records, record].slice(-bound);
    try {
      if (!opts.dryRun) {
        await appendRecord(path, record, { keep: bound });
        written = true;
        const after = opts.cache ? await stamp(path) : null;
        if (opts.cache) {
          opts.cache.state = after ? { ...after, read: { records, problems: [] } } : null;
        }
      }
    } catch (err) {
      notes.push((err as Error).message);
    }
  }
  const report = changeReport(
    { records, problems: read.problems },
    opts.registry,
    path,
    {},
    opts.inputsOf,
  );
  return { path, written, records: records.length, report, notes };
}

/**
 * The report of a document's history between two records (`plumb changes`).
 *
 * @param document The document's file.
 * @param registry The kinds.
 * @param choice Which records (default: the newest against the previous data revision).
 * @param inputsOf The cells a cell reads directly, from the current document.
 * @returns The report (null with fewer than two records) and what could not be read.
 * @throws ChoiceError when the choice names no record.
 */
export async function reportOf(
  document: string,
  registry: Registry,
  choice: ReportChoice = {},
  inputsOf?: (cell: string) => readonly string[],
): Promise<{ path: string; records: number; report: ChangeReport | null; notes: string[] }> {
  const path = historyPath(document);
  const read = await readHistory(path);
  return {
    path,
    records: read.records.length,
    report: changeReport(read, registry, path, choice, inputsOf),
    notes: read.problems,
  };
}
