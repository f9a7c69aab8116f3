/**
 * The run history's shapes: one record per run whose inputs differed from the
 * last recorded run, and the change report between two records. The record is
 * what the history file keeps (kernel/history/history_file.ts writes and reads
 * it); the report is what `plumb changes --json` prints, what the live page's
 * `changes` message carries and what the static record shows.
 *
 * @module
 */
import type { Change } from "../contract/history.ts";

/** One data file as a record keeps it. */
export interface RecordedFile {
  /** The path as written in the cell. */
  path: string;
  /** Lower-case hex SHA-256 of its bytes. */
  sha256: string;
  bytes: number;
  /** Text lines (a header line included), as the kernel counts them. */
  lines: number;
}

/** One cell as a record keeps it. */
export interface RecordedCell {
  name: string;
  kind: string;
  state: "current" | "failed" | "held";
  /** What the kind's history face kept of its result; null when not current or no face. */
  kept: unknown;
}

/** One run in the history. */
export interface HistoryRecord {
  /** Unique: the UTC time followed by 8 hex digits of the record's hash. */
  record: string;
  /** UTC, ISO 8601 with milliseconds. */
  time: string;
  /** Plumb's version. */
  plumb: string;
  /** The document: its path relative to the history file's folder, and SHA-256 of its bytes. */
  document: { path: string; sha256: string };
  /** The data files read, in document order. */
  files: RecordedFile[];
  /** The document's confidence level at the time. */
  level: number;
  cells: RecordedCell[];
}

/** What reading a history file found. */
export interface HistoryRead {
  /** Complete records, oldest first. */
  records: HistoryRecord[];
  /** A sentence for each part that could not be read (a torn last record, a bad line), in order. */
  problems: string[];
}

/** A data file's change between two records. */
export interface FileChange {
  path: string;
  /** SHA-256 before and after; null where the record has no such file. */
  before: string | null;
  after: string | null;
  lines_before: number | null;
  lines_after: number | null;
}

/** One cell's changes between two records. */
export interface CellChanges {
  name: string;
  kind: string;
  state_before: RecordedCell["state"] | null;
  state_after: RecordedCell["state"] | null;
  changes: Change[];
}

/** A drawn value over the recorded revisions: one fit parameter, say. */
export interface Trend {
  cell: string;
  series: string;
  unit: string | null;
  /** One point per record where the cell kept it, oldest first. */
  points: {
    record: string;
    time: string;
    n: number | null;
    value: number;
    lower: number | null;
    upper: number | null;
  }[];
}

/** The change report between two records (`plumb changes --json`). */
export interface ChangeReport {
  /** The older record compared. */
  from: { record: string; time: string };
  /** The newer record compared. */
  to: { record: string; time: string };
  /** Why `from` was chosen: "previous data revision", "previous record", "asked for". */
  baseline: string;
  document_changed: boolean;
  /** Data files whose content changed, appeared or went away. */
  files: FileChange[];
  /** Every change's sentence, notable ones first, then document order. */
  sentences: string[];
  /** Per cell present in either record, in the newer record's order, then removed cells. */
  cells: CellChanges[];
  cells_added: string[];
  cells_removed: string[];
  /** Values drawn over every record of the history (not only the two compared). */
  trends: Trend[];
  /** Records in the history, and what could not be read. */
  history: { path: string; records: number; problems: string[] };
}
