/**
 * Messages between the kernel (main thread) and the compute worker.
 *
 * ```
 *  main                                   worker (no permissions)
 *   │ run {id, key, kind, spec, inputs:{name→key}, files:{path→sha}, page?} ──▶
 *   │ summary {id, key, kind, spec, page?}  (summarise a held output again) ──▶
 *   │ file {sha, bytes}  (only for content the worker lacks)         ──▶
 *   │ ◀── progress {id, fraction, note}
 *   │ ◀── done {id, ok, computed, summary | summaryJson | error, warnings, ms}
 *   │ retain {keys, shas}  (drop every other output and file)        ──▶
 *   │ export {id, key} ──▶ ◀── output {id, output | absent}  (answered between runs)
 *   │ import {key, output}  (an output another worker computed)       ──▶
 *   │ cancel {ids}  (runs not yet started: answered as cancelled)      ──▶
 *   │ ◀── sandbox {id, call, check | job}  (user code: the main thread starts the process)
 *   │ sandbox-answer {call, answer}                                    ──▶
 *   │ ◀── engine {id, call, ask, db, sql, maxRows}  (a database statement: the main thread asks)
 *   │ sandbox-answer {call, answer}                                    ──▶
 * ```
 *
 * Runs are answered in the order they were sent, so the kernel may send a
 * cell's run before the runs of its inputs have finished: the worker runs
 * it after them (a failed input leaves it without that input, and the
 * kernel reports the cell held).
 *
 * Outputs stay in the worker that computed them: a cell's output is stored
 * under its cache key and later runs name their inputs by key. With several
 * workers (kernel/worker/pool.ts) a cell may run on a worker that lacks an
 * input; the kernel then copies that output over (export, then import: a
 * structured clone, 0.5–2 ms for a 10,000-row fit) instead of computing it
 * again. Only summaries (plain JSON)
 * come back: complete (RUN-JSON) by default, or, with `page`, the live
 * page's copy (no per-row arrays the page does not read) as JSON text, which
 * keeps the reply of a 10,000-row fit at about 2 kB instead of 430 kB
 * (copying that across threads took 6–7 ms a fit and 20 ms for a check);
 * the server forwards that text to the page as it is.
 *
 * A `done` says whether the cell was `computed` (the kind's `run` was called,
 * whether it returned or threw): false for a cancelled run, an input or file
 * the worker lacks, an unknown kind or a summary request, so the kernel
 * counts a computation only when one happened.
 *
 * @module
 */
import type { DocSettings, OptionPath } from "../contract/mod.ts";
import { isMovable, ROWS_TYPED_FROM } from "../arrays.ts";
import type { CheckAnswer, IsolateAnswer, IsolateJob } from "../sandbox/mod.ts";
import type { DatabaseRef, EngineAnswer, EngineRFactor, EngineRows } from "../engine/types.ts";

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
  /** The cell's stamp as planned (`CellKind.stamp`, a database answer's fingerprint), if any. */
  stamp?: string;
  /**
   * Present: reply with the page's copy of the summary, keeping these
   * top-level fields even where the page would leave them out (inline values
   * name them). Absent: the complete summary.
   */
  page?: string[];
  /** True: also answer with what the run history keeps (`DoneMessage.kept`). */
  keep?: boolean;
  /**
   * SHA-256s of files no run sent after this one reads (one-shot runs): the
   * worker drops them once this run is done and, for large ones, collects its
   * garbage before the next run, so their bytes do not stay resident beside
   * the later cells' arrays until the run's end.
   */
  letGo?: string[];
  /**
   * Present (requests without `page`): leave the kind's per-row fields
   * (`CellKind.rows`) out of the complete summary, except these (inline values
   * name them); the answer's `omitted` lists what was left out.
   */
  lean?: string[];
}

/** Summarise an output the worker holds again, in another shape (nothing is recomputed). */
export interface SummaryRequest {
  op: "summary";
  id: number;
  key: string;
  kind: string;
  spec: unknown;
  /** As in {@link RunRequest.page}. */
  page?: string[];
  /** As in {@link RunRequest.keep}. */
  keep?: boolean;
  /** As in {@link RunRequest.lean}. */
  lean?: string[];
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

/** Send back the output stored under a key (not queued behind runs). */
export interface ExportRequest {
  op: "export";
  id: number;
  key: string;
}

/** Store an output computed by another worker under its key. */
export interface ImportMessage {
  op: "import";
  key: string;
  output: unknown;
  /** The kind and spec that made it (for `RunContext.summaryOf`). */
  made?: Made;
}

/** The kind and spec that made a stored output. */
export interface Made {
  kind: string;
  spec: unknown;
}

/** Answer these runs, if not yet started, as cancelled (transient) instead of running them. */
export interface CancelMessage {
  op: "cancel";
  ids: number[];
}

/** A message from the kernel to the worker. */
export type ToWorker =
  | CancelMessage
  | RunRequest
  | SummaryRequest
  | FileMessage
  | RetainMessage
  | ExportRequest
  | ImportMessage
  | HelperMessage
  | StopFlagMessage
  | SandboxAnswerMessage;

/**
 * A run's request to check or run user code (`RunContext.sandbox`): the
 * worker has no permission to start a process, the main thread has
 * (kernel/sandbox). `id` is the run's, so stopping the run kills the process.
 */
export interface SandboxRequest {
  op: "sandbox";
  id: number;
  call: number;
  /** A program to type-check, or a job to run. */
  check?: string;
  job?: IsolateJob;
}

/**
 * A run's request to a database engine (`RunContext.engine`): the worker has
 * no permission to start the engine's process or reach a server; the main
 * thread has (kernel/engine). `id` is the run's, so stopping the run cancels
 * the statement.
 */
export interface EngineRequest {
  op: "engine";
  id: number;
  call: number;
  ask: "rows" | "rfactor";
  db: DatabaseRef;
  sql: string;
  maxRows: number;
}

/** The main thread's answer to a {@link SandboxRequest} or an {@link EngineRequest}. */
export interface SandboxAnswerMessage {
  op: "sandbox-answer";
  call: number;
  answer: CheckAnswer | IsolateAnswer | EngineAnswer<EngineRows> | EngineAnswer<EngineRFactor>;
}

/**
 * The worker's stop flag, sent once after it starts: the kernel writes there
 * the id of a run it wants stopped while computing (its inputs changed); the
 * run stops at its next progress report (`RunContext.progress`) and is
 * answered as cancelled. Shared memory, since the worker is busy and reads
 * no message until the run ends.
 */
export interface StopFlagMessage {
  op: "stop-flag";
  flag: SharedArrayBuffer;
}

/**
 * A port to a helper thread for the next large CSV read (kernel/csv/_halves.ts):
 * started by the main thread, since a worker started inside the compute
 * worker took about a second to begin.
 */
export interface HelperMessage {
  op: "helper";
  port: MessagePort;
}

/** The helper given has had its job: the next large read needs another. */
export interface HelperUsedMessage {
  op: "helper-used";
}

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
  /** True for a run cancelled before it started (a newer run took over). */
  cancelled?: boolean;
}

/** The answer to a run or a summary request. */
export interface DoneMessage {
  op: "done";
  id: number;
  ok: boolean;
  /**
   * True when the worker computed the cell for this answer (the kind's `run`
   * was called); false when it answered without computing (cancelled, an
   * input or file it lacks, an unknown kind, a summary request, a stopped worker).
   */
  computed: boolean;
  /**
   * The complete summary (requests without `page`). Its per-row fields (top-level
   * arrays of {@link PACK_FROM} numbers or more) travel as Float64Array, moved
   * rather than copied (`packRows`): a million-row check's summary as plain
   * arrays took 1.2 s to read back on the main thread. Readers index them as
   * arrays; RUN-JSON writes them as arrays (kernel/cli/json_stream.ts).
   */
  summary?: unknown;
  /**
   * A page copy as JSON text instead of `summary` (page requests only; the
   * server forwards it to the page as it is): copying text between threads
   * takes about a quarter of the time of copying the same result as objects,
   * measured on a check's page copy with its counted charts (0.07 against 0.29 ms).
   */
  summaryJson?: string;
  /** Fields of the complete summary left out of this page copy, or of a lean summary. */
  omitted?: string[];
  /**
   * What the run history keeps of the result (the kind's `history.keep`), when
   * asked (`keep`) and the kind has a history face; null when keeping failed.
   */
  kept?: unknown;
  line?: string;
  error?: WireError;
  warnings: string[];
  ms: number;
}

/** Progress of a run in its worker, sent after 100 ms and then at most every 50 ms. */
export interface ProgressMessage {
  op: "progress";
  id: number;
  fraction: number;
  note?: string;
}

/** The answer to an export: the output, or absent when the worker does not hold it. */
export interface OutputMessage {
  op: "output";
  id: number;
  output?: unknown;
}

/** A message from the worker to the kernel. */
export type FromWorker =
  | DoneMessage
  | ProgressMessage
  | OutputMessage
  | HelperUsedMessage
  | SandboxRequest
  | EngineRequest;

/**
 * An answer given without a result of the cell's own: a run cancelled before
 * it started, or runs a worker will not answer (it stopped, or was closed).
 * Transient, so never cached.
 *
 * @param id The request's id.
 * @param message Why, for people.
 * @param how `cancelled` for a cancelled run; `computed` when the cell was computing.
 * @returns The failed answer.
 * @example
 * ```ts
 * import { transientAnswer } from "./protocol.ts";
 * const d = transientAnswer(7, "Cancelled", { cancelled: true });
 * if (d.ok || d.computed || !d.error?.transient || !d.error.cancelled) throw new Error();
 * ```
 */
export function transientAnswer(
  id: number,
  message: string,
  how: { cancelled?: boolean; computed?: boolean } = {},
): DoneMessage {
  const error: WireError = { message, internal: false, transient: true };
  if (how.cancelled) error.cancelled = true;
  return { op: "done", id, ok: false, computed: how.computed ?? false, warnings: [], ms: 0, error };
}

/** Arrays of this many numbers or more cross between threads as Float64Array. */
export const PACK_FROM = ROWS_TYPED_FROM;

/**
 * A summary with its long plain number arrays (top-level fields) as
 * Float64Array, and their buffers, to be moved with the message.
 *
 * @param summary A kind's complete summary (plain JSON).
 * @returns The packed summary (a new object where anything was packed) and the buffers.
 * @example
 * ```ts
 * import { packRows, PACK_FROM } from "./protocol.ts";
 * const fitted = Array.from({ length: PACK_FROM }, (_, i) => i / 2);
 * const { summary, buffers } = packRows({ n: 3, fitted });
 * const f = (summary as { fitted: Float64Array }).fitted;
 * if (!(f instanceof Float64Array) || f[3] !== 1.5 || buffers.length !== 1) throw new Error("packed");
 * ```
 */
export function packRows(summary: unknown): { summary: unknown; buffers: ArrayBuffer[] } {
  const buffers: ArrayBuffer[] = [];
  if (summary === null || typeof summary !== "object" || Array.isArray(summary)) {
    return { summary, buffers };
  }
  let packed: Record<string, unknown> | null = null;
  for (const [k, v] of Object.entries(summary)) {
    if (isMovable(v)) {
      if (!buffers.includes(v.buffer as ArrayBuffer)) buffers.push(v.buffer as ArrayBuffer);
      continue;
    }
    if (!Array.isArray(v) || v.length < PACK_FROM) continue;
    const a = new Float64Array(v.length);
    let all = true;
    for (let i = 0; i < v.length && all; i++) {
      const x = v[i];
      if (typeof x === "number") a[i] = x;
      else all = false;
    }
    if (!all) continue;
    packed ??= { ...summary };
    packed[k] = a;
    buffers.push(a.buffer);
  }
  return { summary: packed ?? summary, buffers };
}
