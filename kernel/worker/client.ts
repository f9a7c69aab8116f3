/**
 * The kernel's side of the compute worker: starts it with no permissions,
 * sends requests, routes replies, and remembers which outputs and files the
 * worker holds so nothing is sent or computed twice.
 *
 * If the worker dies (a crash, an exhausted heap), every pending request
 * fails with that reason, the worker is started afresh, and the record of
 * what it held is cleared, so the next run recomputes what it needs.
 *
 * @module
 */
import type { FileData } from "../contract/mod.ts";
import type { CellOutput } from "../contract/mod.ts";
import { HALVES_FROM, halvesHelperWorker } from "../csv/mod.ts";
import { checkProgram, runIsolated } from "../sandbox/mod.ts";
import { answerBuffers, type EngineClient } from "../engine/client.ts";
import type { EngineAnswer, EngineProgress, EngineRFactor, EngineRows } from "../engine/types.ts";
import {
  type DoneMessage,
  type EngineRequest,
  type FromWorker,
  type Made,
  type RunRequest,
  type SandboxRequest,
  type SummaryRequest,
  type ToWorker,
  transientAnswer,
} from "./protocol.ts";

/** One cell to run: the run request without its wire fields, with file contents instead of digests. */
export interface WorkerJob extends Omit<RunRequest, "op" | "id" | "files"> {
  files: Record<string, FileData>;
  onProgress?: (fraction: number, note?: string) => void;
}

interface Pending {
  resolve: (m: DoneMessage) => void;
  onProgress?: (fraction: number, note?: string) => void;
  key: string;
  /** A run (not a summary request). */
  run?: boolean;
  /** A run's statement time limit in seconds (the document's `query_time_limit`; 0 none). */
  timeLimit?: number;
  /** The last share of the run's progress reported (the cell's own or its statement's). */
  fraction?: number;
}

/**
 * A statement's progress as a cell's progress report: the bar takes the
 * engine's share where it gives one (else it stays where the cell's last
 * report left it), and the note says it is the database's.
 *
 * @param p What the engine reported.
 * @param fraction The run's last reported share, if any.
 * @returns The share and the note.
 * @example
 * ```ts
 * import { engineProgressReport } from "./client.ts";
 * const r = engineProgressReport({ fraction: 0.4 }, 0.1);
 * if (r.fraction !== 0.4 || r.note !== "the database: 40%") throw new Error(r.note);
 * const s = engineProgressReport({ rows: 150000 }, 0.1);
 * if (s.fraction !== 0.1 || s.note !== "the database: 150,000 rows read") throw new Error(s.note);
 * ```
 */
export function engineProgressReport(
  p: EngineProgress,
  fraction: number | undefined,
): { fraction: number; note: string } {
  const parts: string[] = [];
  if (p.fraction !== undefined) parts.push(`${Math.floor(100 * p.fraction)}%`);
  if (p.rows !== undefined) parts.push(`${p.rows.toLocaleString("en")} rows read`);
  return { fraction: p.fraction ?? fraction ?? 0, note: `the database: ${parts.join(" · ")}` };
}

/** A compute worker with no permissions. */
export class ComputeWorker {
  #url: URL;
  #worker!: Worker;
  #nextId = 1;
  #pending = new Map<number, Pending>();
  /** Exports waiting for their output. */
  #exports = new Map<number, (output: CellOutput | null) => void>();
  /** Output keys the worker holds. */
  #outputs = new Set<string>();
  /** File SHA-256s the worker holds. */
  #files = new Set<string>();
  /** Where the kernel writes the id of a computing run to stop (`StopFlagMessage`). */
  #stop!: Int32Array;
  /** A CSV helper thread handed to the worker and not yet used (kernel/csv/_halves.ts). */
  #helper: Worker | null = null;
  /** User code running for a run, by run id: aborting kills its process (kernel/sandbox). */
  #isolated = new Map<number, AbortController>();
  /** Database statements running for a run, by run id: aborting cancels them (kernel/engine). */
  #engineRuns = new Map<number, AbortController>();
  /** The document's database access; null where none was given (statements are refused). */
  #engine: EngineClient | null;
  /** Number of times the worker was (re)started. */
  starts = 0;

  /**
   * @param url The worker entry module (it calls `serveComputeWorker`).
   */
  constructor(url: URL, engine: EngineClient | null = null) {
    this.#url = url;
    this.#engine = engine;
    this.#start();
  }

  #start(): void {
    this.starts++;
    this.#outputs.clear();
    this.#files.clear();
    // The cast: with the DOM library loaded (for views), WorkerOptions lacks Deno's `deno` field.
    const options = { type: "module", deno: { permissions: "none" } } as WorkerOptions;
    const w = new Worker(this.#url, options);
    w.onmessage = (e: MessageEvent<FromWorker>) => this.#receive(e.data);
    w.onerror = (e: ErrorEvent) => {
      e.preventDefault();
      this.#crash(e.message || "the compute worker stopped");
    };
    w.onmessageerror = () => this.#crash("a message could not be read");
    this.#worker = w;
    this.#stop = new Int32Array(new SharedArrayBuffer(4));
    this.#post({ op: "stop-flag", flag: this.#stop.buffer as SharedArrayBuffer });
  }

  #crash(reason: string): void {
    try {
      this.#worker.terminate();
    } catch { /* already gone */ }
    this.#stopIsolated();
    this.#dropHelper();
    const pending = [...this.#pending.entries()];
    this.#pending.clear();
    for (const give of this.#exports.values()) give(null);
    this.#exports.clear();
    this.#start();
    // Runs are answered in the order sent: the oldest unanswered one was computing.
    const computing = pending.find(([, p]) => p.run)?.[0];
    const why = `The compute worker stopped: ${reason}`;
    for (const [id, p] of pending) {
      p.resolve(transientAnswer(id, why, { computed: id === computing }));
    }
  }

  /**
   * Whether the worker holds, or will hold once the runs already sent to it
   * finish, the output under `key` (a run sent later may name it as an input).
   *
   * @param key A cache key.
   * @returns True when held or being computed here.
   */
  willHave(key: string): boolean {
    if (this.#outputs.has(key)) return true;
    for (const p of this.#pending.values()) if (p.key === key && p.run) return true;
    return false;
  }

  /**
   * Cancels the runs of these keys that the worker has not started: they are
   * answered as cancelled (transient, so not cached). A started run finishes.
   *
   * @param keys Cache keys.
   */
  cancelQueued(keys: ReadonlySet<string>): void {
    const ids = [...this.#pending].filter(([, p]) => p.run && keys.has(p.key)).map(([id]) => id);
    if (ids.length > 0) this.#post({ op: "cancel", ids });
  }

  /**
   * Stops the run computing now when its key is not listed (a newer plan no
   * longer needs it): it ends at its next progress report, answered as
   * cancelled. Cells that report no progress run to their end.
   *
   * @param keys The cache keys still wanted.
   */
  stopComputingUnless(keys: ReadonlySet<string>): void {
    // Runs are answered in the order sent: the oldest unanswered one is computing.
    for (const [id, p] of this.#pending) {
      if (!p.run) continue;
      if (!keys.has(p.key)) {
        Atomics.store(this.#stop, 0, id);
        this.#isolated.get(id)?.abort();
        this.#engineRuns.get(id)?.abort();
      }
      return;
    }
  }

  /**
   * Checks or runs user code for a run (the worker may not start processes);
   * the process is killed if the run is stopped or the worker closes.
   */
  #sandbox(m: SandboxRequest): void {
    const reply = (answer: unknown) =>
      this.#post({ op: "sandbox-answer", call: m.call, answer } as ToWorker);
    if (m.check !== undefined) {
      checkProgram(m.check).then(reply);
      return;
    }
    if (m.job === undefined) return;
    const abort = new AbortController();
    this.#isolated.set(m.id, abort);
    runIsolated(m.job, abort.signal).then((answer) => {
      if (this.#isolated.get(m.id) === abort) this.#isolated.delete(m.id);
      reply(answer);
    });
  }

  #stopIsolated(): void {
    for (const a of this.#isolated.values()) a.abort();
    this.#isolated.clear();
    for (const a of this.#engineRuns.values()) a.abort();
    this.#engineRuns.clear();
  }

  /** Asks the document's engine for a run; the statement is cancelled if the run is stopped. */
  #engineRequest(m: EngineRequest): void {
    // Numeric columns and R move to the worker rather than being copied.
    const reply = (answer: EngineAnswer<EngineRows> | EngineAnswer<EngineRFactor>) =>
      this.#post({ op: "sandbox-answer", call: m.call, answer }, answerBuffers(answer));
    if (this.#engine === null) {
      reply({ ok: false, why: "cannot-start", message: "No database can be reached here", ms: 0 });
      return;
    }
    let abort = this.#engineRuns.get(m.id);
    if (abort === undefined) this.#engineRuns.set(m.id, abort = new AbortController());
    // The run's own progress report shows the statement's; its settings give the time limit.
    const run = this.#pending.get(m.id);
    const options = {
      signal: abort.signal,
      timeLimit: run?.timeLimit,
      progress: run?.onProgress === undefined ? undefined : (e: EngineProgress) => {
        const p = this.#pending.get(m.id);
        if (p?.onProgress === undefined) return;
        const r = engineProgressReport(e, p.fraction);
        p.fraction = r.fraction;
        p.onProgress(r.fraction, r.note);
      },
    };
    const asked = m.ask === "rows"
      ? this.#engine.rows(m.db, m.sql, m.maxRows, options)
      : this.#engine.rfactor(m.db, m.sql, options);
    asked.then(reply);
  }

  #receive(m: FromWorker): void {
    if (m.op === "sandbox") return this.#sandbox(m);
    if (m.op === "engine") return this.#engineRequest(m);
    if (m.op === "helper-used") {
      this.#helper = null; // it closes itself when done
      return;
    }
    if (m.op === "output") {
      const give = this.#exports.get(m.id);
      this.#exports.delete(m.id);
      give?.(m.output === undefined ? null : m.output as CellOutput);
      return;
    }
    const p = this.#pending.get(m.id);
    if (!p) return;
    if (m.op === "progress") {
      p.fraction = m.fraction;
      p.onProgress?.(m.fraction, m.note);
      return;
    }
    this.#pending.delete(m.id);
    this.#engineRuns.delete(m.id);
    if (m.ok) this.#outputs.add(p.key);
    p.resolve(m);
  }

  #post(m: ToWorker, transfer: Transferable[] = []): void {
    this.#worker.postMessage(m, transfer);
  }

  /**
   * Hands the worker a CSV helper thread for a large file's read, started here
   * (a worker started inside the compute worker took about a second to begin):
   * the two meet through a port; the helper reads one half once, then closes.
   */
  #offerHelper(): void {
    if (this.#helper !== null) return;
    const helper = halvesHelperWorker();
    if (helper === null) return;
    const channel = new MessageChannel();
    helper.postMessage({ port: channel.port1 }, [channel.port1]);
    this.#post({ op: "helper", port: channel.port2 }, [channel.port2]);
    this.#helper = helper;
  }

  #dropHelper(): void {
    this.#helper?.terminate();
    this.#helper = null;
  }

  /**
   * Whether the worker holds the output stored under `key`.
   *
   * @param key A cache key.
   * @returns True when a later job may name it as an input.
   */
  has(key: string): boolean {
    return this.#outputs.has(key);
  }

  /**
   * Runs one cell; resolves with the worker's reply (never rejects).
   *
   * @param job What to run.
   * @returns The reply, with the summary (a page copy as JSON text, `summaryJson`,
   *   when `job.page` is given) or the unlocated error, and whether the worker
   *   `computed` the cell for it.
   */
  run(job: WorkerJob): Promise<DoneMessage> {
    const files: Record<string, string> = {};
    for (const [path, f] of Object.entries(job.files)) {
      if (f.bytes.length >= HALVES_FROM) this.#offerHelper();
      if (!this.#files.has(f.sha256)) {
        // Bytes in a SharedArrayBuffer (FileStore reads them so) cross as that same memory, not a
        // copy: 137 MB copied cost 0.75 s here. Both sides only read them.
        this.#post({ op: "file", sha256: f.sha256, path, bytes: f.bytes });
        this.#files.add(f.sha256);
      }
      files[path] = f.sha256;
    }
    const id = this.#nextId++;
    return new Promise((resolve) => {
      this.#pending.set(id, {
        resolve,
        onProgress: job.onProgress,
        key: job.key,
        run: true,
        timeLimit: job.settings.queryTimeLimit,
      });
      this.#post({
        op: "run",
        id,
        key: job.key,
        kind: job.kind,
        name: job.name,
        spec: job.spec,
        settings: job.settings,
        inputs: job.inputs,
        files,
        ...(job.stamp === undefined ? {} : { stamp: job.stamp }),
        ...(job.page === undefined ? {} : { page: job.page }),
        ...(job.keep ? { keep: true } : {}),
        ...(job.lean === undefined ? {} : { lean: job.lean }),
        ...(job.letGo === undefined ? {} : { letGo: job.letGo }),
      });
      // The worker drops them after this run: a later run reading one sends it again.
      for (const sha of job.letGo ?? []) this.#files.delete(sha);
    });
  }

  /**
   * Summarises an output the worker holds again, in another shape; nothing is
   * recomputed. Resolves with an error reply when the output is not held.
   *
   * @param req The output's key, its kind and spec, and the shape.
   * @returns The reply, with the summary.
   */
  summarize(req: Omit<SummaryRequest, "op" | "id">): Promise<DoneMessage> {
    const id = this.#nextId++;
    return new Promise((resolve) => {
      this.#pending.set(id, { resolve, key: req.key });
      this.#post({ op: "summary", id, ...req });
    });
  }

  /**
   * A copy of an output the worker holds (for another worker that needs it).
   * Answered between runs: at most one running cell's time later.
   *
   * @param key The output's cache key.
   * @returns The output (a structured clone), or null when the worker does not hold it.
   */
  exportOutput(key: string): Promise<CellOutput | null> {
    if (!this.#outputs.has(key)) return Promise.resolve(null);
    const id = this.#nextId++;
    return new Promise((resolve) => {
      this.#exports.set(id, resolve);
      this.#post({ op: "export", id, key });
    });
  }

  /**
   * Gives the worker an output computed elsewhere, stored under its key
   * before any later run reads it.
   *
   * @param key The output's cache key.
   * @param output The output.
   * @param made The kind and spec that made it (what `RunContext.summaryOf` needs).
   */
  importOutput(key: string, output: CellOutput, made?: Made): void {
    this.#post({ op: "import", key, output, ...(made ? { made } : {}) });
    this.#outputs.add(key);
  }

  /**
   * Lets the worker drop every output and file not listed.
   *
   * @param keys Output keys still needed.
   * @param shas File digests still needed.
   */
  retain(keys: Iterable<string>, shas: Iterable<string>): void {
    const k = new Set(keys), s = new Set(shas);
    for (const x of this.#outputs) if (!k.has(x)) this.#outputs.delete(x);
    for (const x of this.#files) if (!s.has(x)) this.#files.delete(x);
    // Outputs of runs still in its queue are kept too when listed (a retain sent mid-run).
    const coming = [...this.#pending.values()].filter((p) => p.run && k.has(p.key));
    const kept = [...new Set([...this.#outputs, ...coming.map((p) => p.key)])];
    this.#post({ op: "retain", keys: kept, shas: [...this.#files] });
  }

  /** Stops the worker. */
  close(): void {
    this.#worker.terminate();
    this.#stopIsolated();
    this.#dropHelper();
    for (const [id, p] of this.#pending) {
      p.resolve(transientAnswer(id, "The compute worker was closed"));
    }
    this.#pending.clear();
    for (const give of this.#exports.values()) give(null);
    this.#exports.clear();
  }
}
