/**
 * What a static record is made from: the document as blocks, each cell's
 * settled report, the data files it read, and the facts of the run.
 * Everything here is plain data (the CLI gathers it, kernel/cli/export.ts),
 * so a record can be rendered again from a saved copy.
 *
 * @module
 */
import type { CellReport } from "../../kernel/session/types.ts";
import type { DocSettings } from "../../kernel/contract/mod.ts";
import type { ChangeReport } from "../../kernel/history/types.ts";

/** One block of the document, in order. */
export type RecordBlock =
  | { type: "prose"; line: number; text: string }
  | { type: "cell"; name: string; kind: string; line: number; body: string };

/** A data file the run read. */
export interface RecordFile {
  /** The path as the document names it (relative to the document's folder). */
  path: string;
  /** SHA-256 of the file's bytes as read, lower-case hex. */
  sha256: string | null;
  /** The table cells reading it, with their rows read and used. */
  tables: { cell: string; rowsRead: number; rowsUsed: number; excluded: number }[];
}

/** Everything a record shows. */
export interface RecordInput {
  title: string;
  document: { path: string; sha256: string; bytes: number };
  blocks: RecordBlock[];
  /** Every cell's report (RUN-JSON shape: state, error, warnings, complete result). */
  cells: CellReport[];
  /** Errors outside cells (front matter, prose references). */
  errors: { message: string; line: number; column: number }[];
  files: RecordFile[];
  settings: DocSettings;
  versions: { plumb: string; deno: string; v8: string; os: string };
  /**
   * When the run happened, ISO 8601 UTC, and how long it took (null when the
   * record is to be reproducible: `SOURCE_DATE_EPOCH` set).
   */
  run: { utc: string; ms: number | null; reproducible: boolean };
  /**
   * What changed since the previous data revision (the run history's report)
   * and what the history could not do; absent or null without a history.
   */
  changes?: { report: ChangeReport | null; notes: string[] } | null;
}
