/**
 * What a session's run passes between its steps, and small helpers on outcomes
 * (kept apart from session.ts to hold it under the style's file length).
 *
 * @module
 */
import type { ParsedDocument } from "../document/mod.ts";
import type { LocatedError } from "../errors.ts";
import type { CellNode } from "../graph/build.ts";
import type { ComputeWorker } from "../worker/client.ts";
import type { DoneMessage } from "../worker/protocol.ts";

/** How a run hands a cell to the workers. */
export interface Dispatch {
  /** Told when the cell is given a worker. */
  started: (node: CellNode, w: ComputeWorker) => void;
  /** Sent ahead into a worker's queue, before its inputs' answers (`settled`) came back. */
  early?: { worker: ComputeWorker; settled: Promise<unknown> } | null;
  /** False once the run was superseded: its cells then settle without telling the listener. */
  live: () => boolean;
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
