/**
 * One run of a document through a session: its plan, the cells waiting, sent
 * and settled, which worker computes which cell, and the report being built.
 *
 * ```
 *  plan()      read the data files, ask database fingerprints (stamps.ts), key every cell;
 *              those that can run are queued
 *    │
 *  execute() ─┬─ sendReady(): a cell whose inputs have settled takes a place on a
 *    │        │  worker (WorkerPool); one that will compute and whose unsettled inputs
 *    │        │  are all computing on one worker goes into that worker's queue at once,
 *    │        │  so the worker goes from cell to cell without waiting for this thread
 *    │        ├─ settle(): each cell's answer becomes its report (current, failed, held)
 *    │        └─ again, until every cell has settled (or the run is superseded)
 *    ▼
 *  finish()    the report; outcomes and worker outputs the document no longer uses dropped
 * ```
 *
 * A cell is counted as computed (`ran`, `Session.runs`) only when its worker
 * says it computed it (`DoneMessage.computed`): a run cancelled in the queue
 * or sent ahead of an input that then failed is not.
 *
 * A newer run (or `Session.supersede()`) supersedes this one: its cells still
 * waiting in a worker's queue are cancelled at once, it sends no more cells
 * and tells the listener nothing more; what it computed stays cached.
 *
 * @module
 */
import type { FileData } from "../contract/mod.ts";
import type { LocatedError } from "../errors.ts";
import { type CellNode, locateError } from "../graph/build.ts";
import type { ComputeWorker } from "../worker/client.ts";
import { type DoneMessage, transientAnswer } from "../worker/protocol.ts";
import { answerReport, failedReport, heldReport } from "./_cell_report.ts";
import { isTransient, located, type Outcome, type Prepared, type RunHost } from "./_run_parts.ts";
import { referencedFields } from "./inline_refs.ts";
import { lineCount } from "./files.ts";
import { Waiting } from "./_waiting.ts";
import type { CellReport, CellState, Plan, RunReport } from "./types.ts";
import { collectGarbage } from "../collect.ts";
import { startAhead } from "../sandbox/mod.ts";

/**
 * Bytes let go at once from which a run also drops them in the workers and collects garbage
 * (`once`; kernel/collect.ts).
 */
const COLLECT_FROM = 32 << 20;

/** A cell sent into a worker's queue before its inputs' answers (`settled`) came back. */
interface Ahead {
  worker: ComputeWorker;
  settled: Promise<unknown>;
}

/**
 * What the listener hears of a computation: `start` (computing, then
 * progress), `progress` only (sent ahead: announced when its inputs are
 * answered), or `nothing` (an input computed again, already settled).
 */
type Tell = "start" | "progress" | "nothing";

const stampOf = (stamp: string | null) => stamp === null ? {} : { stamp };

/** One run of a document: plan, send ready cells, settle them, finish. */
export class Run {
  readonly #host: RunHost;
  #superseded = false;
  #plan!: Plan;
  #fileData = new Map<string, FileData>();
  /** With `once`: cells still to settle that read each file (counted at the first settle). */
  #readersLeft: Map<string, number> | null = null;
  /** With `once`: cells not yet sent that read each file (counted at the first sending). */
  #unsentReaders: Map<string, number> | null = null;
  /** With `once`: cells counted in {@link Run.#unsentReaders} already. */
  #sentReaders = new Set<CellNode>();
  /** With `once`: the files let go, as the report gives them. */
  #filesLetGo = new Map<string, RunReport["files"][number]>();
  #fileErrors = new Map<CellNode, LocatedError>();
  /** With `page`: per cell, the fields its inline values name. */
  #named = new Map<string, Set<string>>();
  /** Cells not yet sent, and which of them to look at again (_waiting.ts). */
  #waiting!: Waiting;
  /** Cells sent and not yet settled. */
  #going = new Set<Promise<void>>();
  /** The report to come of every cell sent. */
  #answers = new Map<CellNode, Promise<CellReport>>();
  #reports = new Map<CellNode, CellReport>();
  /** The worker each cell being computed is on. */
  #computingOn = new Map<CellNode, ComputeWorker>();
  /** Every run request sent, in order, and whether the worker computed the cell. */
  #sent: { name: string; computed: boolean }[] = [];
  /** Wakes `execute` when a cell settles or starts computing (cells may then go or queue behind it). */
  #wake = () => {};

  /** @param host What the run uses of its session. */
  constructor(host: RunHost) {
    this.#host = host;
  }

  /**
   * Stops the run at its next step: its cells still waiting in a worker's
   * queue are cancelled now, and it tells the listener nothing more.
   */
  supersede(): void {
    this.#superseded = true;
    this.#cancelQueued();
  }

  /**
   * Reads the document's data files and keys every cell; the cells that can
   * run are announced queued.
   *
   * @param source The document text.
   */
  async plan(source: string): Promise<void> {
    const prep = this.#host.prepare(source);
    await this.#readFiles(prep);
    for (const [node, err] of await this.#host.stamps.fill(prep.graph.nodes, prep.settings)) {
      if (!this.#fileErrors.has(node)) this.#fileErrors.set(node, err);
    }
    const shas = new Map([...this.#fileData].map(([path, f]) => [path, f.sha256]));
    const plan = this.#plan = this.#host.keyed(prep, shas);
    // A cell still computing for an earlier run whose inputs changed is stopped (`search`).
    this.#host.pool.stopComputingUnless(new Set(plan.keys.values()));
    if (this.#host.page || this.#host.lean) this.#named = referencedFields(plan.doc);
    this.#startAhead(plan);
    this.#waiting = new Waiting(plan.graph.order, plan.graph.byName);
    for (const node of plan.graph.nodes) {
      if (!node.error && plan.keys.has(node.name)) this.#emit(node.name, "queued");
    }
  }

  /** Starts what the cells that will compute need outside the worker (`CellKind.ahead`). */
  #startAhead(plan: Plan): void {
    const stale = new Set(plan.stale);
    for (const node of plan.graph.nodes) {
      if (node.error || !stale.has(node.name)) continue;
      const mb = node.plugin?.ahead?.(node.spec)?.sandboxMb;
      if (mb !== undefined) startAhead(mb);
    }
  }

  async #readFiles(prep: Prepared): Promise<void> {
    for (const node of prep.graph.nodes) {
      if (node.error) continue;
      for (const f of node.files) {
        if (this.#fileData.has(f.path)) continue;
        try {
          const data = await this.#host.files.read(f.path, f.option, prep.settings.maxFileBytes);
          this.#fileData.set(f.path, data);
        } catch (err) {
          this.#fileErrors.set(node, locateError(node, err));
        }
      }
    }
  }

  /**
   * Computes what is stale (after {@link plan}) and reports every cell.
   *
   * @returns The report; `superseded` and no cells when a newer run took over.
   */
  async execute(): Promise<RunReport> {
    while (this.#waiting.size > 0 || this.#going.size > 0) {
      if (this.#superseded) this.#cancelQueued(); // those sent since
      else this.#sendReady();
      if (this.#going.size > 0) await this.#nextChange();
      else if (this.#superseded) break;
      else await this.#settleWaitingOnEachOther();
    }
    // Superseded also when a newer run started while this one's last cells computed.
    return this.#finish();
  }

  /**
   * Sends every waiting cell whose inputs have settled, or that can queue
   * behind them; only cells a change concerned are looked at (_waiting.ts).
   */
  #sendReady(): void {
    for (const node of this.#waiting.take()) {
      const ready = this.#inputsSettled(node);
      const behind = ready ? null : this.#queueBehind(node);
      if (!ready && behind === null) continue;
      this.#waiting.remove(node);
      this.#send(node, behind);
    }
  }

  #inputsOf(node: CellNode): readonly CellNode[] {
    return this.#waiting.inputsOf(node);
  }

  #inputsSettled(node: CellNode): boolean {
    return node.error !== null || this.#inputsOf(node).every((dep) => this.#reports.has(dep));
  }

  /**
   * The worker whose queue a cell may join now: it will compute, and its
   * unsettled inputs are all computing on that worker, which has a place left.
   */
  #queueBehind(node: CellNode): ComputeWorker | null {
    if (!this.#willCompute(node)) return null;
    let target: ComputeWorker | null = null;
    for (const dep of this.#inputsOf(node)) {
      if (this.#reports.has(dep)) continue;
      const on = this.#computingOn.get(dep);
      if (on === undefined || (target !== null && target !== on)) return null;
      target = on;
    }
    if (target === null) return null;
    if (this.#host.pool.queueOn(target)) return target;
    this.#waiting.park(node);
    return null;
  }

  /** Whether a cell will compute in this run (it can run and has no kept outcome). */
  #willCompute(node: CellNode): boolean {
    const key = this.#plan.keys.get(node.name);
    return node.error === null && !this.#fileErrors.has(node) && key !== undefined &&
      !this.#host.outcomes.has(key);
  }

  /** Starts a cell on its way; `behind`: the worker whose queue it joins ahead of its inputs. */
  #send(node: CellNode, behind: ComputeWorker | null): void {
    const ahead = behind === null ? null : {
      worker: behind,
      settled: Promise.all(this.#inputsOf(node).map((d) => this.#answers.get(d))),
    };
    const report = this.#answer(node, ahead).then((r) => {
      this.#reports.set(node, r);
      this.#computingOn.delete(node);
      if (this.#host.once) this.#letGoOfFiles(node);
      return r;
    });
    this.#answers.set(node, report);
    const going: Promise<void> = report.then(() => {}).finally(() => {
      this.#going.delete(going);
      this.#waiting.changed(node);
      this.#waiting.placeFreed();
      this.#wake();
    });
    this.#going.add(going);
  }

  /**
   * Waits until a cell settles or starts computing. One waker for the run,
   * never a race over every cell on its way (that kept n promise reactions
   * per change: quadratic in time and memory).
   */
  async #nextChange(): Promise<void> {
    await new Promise<void>((r) => this.#wake = r);
  }

  /** Only cells waiting on each other are left (a cycle): reports them one by one. */
  async #settleWaitingOnEachOther(): Promise<void> {
    for (const node of this.#waiting.drain()) {
      this.#reports.set(node, await this.#answer(node, null));
    }
  }

  /** Cancels this run's cells still waiting in a worker's queue. */
  #cancelQueued(): void {
    if (this.#computingOn.size === 0) return;
    const keys = new Set([...this.#computingOn.keys()].map((n) => this.#plan.keys.get(n.name)!));
    for (const w of this.#host.pool.workers) w.cancelQueued(keys);
  }

  #finish(): RunReport {
    const ran = this.#sent.filter((s) => s.computed).map((s) => s.name);
    const settings = this.#plan.settings;
    if (this.#superseded) {
      return { settings, cells: [], errors: [], files: [], ran, superseded: true };
    }
    this.#forgetUnused();
    return {
      settings,
      cells: this.#plan.graph.nodes.map((n) => this.#reports.get(n)!),
      errors: this.#plan.docErrors.map(located),
      files: [...this.#fileData].map(([path, f]) => this.#filesLetGo.get(path) ?? fileFacts(f)),
      ran,
      superseded: false,
    };
  }

  /**
   * With `once`: lets go of the bytes of each file the settled cell read when
   * no cell still to settle reads it (a million-row CSV is 137 MB: kept to
   * the end of a run, it was held beside every fit's arrays).
   */
  #letGoOfFiles(node: CellNode): void {
    if (this.#readersLeft === null) {
      // Counted once: a scan of every cell for each settled reader was quadratic in a document
      // of thousands of small tables.
      this.#readersLeft = new Map();
      for (const n of this.#plan.graph.nodes) {
        for (const p of new Set(n.files.map((f) => f.path))) {
          this.#readersLeft.set(p, (this.#readersLeft.get(p) ?? 0) + 1);
        }
      }
    }
    let dropped = 0;
    for (const { path, option } of node.files) {
      const left = (this.#readersLeft.get(path) ?? 1) - 1;
      this.#readersLeft.set(path, left);
      const data = this.#fileData.get(path);
      if (left > 0 || data === undefined || this.#filesLetGo.has(path)) continue;
      this.#filesLetGo.set(path, fileFacts(data));
      this.#fileData.set(path, { ...data, bytes: new Uint8Array(0) }); // its facts: #filesLetGo
      this.#host.files.forget(this.#host.files.resolvePath(path, option));
      dropped += data.bytes.length;
    }
    // Small files are not worth a message to the workers (a run of thousands of small tables
    // would send thousands, each listing every output); they go with the worker's store.
    if (dropped < COLLECT_FROM) return;
    const kept = [...this.#fileData].filter(([p]) => !this.#filesLetGo.has(p));
    // The workers keep every output (a later cell may read it) and the files still to be read.
    this.#host.pool.retain(this.#plan.keys.values(), kept.map(([, f]) => f.sha256));
    // This thread allocates little from here on: collect soon (once the frames of the answer
    // that settled have let go of the bytes too), or they stay resident.
    setTimeout(collectGarbage, 0);
  }

  /** Drops cached outcomes and worker outputs that the current document no longer uses. */
  #forgetUnused(): void {
    const live = new Set(this.#plan.keys.values());
    for (const k of this.#host.outcomes.keys()) if (!live.has(k)) this.#host.outcomes.delete(k);
    this.#host.pool.retain(live, [...this.#fileData.values()].map((f) => f.sha256));
  }

  /** A cell's way from sent to settled: failed, held, or its answer (kept or computed). */
  async #answer(node: CellNode, ahead: Ahead | null): Promise<CellReport> {
    const staticError = node.error ?? this.#fileErrors.get(node);
    if (staticError) return this.#settle(failedReport(node, located(staticError)));
    const early = ahead === null ? null : await this.#answerAhead(node, ahead);
    const why = this.#heldBecause(node);
    if (why !== null) return this.#settle(heldReport(node, why));
    const key = this.#plan.keys.get(node.name)!;
    const { outcome, cached } = await this.#outcome(node, key, early);
    return this.#settle(answerReport(node, key, outcome, cached));
  }

  /**
   * The answer of a cell sent ahead of its inputs' answers, once they came:
   * null when an input is not current (the worker found it missing, or the
   * run was cancelled), since that answer is not the cell's outcome.
   */
  async #answerAhead(node: CellNode, ahead: Ahead): Promise<DoneMessage | null> {
    const answer = this.#compute(node, ahead.worker);
    await ahead.settled;
    if (!node.deps.every((d) => this.#stateOf(d) === "current")) {
      await answer;
      return null;
    }
    // Its turn in the worker comes now that its inputs are answered.
    this.#emit(node.name, "computing");
    return await answer;
  }

  #stateOf(name: string): CellState | undefined {
    return this.#reports.get(this.#plan.graph.byName.get(name)!)?.state;
  }

  /** Why a cell is held (an input not current, or no key), or null when it can run. */
  #heldBecause(node: CellNode): string | null {
    const blocked = node.deps.find((d) => this.#stateOf(d) !== "current");
    if (blocked !== undefined) {
      return `input "${blocked}" is ${this.#stateOf(blocked) ?? "not ready"}`;
    }
    return this.#plan.keys.has(node.name) ? null : "an input cannot run";
  }

  /**
   * A cell's outcome: the answer sent ahead, else the kept one (summarised
   * again when the page now wants another shape), else computed now.
   */
  async #outcome(
    node: CellNode,
    key: string,
    early: DoneMessage | null,
  ): Promise<{ outcome: Outcome; cached: boolean }> {
    const page = this.#pageFields(node.name);
    const shape = page?.join("\n") ?? null;
    let kept = early === null ? this.#host.outcomes.get(key) : undefined;
    if (kept && kept.done.ok && kept.shape !== shape) {
      kept = await this.#reshape(node, key, kept, page, shape);
    }
    if (kept) return { outcome: kept, cached: true };
    const outcome = { done: early ?? await this.#compute(node), shape };
    if (!isTransient(outcome.done)) this.#host.outcomes.set(key, outcome);
    return { outcome, cached: false };
  }

  /** With `page`: the fields kept beyond the page's copy for a cell (sorted); else undefined. */
  #pageFields(name: string): string[] | undefined {
    return this.#host.page || this.#host.lean
      ? [...(this.#named.get(name) ?? [])].sort()
      : undefined;
  }

  /** The shape fields of a request: `page` or `lean` (the fields to keep), or neither. */
  #shapeOf(name: string): { page?: string[]; lean?: string[] } {
    const fields = this.#pageFields(name);
    if (fields === undefined) return {};
    return this.#host.page ? { page: fields } : { lean: fields };
  }

  /**
   * A kept outcome summarised again in the shape now wanted (an inline value
   * started or stopped naming one of its fields), without recomputing;
   * undefined when no worker holds the output any more (then it recomputes).
   */
  async #reshape(
    node: CellNode,
    key: string,
    outcome: Outcome,
    page: string[] | undefined,
    shape: string | null,
  ): Promise<Outcome | undefined> {
    const holder = this.#host.pool.holderOf(key);
    if (holder === undefined) return undefined;
    const d = await holder.summarize({
      key,
      kind: node.kind,
      spec: node.spec,
      ...(this.#host.page ? { page } : { lean: page }),
      ...(this.#host.keep ? { keep: true } : {}),
    });
    if (!d.ok) return undefined;
    const again = { done: { ...d, warnings: outcome.done.warnings, ms: outcome.done.ms }, shape };
    this.#host.outcomes.set(key, again);
    return again;
  }

  /**
   * Computes a cell on a worker of the pool: `queued`, a worker whose queue
   * it already has a place in (WorkerPool.queueOn), else the one holding the
   * most of its inputs when one is free.
   */
  async #compute(node: CellNode, queued?: ComputeWorker): Promise<DoneMessage> {
    const inputKeys = node.deps.map((d) => this.#plan.keys.get(d)!);
    const worker = queued ?? await this.#host.pool.acquire(inputKeys);
    this.#computingOn.set(node, worker);
    this.#waiting.changed(node);
    this.#wake();
    try {
      return await this.#computeOn(worker, node, queued === undefined ? "start" : "progress");
    } finally {
      this.#host.pool.release(worker);
    }
  }

  /**
   * Computes a cell on one worker: an input this worker lacks is copied from
   * the worker that holds it, or, when none does, computed again here first.
   */
  async #computeOn(worker: ComputeWorker, node: CellNode, tell: Tell): Promise<DoneMessage> {
    const failed = await this.#bringInputs(worker, node);
    if (failed !== null) return failed;
    const files: Record<string, FileData> = {};
    for (const f of node.files) files[f.path] = this.#fileData.get(f.path)!;
    const letGo = this.#lastReaderOf(node);
    if (tell === "start") this.#emit(node.name, "computing");
    const sent = { name: node.name, computed: false };
    this.#sent.push(sent);
    const done = await worker.run({
      key: this.#plan.keys.get(node.name)!,
      kind: node.kind,
      name: node.name,
      spec: node.spec,
      settings: this.#plan.settings,
      inputs: Object.fromEntries(node.deps.map((d) => [d, this.#plan.keys.get(d)!])),
      files,
      ...stampOf(this.#host.stamps.of(node)),
      ...this.#shapeOf(node.name),
      ...(this.#host.keep ? { keep: true } : {}),
      ...(letGo.length > 0 ? { letGo } : {}),
      onProgress: (fraction, note) => {
        if (tell !== "nothing") this.#emit(node.name, "computing", fraction, note);
      },
    });
    sent.computed = done.computed;
    if (done.computed) this.#host.computed(node.name);
    return done;
  }

  /**
   * Gives a worker the inputs of a cell that it lacks.
   *
   * @returns The failed answer of an input computed again, else null.
   */
  async #bringInputs(worker: ComputeWorker, node: CellNode): Promise<DoneMessage | null> {
    for (const dep of node.deps) {
      const key = this.#plan.keys.get(dep)!;
      if (worker.willHave(key)) continue;
      const out = await this.#host.pool.holderOf(key, worker)?.exportOutput(key);
      if (out) {
        const made = this.#plan.graph.byName.get(dep)!;
        worker.importOutput(key, out, { kind: made.kind, spec: made.spec });
        continue;
      }
      const made = this.#plan.graph.byName.get(dep)!;
      // An input that cannot compute (its file unread, its options wrong) is not computed
      // again for a cell sent ahead of it: that cell is answered held once the input fails.
      if (made.error || this.#fileErrors.has(made)) {
        return transientAnswer(-1, `Input "${dep}" cannot be computed`);
      }
      const again = await this.#computeOn(worker, made, "nothing");
      if (!again.ok) return again;
    }
    return null;
  }

  /**
   * With `once`: the SHA-256s of the files this cell is the last to be sent
   * that reads (`RunRequest.letGo`: the worker drops them after it). Counted
   * once per cell, at its first sending.
   */
  #lastReaderOf(node: CellNode): string[] {
    if (!this.#host.once || this.#sentReaders.has(node)) return [];
    this.#sentReaders.add(node);
    if (this.#unsentReaders === null) {
      this.#unsentReaders = new Map();
      for (const n of this.#plan.graph.nodes) {
        for (const p of new Set(n.files.map((f) => f.path))) {
          this.#unsentReaders.set(p, (this.#unsentReaders.get(p) ?? 0) + 1);
        }
      }
    }
    const last: string[] = [];
    for (const path of new Set(node.files.map((f) => f.path))) {
      const left = (this.#unsentReaders.get(path) ?? 1) - 1;
      this.#unsentReaders.set(path, left);
      const data = this.#fileData.get(path);
      if (left === 0 && data !== undefined) last.push(data.sha256);
    }
    return last;
  }

  #emit(name: string, state: CellState, fraction?: number, note?: string): void {
    if (!this.#superseded) this.#host.emit({ name, state, fraction, note });
  }

  /** Settles a cell: tells the listener (unless superseded) and returns its report. */
  #settle(report: CellReport): CellReport {
    if (!this.#superseded) this.#host.emit({ name: report.name, state: report.state, report });
    return report;
  }
}

/** A file as a run's report gives it. */
function fileFacts(f: FileData): RunReport["files"][number] {
  return { path: f.path, sha256: f.sha256, bytes: f.bytes.length, lines: lineCount(f.bytes) };
}
