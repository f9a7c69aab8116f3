/**
 * What a session lends each of its runs (kernel/session/run.ts), and small
 * helpers on outcomes.
 *
 * ```
 *  Session ── RunHost: workers, files, outcome cache, planning, listener ──▶ Run
 * ```
 *
 * @module
 */
import type { ParsedDocument } from "../document/mod.ts";
import type { LocatedError } from "../errors.ts";
import type { WorkerPool } from "../worker/pool.ts";
import type { DoneMessage } from "../worker/protocol.ts";
import type { FileStore } from "./files.ts";
import type { Stamps } from "./stamps.ts";
import type { Plan, SessionEvent } from "./types.ts";

/** A plan before the data files are read: no keys yet. */
export type Prepared = Omit<Plan, "keys" | "stale">;

/** What a run uses of its session. */
export interface RunHost {
  /** The compute workers. */
  pool: WorkerPool;
  /** The data files, read on the main thread. */
  files: FileStore;
  /** Fingerprints of database answers, asked on the main thread (stamps.ts). */
  stamps: Stamps;
  /** Answers kept by cache key, across runs. */
  outcomes: Map<string, Outcome>;
  /** Whether results are the page's copies (`SessionOptions.page`). */
  page: boolean;
  /** Whether each answer carries what the run history keeps (`SessionOptions.history`). */
  keep: boolean;
  /** Whether results leave out per-row fields (`SessionOptions.lean`). */
  lean: boolean;
  /** Whether data files are let go once read (`SessionOptions.once`). */
  once: boolean;
  /** Parses and checks a document (the last one is remembered). */
  prepare(source: string): Prepared;
  /** Keys every cell that can run, given the SHA-256 of each data file. */
  keyed(prep: Prepared, fileShas: ReadonlyMap<string, string>): Plan;
  /** Tells the session's listener. */
  emit(e: SessionEvent): void;
  /** Counts one computation of a cell (`Session.runs`). */
  computed(name: string): void;
}

/** A cell's answer kept under its cache key. */
export interface Outcome {
  done: DoneMessage;
  /** The fields kept beyond the page's copy (sorted, joined), or null for a complete summary. */
  shape: string | null;
}

/** A located error as a report's plain position. */
export const located = (e: LocatedError) => ({
  message: e.message,
  line: e.pos.line,
  column: e.pos.column,
});

/** Whether a failed answer is not the cell's own (the worker stopped, a cancel): not cached. */
export function isTransient(done: DoneMessage): boolean {
  return !done.ok && done.error?.transient === true;
}

/** Document errors that belong to a cell (an unclosed fence) are reported on that cell instead. */
export function isCellError(doc: ParsedDocument, e: LocatedError): boolean {
  return doc.blocks.some((b) => b.type === "cell" && b.error === e);
}
