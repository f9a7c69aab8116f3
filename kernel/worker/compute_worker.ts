/**
 * The compute worker's message loop. A worker entry module imports a
 * registry and calls {@link serveComputeWorker}; the entry is started with
 * `deno: { permissions: "none" }`, so cell code cannot touch disk, network or
 * environment (a dynamic import would need read access, hence one static
 * entry module per registry: `cells/worker.ts` for the product).
 *
 * ```
 *  message ─┬─ cancel ─────────────▶ note the ids            (at once)
 *           ├─ export ─────────────▶ answer with the output  (at once, between runs)
 *           └─ in arrival order ───┬─ file    ▶ storeFile
 *                                  ├─ retain  ▶ retain
 *                                  ├─ import  ▶ importOutput
 *                                  ├─ summary ▶ resummarise (_run_cell.ts)
 *                                  └─ run     ▶ one turn of the event loop, then
 *                                               cancelled? answer so : runCell
 * ```
 *
 * @module
 */
import type { CellOutput, Registry } from "../contract/mod.ts";
import { resummarise, runCell, type WorkerStore } from "./_run_cell.ts";
import { useHalvesHelper } from "../csv/mod.ts";
import { collectGarbage } from "../collect.ts";
import {
  type CancelMessage,
  type ExportRequest,
  type FileMessage,
  type FromWorker,
  type ImportMessage,
  type OutputMessage,
  packRows,
  type RetainMessage,
  type ToWorker,
  transientAnswer,
} from "./protocol.ts";

/**
 * Keeps a file's content under its SHA-256 (sent once per distinct content):
 * a view of the main thread's SharedArrayBuffer when the file store read it
 * so (kernel/session/files.ts), never written to by either side.
 */
function storeFile(store: WorkerStore, msg: FileMessage): void {
  store.files.set(msg.sha256, { path: msg.path, bytes: msg.bytes, sha256: msg.sha256 });
}

/** Drops every output and file not listed. */
function retain(store: WorkerStore, msg: RetainMessage): void {
  const keep = new Set(msg.keys);
  for (const k of store.outputs.keys()) if (!keep.has(k)) store.outputs.delete(k);
  for (const k of store.made?.keys() ?? []) if (!keep.has(k)) store.made!.delete(k);
  const keepFiles = new Set(msg.shas);
  for (const s of store.files.keys()) if (!keepFiles.has(s)) store.files.delete(s);
}

/** Keeps an output another worker computed under its key. */
function importOutput(store: WorkerStore, msg: ImportMessage): void {
  store.outputs.set(msg.key, msg.output as CellOutput);
  if (msg.made) store.made?.set(msg.key, msg.made);
}

/** The answer to an export: the output kept under the key, or none. */
function exportOutput(store: WorkerStore, msg: ExportRequest): OutputMessage {
  const output = store.outputs.get(msg.key);
  return output === undefined ? { op: "output", id: msg.id } : { op: "output", id: msg.id, output };
}

/**
 * Runs tasks one at a time in arrival order, and gives the event loop one turn
 * on request, so that a message sent while the task before was computing (a
 * cancel) is read before the next task starts (queued tasks follow as microtasks).
 */
class InOrder {
  #queue = Promise.resolve();
  #tick = new MessageChannel();
  #resume: (() => void) | null = null;

  constructor() {
    this.#tick.port1.onmessage = () => {
      const r = this.#resume;
      this.#resume = null;
      r?.();
    };
  }

  /** Queues a task after every task queued before it. */
  then(task: () => void | Promise<void>): void {
    this.#queue = this.#queue.then(task);
  }

  /** Resolves after one turn of the event loop. */
  yieldToEvents(): Promise<void> {
    return new Promise<void>((r) => {
      this.#resume = r;
      this.#tick.port2.postMessage(0);
    });
  }
}

/**
 * Serves run requests on `self` until the worker is terminated.
 *
 * @param registry The cell kinds this worker can run (their compute faces).
 */
export function serveComputeWorker(registry: Registry): void {
  const store: WorkerStore = {
    outputs: new Map(),
    files: new Map(),
    calls: new Map(),
    made: new Map(),
  };
  const cancelled = new Set<number>();
  // A summary's per-row arrays are moved as Float64Array, not copied as objects (packRows).
  const post = (m: FromWorker) => {
    if (m.op !== "done" || m.summary === undefined) return self.postMessage(m);
    const { summary, buffers } = packRows(m.summary);
    self.postMessage({ ...m, summary }, buffers);
  };
  // Messages are handled one at a time, in arrival order: a run may read the
  // output of the run just before it, and a retain must not overtake a run.
  // A cancel and an export are answered at once (between runs, since runs are
  // synchronous): another worker may be waiting on an export, and nothing
  // queued here changes a stored output.
  const inOrder = new InOrder();
  // A large CSV read takes its helper thread from the main thread, never starts one here.
  const helperUsed = () => post({ op: "helper-used" });
  useHalvesHelper(null, helperUsed);
  self.onmessage = (e: MessageEvent<ToWorker>) => {
    const msg = e.data;
    switch (msg.op) {
      case "helper":
        return useHalvesHelper(msg.port, helperUsed);
      case "sandbox-answer":
        return store.calls?.get(msg.call)?.(msg.answer);
      case "stop-flag":
        store.stop = new Int32Array(msg.flag);
        return;
      case "cancel":
        return cancel(cancelled, msg);
      case "export":
        return post(exportOutput(store, msg));
      case "file":
        return inOrder.then(() => storeFile(store, msg));
      case "retain":
        return inOrder.then(() => retain(store, msg));
      case "import":
        return inOrder.then(() => importOutput(store, msg));
      case "summary":
        return inOrder.then(() => post(resummarise(registry, store, msg)));
      case "run":
        return inOrder.then(async () => {
          await inOrder.yieldToEvents(); // a cancel sent meanwhile is read first
          post(
            cancelled.delete(msg.id)
              ? transientAnswer(msg.id, "Cancelled: a newer run took over", { cancelled: true })
              : await runCell(registry, store, msg, post),
          );
          if (msg.letGo !== undefined) await letGo(store, msg.letGo);
        });
    }
  };
}

/** Bytes dropped at once from which the worker collects its garbage before the next run. */
const COLLECT_FROM = 32 << 20;

/**
 * Drops files no later run reads (`RunRequest.letGo`); large ones are freed
 * at once by a collection (the worker's collector would otherwise wait, with
 * a fit's arrays beside them; kernel/collect.ts).
 */
async function letGo(store: WorkerStore, shas: readonly string[]): Promise<void> {
  let dropped = 0;
  for (const sha of shas) {
    dropped += store.files.get(sha)?.bytes.length ?? 0;
    store.files.delete(sha);
  }
  if (dropped >= COLLECT_FROM) await collectGarbage();
}

/** Notes runs to answer as cancelled when their turn comes. */
function cancel(cancelled: Set<number>, msg: CancelMessage): void {
  for (const id of msg.ids) cancelled.add(id);
}
