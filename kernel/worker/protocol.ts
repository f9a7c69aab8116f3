/**
 * Messages between the kernel (main thread) and the compute worker.
 *
 * ```
 *  main                                   worker (no permissions)
 *   │ run {id, key, kind, spec, inputs:{name→key}, files:{path→sha}} ──▶
 *   │ file {sha, bytes}  (only for content the worker lacks)         ──▶
 *   │ ◀── progress {id, fraction, note}
 *   │ ◀── done {id, ok, summary | error, warnings, ms}
 *   │ retain {keys, shas}  (drop every other output and file)        ──▶
 * ```
 *
 * Outputs never leave the worker: a cell's output is stored under its cache
 * key and later runs name their inputs by key. Only summaries (plain JSON)
 * come back.
 *
 * @module
 */
import type { DocSettings, OptionPath } from "../../cells/types.ts";

/** Run one cell. */
export interface RunRequest {
  op: "run";
  id: number;
  key: string;
  kind: string;
  name: string;
  spec: unknown;
  settings: DocSettings;
  /** Input cell name → cache key of its output (already in the worker's store). */
  inputs: Record<string, string>;
  /** File path as written → SHA-256 of its content (already sent). */
  files: Record<string, string>;
}

/** File content, sent once per distinct SHA-256. */
export interface FileMessage {
  op: "file";
  sha256: string;
  path: string;
  bytes: Uint8Array;
}

/** Keep only these outputs and files. */
export interface RetainMessage {
  op: "retain";
  keys: string[];
  shas: string[];
}

export type ToWorker = RunRequest | FileMessage | RetainMessage;

/** A failure as thrown by cell code, still unlocated. */
export interface WireError {
  message: string;
  /** Present for a CellError. */
  path?: OptionPath;
  offset?: number;
  /** True when the error was not a CellError (a bug, or an engine limit). */
  internal: boolean;
  /** True when the failure is not the cell's (the worker stopped): not cached. */
  transient?: boolean;
}

export interface DoneMessage {
  op: "done";
  id: number;
  ok: boolean;
  summary?: unknown;
  line?: string;
  error?: WireError;
  warnings: string[];
  ms: number;
}

export interface ProgressMessage {
  op: "progress";
  id: number;
  fraction: number;
  note?: string;
}

export type FromWorker = DoneMessage | ProgressMessage;
