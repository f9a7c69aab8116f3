/**
 * A session runs one analysis document: parse, plan, execute, remember.
 *
 * ```
 *  source ──plan()──▶ graph + cache keys ──execute──▶ cell states
 *                        │ key = hash(kind, spec, settings,
 *                        │            keys of inputs, SHA-256 of files,
 *                        │            stamp: a database answer's fingerprint)
 *                        ▼
 *              outcome cache (key → summary, page text or error)
 * ```
 *
 * A cell reruns only when its key is new, so an edit that changes nothing
 * (YAML whitespace, prose) reruns nothing, and a change reruns exactly the
 * cells downstream of it. Each run is a {@link Run} (run.ts) that holds its
 * own state; a run superseded by a newer one stops updating states at its
 * next step; whatever it computed stays cached under its key.
 *
 * @module
 */
import { parseDocument, readSettings } from "../document/mod.ts";
import { hashValue } from "../hash.ts";
import { buildGraph } from "../graph/build.ts";
import { OptionsCache } from "../graph/options_cache.ts";
import { WorkerPool } from "../worker/pool.ts";
import { EngineClient } from "../engine/client.ts";
import { FileStore } from "./files.ts";
import { Stamps } from "./stamps.ts";
import { isCellError, type Outcome, type Prepared, type RunHost } from "./_run_parts.ts";
import { checkInlineRefs } from "./inline_refs.ts";
import { Run } from "./run.ts";
import type { Plan, RunReport, SessionOptions } from "./types.ts";

export type {
  CellReport,
  CellState,
  PageText,
  Plan,
  RunReport,
  SessionEvent,
  SessionOptions,
} from "./types.ts";

/** Runs one document reactively; keep it alive between edits to reuse results. */
export class Session {
  #opts: SessionOptions;
  #pool: WorkerPool;
  /** Database access for the document's tables (engine processes start on first use). */
  #engine: EngineClient;
  #files: FileStore;
  /** Fingerprints of database answers, by cell spec (stamps.ts). */
  #stamps: Stamps;
  #outcomes = new Map<string, Outcome>();
  #optionsCache = new OptionsCache();
  /** What each run uses of this session. */
  #host: RunHost;
  /** The latest run (a newer one supersedes it). */
  #latest: Run | null = null;
  /**
   * How many times each cell was computed over the session's life (counted
   * when its worker says it computed it, `DoneMessage.computed`).
   */
  readonly runs = new Map<string, number>();

  /** @param opts Registry, worker entry and the document's folder. */
  constructor(opts: SessionOptions) {
    this.#opts = opts;
    this.#engine = new EngineClient(opts.dir);
    this.#pool = new WorkerPool(opts.workerUrl, opts.workers, this.#engine);
    this.#files = new FileStore(opts.dir);
    this.#stamps = new Stamps(this.#engine);
    this.#host = {
      pool: this.#pool,
      files: this.#files,
      stamps: this.#stamps,
      outcomes: this.#outcomes,
      page: opts.page === true,
      keep: opts.history === true,
      lean: opts.lean === true && opts.page !== true,
      once: opts.once === true,
      prepare: (source) => this.#prepare(source),
      keyed: (prep, shas) => this.#keyed(prep, shas),
      emit: (e) => opts.onEvent?.(e),
      computed: (name) => this.runs.set(name, (this.runs.get(name) ?? 0) + 1),
    };
  }

  /** The file store (a watcher calls `forget` on it). */
  get files(): FileStore {
    return this.#files;
  }

  /**
   * Parses and checks a document and computes every cell's cache key.
   *
   * @param source The document text.
   * @param fileShas SHA-256 of each file path as written (missing entries make a cell fail later).
   * @returns The plan; `stale` lists what a run would compute.
   */
  plan(source: string, fileShas: ReadonlyMap<string, string>): Plan {
    return this.#keyed(this.#prepare(source), fileShas);
  }

  /** The last document prepared: a data change reruns the same text (1–2 ms to parse and plan). */
  #lastPrep: { source: string; prep: Prepared } | null = null;

  #prepare(source: string): Prepared {
    if (this.#lastPrep?.source === source) return this.#lastPrep.prep;
    const prep = this.#prepareAnew(source);
    this.#lastPrep = { source, prep };
    return prep;
  }

  #prepareAnew(source: string): Prepared {
    const doc = parseDocument(source);
    const { settings, errors } = readSettings(doc);
    const graph = buildGraph(doc, this.#opts.registry, settings, this.#optionsCache);
    const docErrors = [...doc.errors.filter((e) => !isCellError(doc, e)), ...errors];
    docErrors.push(...checkInlineRefs(doc, graph));
    return { doc, settings, graph, docErrors };
  }

  #keyed(prep: Prepared, fileShas: ReadonlyMap<string, string>): Plan {
    const keys = new Map<string, string>();
    const settingsKey = hashValue({ ...prep.settings, title: undefined });
    for (const node of prep.graph.order) {
      if (node.error) continue;
      const depKeys = node.deps.map((d) => keys.get(d));
      if (depKeys.some((k) => k === undefined)) continue;
      const shas = node.files.map((f) => fileShas.get(f.path) ?? null);
      const stamp = this.#stamps.of(node);
      keys.set(
        node.name,
        hashValue([
          node.kind,
          node.specJson,
          settingsKey,
          depKeys,
          shas,
          ...(stamp ? [stamp] : []),
        ]),
      );
    }
    const stale = prep.graph.order
      .filter((n) => keys.has(n.name) && !this.#outcomes.has(keys.get(n.name)!))
      .map((n) => n.name);
    return { ...prep, keys, stale };
  }

  /**
   * Runs a document: reads its data files, then computes what is stale. A
   * run still going is superseded (kernel/session/run.ts).
   *
   * @param source The document text.
   * @returns States and results of every cell.
   */
  async run(source: string): Promise<RunReport> {
    this.#latest?.supersede();
    const run = this.#latest = new Run(this.#host);
    await run.plan(source);
    return await run.execute();
  }

  /**
   * Asks every database fingerprint again (`CellKind.stamp`) for the cells of
   * the last document planned.
   *
   * @returns True when one changed (or failed): a run now would compute again.
   */
  recheckStamps(): Promise<boolean> {
    const nodes = this.#lastPrep?.prep.graph.nodes ?? [];
    const inUse = new Set(nodes.filter((n) => !n.error && n.plugin?.stamp).map(Stamps.keyOf));
    return this.#stamps.recheck(inUse);
  }

  /** What the session knows of database answers: how many, their last cost, one hash of them. */
  get stamps(): { count: number; costMs: number; print: string } {
    return { count: this.#stamps.size, costMs: this.#stamps.costMs, print: this.#stamps.print() };
  }

  /**
   * Makes a run in progress stop at its next step (what it computed stays
   * cached), so a caller can await it and start the next run without two
   * runs computing at once.
   */
  supersede(): void {
    this.#latest?.supersede();
  }

  /**
   * Stops a cell computing now whose cache key is not among `keys` (the plan
   * of the next run: its inputs changed), at its next progress report; it is
   * answered as cancelled and not cached. Cells reporting no progress finish.
   *
   * @param keys The cache keys the next run wants (`plan(…).keys`).
   */
  stopComputingUnless(keys: Iterable<string>): void {
    this.#pool.stopComputingUnless(new Set(keys));
  }

  /** Stops the compute workers. */
  close(): void {
    this.#pool.close();
    this.#engine.close();
  }
}
