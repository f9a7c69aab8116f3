/**
 * The compute worker's message loop. A worker entry module imports a
 * registry and calls {@link serveComputeWorker}; the entry is started with
 * `deno: { permissions: "none" }`, so cell code cannot touch disk, network or
 * environment (a dynamic import would need read access, hence one static
 * entry module per registry: `cells/worker.ts` for the product).
 *
 * @module
 */
import type { CellOutput, FileData } from "../contract/mod.ts";
import { plainDeep } from "../arrays.ts";
import { CellError } from "../errors.ts";
import type { Registry } from "../contract/mod.ts";
import { pageCopy, pageLeavesOut } from "./page_copy.ts";
import type {
  DoneMessage,
  FromWorker,
  RunRequest,
  SummaryRequest,
  ToWorker,
  WireError,
} from "./protocol.ts";

/** Progress of a run is first sent this long after it started (ms). */
const PROGRESS_AFTER_MS = 100;
/** Then at most this often (ms): each message costs both threads about 0.4 ms (measured). */
const PROGRESS_EVERY_MS = 50;

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

/**
 * Serves run requests on `self` until the worker is terminated.
 *
 * @param registry The cell kinds this worker can run (their compute faces).
 */
export function serveComputeWorker(registry: Registry): void {
  const outputs = new Map<string, CellOutput>();
  const files = new Map<string, FileData>();
  const post = (m: FromWorker) => self.postMessage(m);

  async function run(req: RunRequest): Promise<DoneMessage> {
    const t0 = performance.now();
    let lastProgress = -Infinity;
    const warnings: string[] = [];
    const done = (rest: Partial<DoneMessage>): DoneMessage => ({
      op: "done",
      id: req.id,
      ok: false,
      warnings,
      ms: performance.now() - t0,
      ...rest,
    });
    const kind = registry.get(req.kind);
    if (!kind) {
      return done({ error: { message: `Unknown cell kind "${req.kind}"`, internal: true } });
    }
    const inputs: Record<string, CellOutput> = {};
    for (const [name, key] of Object.entries(req.inputs)) {
      const out = outputs.get(key);
      if (!out) {
        return done({ error: { message: `Input "${name}" is not computed`, internal: true } });
      }
      inputs[name] = out;
    }
    const fileData: Record<string, FileData> = {};
    for (const [path, sha] of Object.entries(req.files)) {
      const f = files.get(sha);
      if (!f) return done({ error: { message: `File "${path}" was not sent`, internal: true } });
      fileData[path] = { ...f, path };
    }
    try {
      const out = await kind.run(req.spec, {
        name: req.name,
        settings: req.settings,
        inputs,
        files: fileData,
        warn: (m) => {
          if (!warnings.includes(m)) warnings.push(m);
        },
        progress: (fraction, note) => {
          // Work that ends within the server's grace for busy states shows no progress
          // (kernel/server/live_workspace.ts): send none for it, then at most every 50 ms.
          const now = performance.now();
          if (now - t0 < PROGRESS_AFTER_MS || now - lastProgress < PROGRESS_EVERY_MS) return;
          lastProgress = now;
          post({ op: "progress", id: req.id, fraction, note });
        },
      });
      outputs.set(req.key, out);
      return done(summarise(req, out));
    } catch (err) {
      return done({ error: toWire(err) });
    }
  }

  /** The summary part of a reply: complete, or the page's copy when asked. */
  function summarise(req: RunRequest | SummaryRequest, out: CellOutput): Partial<DoneMessage> {
    const kind = registry.get(req.kind)!;
    if (req.page === undefined) {
      const summary = kind.summary(out, req.spec);
      return { ok: true, summary, line: kind.line(summary) };
    }
    const keep = new Set(req.page);
    const leave = pageLeavesOut(kind, keep);
    const summary = kind.summary(out, req.spec, leave);
    const page = pageCopy(kind, summary, keep);
    const omitted = [...new Set([...leave, ...page.omitted])];
    // Plain JSON from here on: the server writes it to the page without a replacer.
    const summaryJson = JSON.stringify(plainDeep(page.result));
    return { ok: true, summaryJson, omitted, line: kind.line(summary) };
  }

  function resummarise(req: SummaryRequest): DoneMessage {
    const t0 = performance.now();
    const out = outputs.get(req.key);
    const base = { op: "done" as const, id: req.id, ok: false, warnings: [] };
    if (!out || !registry.has(req.kind)) {
      const error = { message: `Output "${req.key}" is not held`, internal: true };
      return { ...base, error, ms: performance.now() - t0 };
    }
    try {
      return { ...base, ...summarise(req, out), ms: performance.now() - t0 };
    } catch (err) {
      return { ...base, error: toWire(err), ms: performance.now() - t0 };
    }
  }

  // Messages are handled one at a time, in arrival order: a run may read the
  // output of the run just before it, and a retain must not overtake a run.
  // An export is answered at once (between runs, since runs are synchronous): another
  // worker may be waiting on it, and nothing queued here changes a stored output.
  let queue = Promise.resolve();
  const cancelled = new Set<number>();
  // Before each run, one turn of the event loop, so that a cancel sent while the
  // run before was computing is read first (queued runs follow as microtasks).
  const tick = new MessageChannel();
  let resume: (() => void) | null = null;
  tick.port1.onmessage = () => {
    const r = resume;
    resume = null;
    r?.();
  };
  const yieldToEvents = () =>
    new Promise<void>((r) => {
      resume = r;
      tick.port2.postMessage(0);
    });
  self.onmessage = (e: MessageEvent<ToWorker>) => {
    const msg = e.data;
    if (msg.op === "cancel") {
      for (const id of msg.ids) cancelled.add(id);
      return;
    }
    if (msg.op === "export") {
      const output = outputs.get(msg.key);
      self.postMessage(
        output === undefined ? { op: "output", id: msg.id } : {
          op: "output",
          id: msg.id,
          output,
        } satisfies FromWorker,
      );
      return;
    }
    queue = queue.then(async () => {
      if (msg.op === "file") {
        files.set(msg.sha256, { path: msg.path, bytes: msg.bytes, sha256: msg.sha256 });
      } else if (msg.op === "retain") {
        const keep = new Set(msg.keys);
        for (const k of outputs.keys()) if (!keep.has(k)) outputs.delete(k);
        const keepFiles = new Set(msg.shas);
        for (const s of files.keys()) if (!keepFiles.has(s)) files.delete(s);
      } else if (msg.op === "import") {
        outputs.set(msg.key, msg.output as CellOutput);
      } else if (msg.op === "summary") {
        post(resummarise(msg));
      } else if (await yieldToEvents(), cancelled.delete(msg.id)) {
        post({
          op: "done",
          id: msg.id,
          ok: false,
          warnings: [],
          ms: 0,
          error: {
            message: "Cancelled: a newer run took over",
            internal: false,
            transient: true,
            cancelled: true,
          },
        });
      } else {
        post(await run(msg));
      }
    });
  };
}
