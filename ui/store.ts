/**
 * The page's live state: the document as last sent by the server and the
 * state of every cell, kept in signals so that each block re-renders alone
 * when its own cell changes.
 *
 * ```
 *  WebSocket ──ServerMessage──▶ LiveStore.apply ──▶ doc      (Signal<DocumentMessage>)
 *                                               ├─▶ cell(n)  (Signal<LiveCell>, one per cell)
 *                                               └─▶ lastRun  (Signal<RunMessage>)
 * ```
 *
 * Ordering rules (kernel/server/protocol.ts): a `cell` message counts only
 * when its `version` equals that of the last `document` message, and a cell
 * message of a lower run than one already seen for that cell is dropped.
 *
 * @module
 */
import { batch, type Signal, signal } from "@preact/signals";
import type {
  CellMessage,
  ChangesMessage,
  DocumentMessage,
  LiveCellState,
  LivePosition,
  RunMessage,
  ServerMessage,
} from "../kernel/server/protocol.ts";

/** What the page knows about one cell. */
export interface LiveCell {
  name: string;
  kind: string;
  state: LiveCellState;
  /** Time taken (settled) or elapsed when the message was sent (computing). */
  ms: number | null;
  fraction: number | null;
  note: string | null;
  /** The last result the cell had when it was current (kept while it recomputes). */
  result: unknown;
  summaryLine: string | null;
  error: LivePosition | null;
  warnings: string[];
  /** The run of the last applied message (0 before any). */
  run: number;
  /** The run that last computed the result shown (not reused from the cache); 0 before any. */
  computedRun: number;
  /** The run of the last current message, whose result `result` is; 0 before any. */
  resultRun: number;
  cached: boolean;
  /** Local clock (ms) when the cell entered its state, for a ticking elapsed time. */
  since: number;
}

/** The connection as the top bar shows it. */
export type Connection = "connecting" | "open" | "closed";

function blank(name: string, kind: string, now: number): LiveCell {
  return {
    name,
    kind,
    state: "queued",
    ms: null,
    fraction: null,
    note: null,
    result: undefined,
    summaryLine: null,
    error: null,
    warnings: [],
    run: 0,
    computedRun: 0,
    resultRun: 0,
    cached: false,
    since: now,
  };
}

/** The live state of one page. */
export class LiveStore {
  /** The document as on disk, or null before the first message. */
  readonly doc: Signal<DocumentMessage | null> = signal(null);
  /** The last finished run. */
  readonly lastRun: Signal<RunMessage | null> = signal(null);
  readonly connection: Signal<Connection> = signal("connecting");
  /** What changed since the last data (the run history's report), or null before any. */
  readonly changes: Signal<ChangesMessage | null> = signal(null);
  /** Messages dropped as out of date (for tests and the debugging eye). */
  dropped = 0;
  #cells = new Map<string, Signal<LiveCell>>();
  #clock: () => number;

  /**
   * @param clock The local clock in ms (injectable for tests).
   */
  constructor(clock: () => number = () => Date.now()) {
    this.#clock = clock;
  }

  /**
   * The signal of one cell, created (queued) on first use.
   *
   * @param name The cell's name.
   * @param kind Its kind, used when the cell is not yet known.
   * @returns The cell's signal.
   */
  cell(name: string, kind = ""): Signal<LiveCell> {
    let s = this.#cells.get(name);
    if (s === undefined) {
      s = signal(blank(name, kind, this.#clock()));
      this.#cells.set(name, s);
    }
    return s;
  }

  /**
   * The cells of the current document, in document order.
   *
   * @returns One value per cell block.
   */
  cells(): LiveCell[] {
    const d = this.doc.value;
    if (d === null) return [];
    return d.blocks.flatMap((b) => b.type === "cell" ? [this.cell(b.name, b.kind).value] : []);
  }

  /**
   * Applies one server message.
   *
   * @param msg The message, as parsed from the WebSocket.
   * @returns True when it changed the state, false when it was dropped.
   * @example
   * ```ts
   * import { LiveStore } from "./store.ts";
   * const s = new LiveStore();
   * s.apply({ type: "document", version: "v1", path: "a.md", title: "A", source: "",
   *   blocks: [{ type: "cell", name: "t", kind: "table", line: 1, body: "" }], data: [] });
   * s.apply({ type: "cell", version: "v1", name: "t", kind: "table", state: "current",
   *   result: { rows_used: 3 }, run: 1 });
   * if (s.cell("t").value.state !== "current") throw new Error("not applied");
   * // reused from the cache: no result in the message, the one shown stays
   * const shown = s.cell("t").value.result;
   * s.apply({ type: "cell", version: "v1", name: "t", kind: "table", state: "current",
   *   cached: true, run: 2 });
   * if (s.cell("t").value.result !== shown) throw new Error("result dropped");
   * ```
   */
  apply(msg: ServerMessage): boolean {
    if (msg.type === "document") return this.#document(msg);
    if (msg.type === "cell") return this.#cellMessage(msg);
    if (msg.type === "run") {
      if (msg.version !== this.doc.value?.version) return this.#drop();
      if (this.lastRun.value !== null && msg.run < this.lastRun.value.run) return this.#drop();
      this.lastRun.value = msg;
      return true;
    }
    if (msg.type === "changes") {
      this.changes.value = msg;
      return true;
    }
    return this.#drop();
  }

  #drop(): false {
    this.dropped++;
    return false;
  }

  #document(sent: DocumentMessage): boolean {
    // The page asks for the text only when it changed (`/live?text=changed`): a data-only
    // update of the version it has comes without `source` and `blocks`, which it keeps.
    const had = this.doc.value;
    const textless = (sent as Partial<DocumentMessage>).blocks === undefined;
    if (textless && (had === null || had.version !== sent.version)) return this.#drop();
    const msg = textless ? { ...sent, source: had!.source, blocks: had!.blocks } : sent;
    batch(() => {
      const names = new Set<string>();
      for (const b of msg.blocks) {
        if (b.type !== "cell") continue;
        names.add(b.name);
        const s = this.cell(b.name, b.kind);
        if (s.value.kind !== b.kind) s.value = { ...blank(b.name, b.kind, this.#clock()) };
      }
      for (const name of [...this.#cells.keys()]) if (!names.has(name)) this.#cells.delete(name);
      // Data-only change (same text): keep the blocks array, so prose and blocks are not redrawn.
      const old = this.doc.value;
      this.doc.value = old !== null && old.source === msg.source && old.path === msg.path
        ? { ...msg, blocks: old.blocks }
        : msg;
    });
    return true;
  }

  #cellMessage(msg: CellMessage): boolean {
    if (msg.version !== this.doc.value?.version) return this.#drop();
    const s = this.cell(msg.name, msg.kind);
    const old = s.value;
    const run = msg.run ?? old.run;
    if (run < old.run) return this.#drop();
    const now = this.#clock();
    s.value = {
      name: msg.name,
      kind: msg.kind,
      state: msg.state,
      ms: msg.ms ?? null,
      fraction: msg.fraction ?? null,
      note: msg.note ?? null,
      // A current message without a result: the same result as before (reused from the cache).
      result: msg.state === "current" && msg.result !== undefined ? msg.result : old.result,
      summaryLine: msg.state === "current" ? msg.summaryLine ?? null : old.summaryLine,
      error: msg.error ?? null,
      warnings: msg.warnings ?? (msg.state === "current" ? [] : old.warnings),
      run,
      computedRun: msg.state === "current" && !msg.cached ? run : old.computedRun,
      resultRun: msg.state === "current" ? run : old.resultRun,
      cached: msg.cached ?? false,
      since: old.state === msg.state ? old.since : now,
    };
    return true;
  }
}

/** The page's overall state in one word, from its cells (and "offline" when not connected). */
export type OverallState = "current" | "computing" | "failed" | "held" | "empty" | "offline";

/**
 * How the result a cell holds stands against its state, the one rule every
 * part of the page reads it by:
 *
 * | state              | result held | standing   | shown as                          |
 * |--------------------|-------------|------------|-----------------------------------|
 * | current            | yes         | `current`  | the result                        |
 * | queued, computing  | yes         | `updating` | the result, dimmed after 0.3 s    |
 * | failed, held       | yes         | `earlier`  | folded away, "from an earlier run" |
 * | any                | no          | `none`     | nothing                           |
 */
export type Standing = "current" | "updating" | "earlier" | "none";

/**
 * The standing of a cell's result.
 *
 * @param c The cell (its state and result).
 * @returns See {@link Standing}.
 * @example
 * ```ts
 * import { standing } from "./store.ts";
 * if (standing({ state: "held", result: { r2: 0.9 } }) !== "earlier") throw new Error("held");
 * if (standing({ state: "failed", result: undefined }) !== "none") throw new Error("failed");
 * ```
 */
export function standing(c: { state: LiveCellState; result: unknown }): Standing {
  if (c.result === undefined) return "none";
  if (c.state === "current") return "current";
  if (c.state === "queued" || c.state === "computing") return "updating";
  return "earlier";
}

/**
 * Why a held cell waits, in words, without a repeated "Held:" (the state
 * word is shown beside it).
 *
 * @param message The held report's message, e.g. `input "p" is failed`.
 * @returns The reason, e.g. `input "p" is failed`.
 * @example
 * ```ts
 * import { heldReason } from "./store.ts";
 * if (heldReason("Held: Held: input \"t\" is failed") !== "input \"t\" is failed") throw new Error();
 * ```
 */
export function heldReason(message: string | undefined): string {
  const why = (message ?? "").replace(/^(\s*held\s*:\s*)+/i, "").trim();
  return why === "" ? "an input of this cell is not current" : why;
}

/**
 * Folds the cells' states into the page's state: any failure wins, then
 * held, then any work in progress.
 *
 * @param cells The cells of the document.
 * @returns The overall state and counts by state.
 * @example
 * ```ts
 * import { overall } from "./store.ts";
 * const o = overall([{ state: "current" }, { state: "computing" }]);
 * if (o.state !== "computing" || o.counts.current !== 1) throw new Error(JSON.stringify(o));
 * ```
 */
export function overall(
  cells: readonly { state: LiveCellState }[],
): { state: OverallState; counts: Record<LiveCellState, number> } {
  const counts = { current: 0, queued: 0, computing: 0, failed: 0, held: 0 };
  for (const c of cells) counts[c.state]++;
  const state: OverallState = cells.length === 0
    ? "empty"
    : counts.failed > 0
    ? "failed"
    : counts.computing + counts.queued > 0
    ? "computing"
    : counts.held > 0
    ? "held"
    : "current";
  return { state, counts };
}
