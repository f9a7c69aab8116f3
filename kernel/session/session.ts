/**
 * A session runs one analysis document: parse, plan, execute, remember.
 *
 * ```
 *  source ──plan()──▶ graph + cache keys ──execute──▶ cell states
 *                        │ key = hash(kind, spec, settings,
 *                        │            keys of inputs, SHA-256 of files)
 *                        ▼
 *              outcome cache (key → summary | error)
 * ```
 *
 * A cell reruns only when its key is new, so an edit that changes nothing
 * (YAML whitespace, prose) reruns nothing, and a change reruns exactly the
 * cells downstream of it. A run superseded by a newer one stops updating
 * states at its next step; whatever it computed stays cached under its key.
 *
 * @module
 */
import type { DocSettings, FileData } from "../contract/mod.ts";
import { parseDocument, readSettings } from "../document/mod.ts";
import { LocatedError } from "../errors.ts";
import { hashValue } from "../hash.ts";
import { buildGraph, type CellNode, type Graph, locateError } from "../graph/build.ts";
import { OptionsCache } from "../graph/options_cache.ts";
import type { ComputeWorker } from "../worker/client.ts";
import { WorkerPool } from "../worker/pool.ts";
import type { DoneMessage } from "../worker/protocol.ts";
import { FileStore } from "./files.ts";
import { type Dispatch, isCellError, isTransient, located, type Outcome } from "./_run_parts.ts";
import type { CellReport, CellState, Plan, RunReport, SessionOptions } from "./types.ts";

export type {
  CellReport,
  CellState,
  Plan,
  RunReport,
  SessionEvent,
  SessionOptions,
} from "./types.ts";
import { checkInlineRefs, referencedFields } from "./inline_refs.ts";

/** Runs one document reactively; keep it alive between edits to reuse results. */
export class Session {
  #opts: SessionOptions;
  #pool: WorkerPool;
  #files: FileStore;
  #outcomes = new Map<string, Outcome>();
  #optionsCache = new OptionsCache();
  #generation = 0;
  /** Cancels the latest run's cells still queued in a worker (set by each run). */
  #cancelOlder: (() => void) | null = null;
  /** With `page`: per cell, the fields its inline values name (this run's document). */
  #keep = new Map<string, Set<string>>();
  /** How many times each cell was computed over the session's life. */
  readonly runs = new Map<string, number>();

  /** @param opts Registry, worker entry and the document's folder. */
  constructor(opts: SessionOptions) {
    this.#opts = opts;
    this.#pool = new WorkerPool(opts.workerUrl, opts.workers);
    this.#files = new FileStore(opts.dir);
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
  #lastPrep: { source: string; prep: Omit<Plan, "keys" | "stale"> } | null = null;

  #prepare(source: string): Omit<Plan, "keys" | "stale"> {
    if (this.#lastPrep?.source === source) return this.#lastPrep.prep;
    const prep = this.#prepareAnew(source);
    this.#lastPrep = { source, prep };
    return prep;
  }

  #prepareAnew(source: string): Omit<Plan, "keys" | "stale"> {
    const doc = parseDocument(source);
    const { settings, errors } = readSettings(doc);
    const graph = buildGraph(doc, this.#opts.registry, settings, this.#optionsCache);
    const docErrors = [...doc.errors.filter((e) => !isCellError(doc, e)), ...errors];
    docErrors.push(...checkInlineRefs(doc, graph));
    return { doc, settings, graph, docErrors };
  }

  #keyed(prep: Omit<Plan, "keys" | "stale">, fileShas: ReadonlyMap<string, string>): Plan {
    const keys = new Map<string, string>();
    const settingsKey = hashValue({ ...prep.settings, title: undefined });
    for (const node of prep.graph.order) {
      if (node.error) continue;
      const depKeys = node.deps.map((d) => keys.get(d));
      if (depKeys.some((k) => k === undefined)) continue;
      const shas = node.files.map((f) => fileShas.get(f.path) ?? null);
      keys.set(node.name, hashValue([node.kind, node.specJson, settingsKey, depKeys, shas]));
    }
    const stale = prep.graph.order
      .filter((n) => keys.has(n.name) && !this.#outcomes.has(keys.get(n.name)!))
      .map((n) => n.name);
    return { ...prep, keys, stale };
  }

  /**
   * Runs a document: reads its data files, then computes what is stale.
   *
   * @param source The document text.
   * @returns States and results of every cell.
   */
  async run(source: string): Promise<RunReport> {
    const generation = ++this.#generation;
    this.#cancelOlder?.();
    const prep = this.#prepare(source);
    const { fileData, fileErrors } = await this.#readFiles(prep.graph, prep.settings);
    const plan = this.#keyed(prep, new Map([...fileData].map(([p, f]) => [p, f.sha256])));
    if (this.#opts.page) this.#keep = referencedFields(plan.doc);
    const reports = new Map<CellNode, CellReport>();
    const ran: string[] = [];
    for (const node of plan.graph.nodes) {
      if (!node.error && plan.keys.has(node.name)) this.#emit(node.name, "queued");
    }
    // Every cell whose inputs have settled starts at once; those that compute
    // wait for a worker (WorkerPool), taken in this order. A cell that will
    // compute and whose unsettled inputs are all being computed on one worker
    // is sent to that worker's queue at once (QUEUE_DEPTH): the worker goes
    // from cell to cell without waiting for this thread between them.
    const remaining = [...plan.graph.order];
    const going = new Set<Promise<void>>();
    const finished = new Map<CellNode, Promise<CellReport>>();
    const computingOn = new Map<CellNode, ComputeWorker>();
    let wake = () => {};
    const started = (node: CellNode, w: ComputeWorker) => {
      computingOn.set(node, w);
      wake();
    };
    const depsOf = (node: CellNode) => node.deps.flatMap((d) => plan.graph.byName.get(d) ?? []);
    const settled = (node: CellNode) =>
      node.error !== null || depsOf(node).every((dep) => reports.has(dep));
    const queueTarget = (node: CellNode): ComputeWorker | null => {
      if (!this.#willCompute(node, plan, fileErrors)) return null;
      let target: ComputeWorker | null = null;
      for (const dep of depsOf(node)) {
        if (reports.has(dep)) continue;
        const on = computingOn.get(dep);
        if (on === undefined || (target !== null && target !== on)) return null;
        target = on;
      }
      return target !== null && this.#pool.queueOn(target) ? target : null;
    };
    const launch = (node: CellNode, early: ComputeWorker | null) => {
      const inputs = early === null
        ? null
        : { worker: early, settled: Promise.all(depsOf(node).map((d) => finished.get(d))) };
      const report = this.#runNode(node, plan, reports, fileData, fileErrors, ran, {
        started,
        early: inputs,
        live,
      }).then((r) => {
        reports.set(node, r);
        computingOn.delete(node);
        return r;
      });
      finished.set(node, report);
      const done: Promise<void> = report.then(() => {}).finally(() => going.delete(done));
      going.add(done);
    };
    const live = () => generation === this.#generation;
    // When a newer run starts (or supersede() is called), this run's cells still
    // waiting in a worker's queue are cancelled at once, before the worker reaches them.
    const cancelQueued = () => {
      const keys = new Set([...computingOn.keys()].map((n) => plan.keys.get(n.name)!));
      for (const w of this.#pool.workers) w.cancelQueued(keys);
    };
    this.#cancelOlder = cancelQueued;
    let superseded = false;
    while (remaining.length > 0 || going.size > 0) {
      superseded ||= generation !== this.#generation;
      if (superseded) {
        cancelQueued(); // those dispatched since
      } else {
        for (let i = 0; i < remaining.length;) {
          const node = remaining[i];
          const early = settled(node) ? null : queueTarget(node);
          if (!settled(node) && early === null) {
            i++;
            continue;
          }
          remaining.splice(i, 1);
          launch(node, early);
        }
      }
      if (going.size > 0) {
        const woken = new Promise<void>((r) => wake = r);
        await Promise.race([...going, woken]);
      } else if (superseded) break;
      else {
        // Only cells waiting on each other are left (a cycle): report them one by one.
        for (const node of remaining) {
          reports.set(
            node,
            await this.#runNode(node, plan, reports, fileData, fileErrors, ran, { started, live }),
          );
        }
        remaining.length = 0;
      }
    }
    // A newer run that started while this one's last cells computed supersedes it too.
    superseded ||= generation !== this.#generation;
    if (superseded) {
      return { settings: plan.settings, cells: [], errors: [], ran, superseded: true };
    }
    this.#forgetUnused(plan, fileData);
    const cells = plan.graph.nodes.map((n) => reports.get(n)!);
    return {
      settings: plan.settings,
      cells,
      errors: plan.docErrors.map(located),
      ran,
      superseded: false,
    };
  }

  async #readFiles(graph: Graph, settings: DocSettings) {
    const fileData = new Map<string, FileData>();
    const fileErrors = new Map<CellNode, LocatedError>();
    for (const node of graph.nodes) {
      if (node.error) continue;
      for (const f of node.files) {
        if (fileData.has(f.path)) continue;
        try {
          fileData.set(f.path, await this.#files.read(f.path, f.option, settings.maxFileBytes));
        } catch (err) {
          fileErrors.set(node, locateError(node, err));
        }
      }
    }
    return { fileData, fileErrors };
  }

  async #runNode(
    node: CellNode,
    plan: Plan,
    reports: Map<CellNode, CellReport>,
    fileData: Map<string, FileData>,
    fileErrors: Map<CellNode, LocatedError>,
    ran: string[],
    how: Dispatch,
  ): Promise<CellReport> {
    const base = {
      name: node.name,
      kind: node.kind,
      line: node.line,
      warnings: [...node.warnings],
      result: null,
      summaryLine: null,
      ms: 0,
      cached: false,
    };
    const settle = (r: CellReport) => how.live() ? this.#settle(r) : r;
    const staticError = node.error ?? fileErrors.get(node);
    if (staticError) {
      return settle({ ...base, state: "failed", error: located(staticError) });
    }
    // Sent to the worker ahead of its inputs' answers: wait for them, then judge as below.
    let ahead: Promise<DoneMessage> | null = null;
    if (how.early) {
      const runsBefore = ran.length;
      ahead = this.#compute(node, plan, fileData, ran, how, how.early.worker);
      await how.early.settled;
      const inputsCurrent = node.deps.every((d) =>
        reports.get(plan.graph.byName.get(d)!)?.state === "current"
      );
      // Its turn in the worker comes now that its inputs are answered.
      if (inputsCurrent && how.live()) this.#emit(node.name, "computing");
      if (!inputsCurrent) {
        // It found an input missing, or was cancelled (then #computeOn has undone the
        // count): not this cell's outcome either way, so not kept.
        const done = await ahead;
        if (!done.error?.cancelled) {
          const at = ran.indexOf(node.name, runsBefore);
          if (at >= 0) ran.splice(at, 1);
          this.runs.set(node.name, (this.runs.get(node.name) ?? 1) - 1);
        }
        ahead = null;
      }
    }
    const stateOf = (d: string) => reports.get(plan.graph.byName.get(d)!)?.state;
    const blocked = node.deps.find((d) => stateOf(d) !== "current");
    if (blocked !== undefined || !plan.keys.has(node.name)) {
      const why = blocked === undefined
        ? "an input cannot run"
        : `input "${blocked}" is ${stateOf(blocked) ?? "not ready"}`;
      return settle({
        ...base,
        state: "held",
        error: { message: `Held: ${why}`, line: node.line, column: 1 },
      });
    }
    const key = plan.keys.get(node.name)!;
    const page = this.#pageFields(node.name);
    const shape = page?.join("\n") ?? null;
    let outcome = this.#outcomes.get(key);
    if (outcome && outcome.done.ok && outcome.shape !== shape) {
      outcome = await this.#reshape(node, key, outcome, page, shape);
    }
    if (ahead) outcome = undefined;
    const cached = outcome !== undefined;
    if (!outcome) {
      const done = await (ahead ?? this.#compute(node, plan, fileData, ran, how));
      outcome = { done, shape };
      if (!isTransient(done)) this.#outcomes.set(key, outcome);
    }
    const d = outcome.done;
    const warnings = [...base.warnings, ...d.warnings.filter((w) => !base.warnings.includes(w))];
    if (d.ok) {
      return settle({
        ...base,
        state: "current",
        error: null,
        warnings,
        result: d.summary,
        summaryLine: d.line ?? null,
        ms: d.ms,
        cached,
        ...(d.omitted && d.omitted.length > 0 ? { omitted: d.omitted } : {}),
      });
    }
    const err = d.error!;
    const message = err.internal
      ? `Internal error in cell "${node.name}": ${err.message}`
      : err.message;
    const pos = node.locate(err.path ?? [], err.offset);
    return settle({
      ...base,
      state: "failed",
      error: { message, ...pos },
      warnings,
      ms: d.ms,
      cached,
    });
  }

  /** Whether a cell will compute in this run (it can run and has no kept outcome). */
  #willCompute(node: CellNode, plan: Plan, fileErrors: Map<CellNode, LocatedError>): boolean {
    const key = plan.keys.get(node.name);
    return node.error === null && !fileErrors.has(node) && key !== undefined &&
      !this.#outcomes.has(key);
  }

  /** With `page`: the fields kept beyond the page's copy for a cell (sorted); else undefined. */
  #pageFields(name: string): string[] | undefined {
    return this.#opts.page ? [...(this.#keep.get(name) ?? [])].sort() : undefined;
  }

  /**
   * A cached outcome summarised again in the shape now wanted (an inline value
   * started or stopped naming one of its fields), without recomputing;
   * undefined when the worker no longer holds the output (then it recomputes).
   */
  async #reshape(
    node: CellNode,
    key: string,
    outcome: Outcome,
    page: string[] | undefined,
    shape: string | null,
  ): Promise<Outcome | undefined> {
    const holder = this.#pool.holderOf(key);
    if (holder === undefined) return undefined;
    const d = await holder.summarize({ key, kind: node.kind, spec: node.spec, page });
    if (!d.ok) return undefined;
    const again = { done: { ...d, warnings: outcome.done.warnings, ms: outcome.done.ms }, shape };
    this.#outcomes.set(key, again);
    return again;
  }

  /**
   * Computes a node on a worker of the pool: the one holding most of its
   * inputs, when idle, or `queued`, a worker whose queue it already has a
   * place in (WorkerPool.queueOn).
   */
  async #compute(
    node: CellNode,
    plan: Plan,
    fileData: Map<string, FileData>,
    ran: string[],
    how: Dispatch,
    queued?: ComputeWorker,
  ): Promise<DoneMessage> {
    const worker = queued ?? await this.#pool.acquire(node.deps.map((d) => plan.keys.get(d)!));
    how.started(node, worker);
    try {
      const announce = queued === undefined ? how.live : () => false;
      return await this.#computeOn(worker, node, plan, fileData, ran, how.live, announce);
    } finally {
      this.#pool.release(worker);
    }
  }

  /**
   * Computes a node on one worker: an input this worker lacks is copied from
   * the worker that holds it, or, when none does, computed again here first.
   */
  async #computeOn(
    worker: ComputeWorker,
    node: CellNode,
    plan: Plan,
    fileData: Map<string, FileData>,
    ran: string[],
    live: () => boolean,
    announce: () => boolean = live,
  ): Promise<DoneMessage> {
    for (const dep of node.deps) {
      const depKey = plan.keys.get(dep)!;
      if (worker.willHave(depKey)) continue;
      const out = await this.#pool.holderOf(depKey, worker)?.exportOutput(depKey);
      if (out) {
        worker.importOutput(depKey, out);
        continue;
      }
      const dnode = plan.graph.byName.get(dep)!;
      const redo = await this.#computeOn(worker, dnode, plan, fileData, ran, live);
      if (!redo.ok) return redo;
    }
    const files: Record<string, FileData> = {};
    for (const f of node.files) files[f.path] = fileData.get(f.path)!;
    if (announce()) this.#emit(node.name, "computing");
    const at = ran.push(node.name) - 1;
    this.runs.set(node.name, (this.runs.get(node.name) ?? 0) + 1);
    const done = await worker.run({
      key: plan.keys.get(node.name)!,
      kind: node.kind,
      name: node.name,
      spec: node.spec,
      settings: plan.settings,
      inputs: Object.fromEntries(node.deps.map((d) => [d, plan.keys.get(d)!])),
      files,
      page: this.#pageFields(node.name),
      onProgress: (fraction, note) => live() && this.#emit(node.name, "computing", fraction, note),
    });
    if (done.error?.cancelled) {
      // Never started (a newer run took over): not a computation of this cell.
      if (ran[at] === node.name) ran.splice(at, 1);
      this.runs.set(node.name, (this.runs.get(node.name) ?? 1) - 1);
    }
    return done;
  }

  /** Drops cached outcomes and worker outputs that the current document no longer uses. */
  #forgetUnused(plan: Plan, fileData: Map<string, FileData>): void {
    const live = new Set(plan.keys.values());
    for (const k of this.#outcomes.keys()) if (!live.has(k)) this.#outcomes.delete(k);
    this.#pool.retain(live, [...fileData.values()].map((f) => f.sha256));
  }

  #emit(name: string, state: CellState, fraction?: number, note?: string): void {
    this.#opts.onEvent?.({ name, state, fraction, note });
  }

  /** Reports a settled cell to the listener and returns its report. */
  #settle(report: CellReport): CellReport {
    this.#opts.onEvent?.({ name: report.name, state: report.state, report });
    return report;
  }

  /**
   * Makes a run in progress stop at its next step (what it computed stays
   * cached), so a caller can await it and start the next run without two
   * runs computing at once.
   */
  supersede(): void {
    this.#generation++;
    this.#cancelOlder?.();
  }

  /** Stops the compute workers. */
  close(): void {
    this.#pool.close();
  }
}
