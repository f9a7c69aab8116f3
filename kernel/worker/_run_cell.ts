/**
 * The compute worker's two answers that summarise a cell: run it (gather its
 * inputs and files from the worker's store, call the kind's `run`, keep the
 * output, summarise), or summarise an output it keeps again in another shape.
 *
 * ```
 *  run {key, kind, inputs:{name→key}, files:{path→sha}, page?}
 *    │ gatherInputs: every input and file in the store? ── no ──▶ done {computed: false}
 *    ▼
 *  compute: kind.run(spec, ctx) ── throws ──▶ done {computed: true, error}
 *    │ outputs[key] = output
 *    ▼
 *  summarise: complete summary, or the page's copy as JSON text ──▶ done {computed: true}
 * ```
 *
 * @module
 */
import type { CellKind, CellOutput, FileData, Registry, RunContext } from "../contract/mod.ts";
import type { CheckAnswer, IsolateAnswer } from "../sandbox/mod.ts";
import type { DatabaseRef, EngineAccess } from "../engine/types.ts";
import { plainDeep } from "../arrays.ts";
import { CellError } from "../errors.ts";
import { pageCopy, pageLeavesOut } from "./page_copy.ts";
import {
  type DoneMessage,
  type FromWorker,
  type Made,
  type RunRequest,
  type SandboxAnswerMessage,
  type SummaryRequest,
  transientAnswer,
  type WireError,
} from "./protocol.ts";

/** Progress of a run is first sent this long after it started (ms). */
const PROGRESS_AFTER_MS = 100;
/** Then at most this often (ms): each message costs both threads about 0.4 ms (measured). */
const PROGRESS_EVERY_MS = 50;

/** What a compute worker keeps between messages. */
export interface WorkerStore {
  /** Cell outputs by cache key. */
  outputs: Map<string, CellOutput>;
  /** File contents by SHA-256. */
  files: Map<string, FileData>;
  /** The id of a run the kernel wants stopped, at index 0 (`StopFlagMessage`); null before it came. */
  stop?: Int32Array | null;
  /** The kind and spec that made each stored output, by key (for `RunContext.summaryOf`). */
  made?: Map<string, Made>;
  /** Sandbox requests waiting for the main thread's answer, by call number. */
  calls?: Map<number, (answer: SandboxAnswerMessage["answer"]) => void>;
}

let nextCall = 1;

/**
 * A request to the main thread for one run, answered by a `sandbox-answer`
 * message carrying its call number.
 */
function askMain(
  store: WorkerStore,
  post: (m: FromWorker) => void,
): <A>(message: (call: number) => FromWorker) => Promise<A> {
  return <A>(message: (call: number) => FromWorker) =>
    new Promise<A>((resolve) => {
      const call = nextCall++;
      store.calls ??= new Map();
      store.calls.set(call, (answer) => {
        store.calls!.delete(call);
        resolve(answer as A);
      });
      post(message(call));
    });
}

/** `RunContext.sandbox` for one run: requests to the main thread, answered by message. */
function sandboxFor(
  store: WorkerStore,
  id: number,
  post: (m: FromWorker) => void,
): NonNullable<RunContext["sandbox"]> {
  const ask = askMain(store, post);
  return {
    check: (program) => ask<CheckAnswer>((call) => ({ op: "sandbox", id, call, check: program })),
    run: (job) => ask<IsolateAnswer>((call) => ({ op: "sandbox", id, call, job })),
  };
}

/** `RunContext.engine` for one run: statements asked of the main thread, answered by message. */
function engineFor(
  store: WorkerStore,
  id: number,
  post: (m: FromWorker) => void,
): EngineAccess {
  const ask = askMain(store, post);
  const engine =
    (m: { ask: "rows" | "rfactor"; db: DatabaseRef; sql: string; maxRows: number }) =>
    (call: number): FromWorker => ({ op: "engine", id, call, ...m });
  return {
    rows: (db, sql, maxRows) => ask(engine({ ask: "rows", db, sql, maxRows })),
    rfactor: (db, sql) => ask(engine({ ask: "rfactor", db, sql, maxRows: 0 })),
  };
}

/** `RunContext.summaryOf`: an input's complete RUN-JSON result, as its own kind makes it. */
function inputSummary(
  registry: Registry,
  store: WorkerStore,
  inputs: Record<string, string>,
  name: string,
): { result: unknown; rows: readonly string[] } | null {
  if (!Object.hasOwn(inputs, name)) return null;
  const key = inputs[name];
  const out = store.outputs.get(key);
  const made = store.made?.get(key);
  const kind = made && registry.get(made.kind);
  if (!out || !made || !kind) return null;
  return { result: kind.summary(out, made.spec), rows: kind.rows ?? [] };
}

/** Thrown out of `progress` to stop a run the kernel no longer wants. */
class Stopped extends Error {}

/** A thrown value as the kernel gets it: a cell's own error, an engine limit, or a bug. */
function toWire(err: unknown): WireError {
  if (err instanceof CellError) {
    return { message: err.message, path: [...err.path], offset: err.offset, internal: false };
  }
  if (err instanceof RangeError && /allocation|memory|Array buffer/i.test(err.message)) {
    return { message: `Out of memory: ${err.message}`, internal: false };
  }
  const message = err instanceof Error ? err.message : String(err);
  return { message, internal: true };
}

/** A run's inputs and files from the store, or the message saying what is missing. */
function gatherInputs(
  store: WorkerStore,
  req: RunRequest,
): { inputs: Record<string, CellOutput>; files: Record<string, FileData> } | string {
  // Keyed by cell names and file names: no prototype, so a name such as
  // "constructor" that is not an input is not found (kernel/own.ts).
  const inputs: Record<string, CellOutput> = Object.create(null);
  for (const [name, key] of Object.entries(req.inputs)) {
    const out = store.outputs.get(key);
    if (!out) return `Input "${name}" is not computed`;
    inputs[name] = out;
  }
  const files: Record<string, FileData> = Object.create(null);
  for (const [path, sha] of Object.entries(req.files)) {
    const f = store.files.get(sha);
    if (!f) return `File "${path}" was not sent`;
    files[path] = { ...f, path };
  }
  return { inputs, files };
}

/**
 * Runs one cell and keeps its output in the store under its key.
 *
 * @param registry The kinds this worker runs.
 * @param store The worker's outputs and files.
 * @param req The run request.
 * @param post Sends a message to the kernel (progress of long work).
 * @returns The answer: `computed` true once the kind's `run` was called.
 */
export async function runCell(
  registry: Registry,
  store: WorkerStore,
  req: RunRequest,
  post: (m: FromWorker) => void,
): Promise<DoneMessage> {
  const t0 = performance.now();
  const warnings: string[] = [];
  const done = (computed: boolean, rest: Partial<DoneMessage>): DoneMessage => ({
    op: "done",
    id: req.id,
    ok: false,
    computed,
    warnings,
    ms: performance.now() - t0,
    ...rest,
  });
  const kind = registry.get(req.kind);
  if (!kind) {
    return done(false, { error: { message: `Unknown cell kind "${req.kind}"`, internal: true } });
  }
  const gathered = gatherInputs(store, req);
  if (typeof gathered === "string") {
    return done(false, { error: { message: gathered, internal: true } });
  }
  let lastProgress = -Infinity;
  if (!kind.readsKept) {
    for (const [name, input] of Object.entries(gathered.inputs)) {
      const kept = (input as CellOutput | undefined)?.keptIn;
      if (kept === undefined) continue;
      return done(false, {
        error: {
          message:
            `A ${req.kind} cell cannot read "${name}": ${kept}, and a ${req.kind} cell needs them here. Narrow the table's query, or give it keep_rows: memory (up to what memory holds)`,
          internal: false,
        },
      });
    }
  }
  try {
    const out = await kind.run(req.spec, {
      name: req.name,
      settings: req.settings,
      ...gathered,
      sandbox: sandboxFor(store, req.id, post),
      engine: engineFor(store, req.id, post),
      ...(req.stamp === undefined ? {} : { stamp: req.stamp }),
      summaryOf: (name) => inputSummary(registry, store, req.inputs, name),
      warn: (m) => {
        if (!warnings.includes(m)) warnings.push(m);
      },
      progress: (fraction, note) => {
        if (store.stop && Atomics.load(store.stop, 0) === req.id) throw new Stopped();
        // Work that ends within the server's grace for busy states shows no progress
        // (kernel/server/live_workspace.ts): send none for it, then at most every 50 ms.
        const now = performance.now();
        if (now - t0 < PROGRESS_AFTER_MS || now - lastProgress < PROGRESS_EVERY_MS) return;
        lastProgress = now;
        post({ op: "progress", id: req.id, fraction, note });
      },
    });
    store.outputs.set(req.key, out);
    store.made?.set(req.key, { kind: req.kind, spec: req.spec });
    return done(true, summarise(registry, req, out));
  } catch (err) {
    if (err instanceof Stopped) {
      return transientAnswer(req.id, "Stopped: its inputs changed", {
        cancelled: true,
        computed: true,
      });
    }
    return done(true, { error: toWire(err) });
  }
}

/** The summary part of a reply: complete, or the page's copy as JSON text when asked. */
function summarise(
  registry: Registry,
  req: RunRequest | SummaryRequest,
  out: CellOutput,
): Partial<DoneMessage> {
  const kind = registry.get(req.kind)!;
  if (req.page === undefined && req.lean !== undefined) {
    const named = new Set(req.lean);
    const leave = new Set((kind.rows ?? []).filter((f) => !named.has(f)));
    const built = kind.summary(out, req.spec, leave) as Record<string, unknown>;
    const summary = { ...built };
    const omitted = [...leave];
    for (const f of omitted) delete summary[f]; // a kind may have built them anyway
    return {
      ok: true,
      summary,
      ...(omitted.length > 0 ? { omitted } : {}),
      line: kind.line(summary),
      ...kept(kind, req, out, summary),
    };
  }
  if (req.page === undefined) {
    const summary = kind.summary(out, req.spec);
    return { ok: true, summary, line: kind.line(summary), ...kept(kind, req, out, summary) };
  }
  const keep = new Set(req.page);
  // Stand-ins made from the output: the fields they replace are not built at all.
  const condensed = kind.page?.condenseOutput?.(out) ?? null;
  const leave = pageLeavesOut(kind, keep, condensed);
  const summary = kind.summary(out, req.spec, leave);
  const page = pageCopy(kind, summary, keep, condensed);
  const omitted = [...new Set([...leave, ...page.omitted])];
  // Plain JSON from here on: the server forwards this text to the page as it is.
  const summaryJson = JSON.stringify(plainDeep(page.result));
  return {
    ok: true,
    summaryJson,
    omitted,
    line: kind.line(summary),
    ...kept(kind, req, out, summary),
  };
}

/**
 * What the run history keeps of a result, when asked and the kind has a
 * history face. A face that throws keeps nothing (null): the cell's result
 * stands, the history records its state only.
 */
function kept(
  kind: CellKind,
  req: RunRequest | SummaryRequest,
  out: CellOutput,
  summary: unknown,
): { kept?: unknown } {
  if (!req.keep || !kind.history) return {};
  try {
    return { kept: plainDeep(kind.history.keep(out, req.spec, summary)) };
  } catch {
    return { kept: null };
  }
}

/**
 * Summarises an output the store keeps again, in the shape now asked for
 * (nothing is computed).
 *
 * @param registry The kinds this worker runs.
 * @param store The worker's outputs.
 * @param req The summary request.
 * @returns The answer (`computed` false), an error when the output is not kept.
 */
export function resummarise(
  registry: Registry,
  store: WorkerStore,
  req: SummaryRequest,
): DoneMessage {
  const t0 = performance.now();
  const out = store.outputs.get(req.key);
  const base = { op: "done" as const, id: req.id, ok: false, computed: false, warnings: [] };
  if (!out || !registry.has(req.kind)) {
    const error = { message: `Output "${req.key}" is not held`, internal: true };
    return { ...base, error, ms: performance.now() - t0 };
  }
  try {
    return { ...base, ...summarise(registry, req, out), ms: performance.now() - t0 };
  } catch (err) {
    return { ...base, error: toWire(err), ms: performance.now() - t0 };
  }
}
