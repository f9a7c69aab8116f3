/**
 * A few compute workers, each with no permissions, shared by one session:
 * independent cells (the fits of one table, then a comparison, a check and
 * charts) compute at the same time, one per worker.
 *
 * ```
 *  Session ──acquire(input keys)──▶ a free worker, preferring the one that
 *     │                              holds the most of those outputs
 *     │  an input held by another worker ──export──▶ main ──import──▶ this one
 *     └──release──▶ the worker goes to the next waiting cell (first come first served)
 * ```
 *
 * Why copy instead of computing an input again: a 10,000-row table or fit
 * is 0.5–2 ms to clone and several ms to recompute; an input that no worker
 * holds (after a crash, or a superseded run) is still computed again on the
 * worker that needs it (Session).
 *
 * @module
 */
import type { EngineClient } from "../engine/client.ts";
import { ComputeWorker } from "./client.ts";

/**
 * Workers to start by default: two on four cores or more, else one. Measured
 * on two cores (the live-update bench, 10,000 rows, browser on the same
 * machine): two workers made an update slower, p50 147 → 187 ms, each fit
 * taking 3–5 times as long beside the other worker, the copies between
 * them and the browser; one worker leaves a core to the page.
 *
 * @returns 1 or 2.
 */
export function defaultWorkers(): number {
  const cores = globalThis.navigator?.hardwareConcurrency ?? 1;
  return cores >= 4 ? 2 : 1;
}

/**
 * Runs a worker may have waiting behind the one it computes: enough that it
 * goes from one cell to the next without waiting for the kernel's answer
 * (about a millisecond a cell, measured), few enough that other workers get
 * the independent cells.
 */
export const QUEUE_DEPTH = 2;

/** Compute workers handed out one cell at a time. */
export class WorkerPool {
  /** The workers, in start order. */
  readonly workers: readonly ComputeWorker[];
  /** Runs sent to each worker and not yet answered. */
  #load = new Map<ComputeWorker, number>();
  #waiting: { inputs: readonly string[]; take: (w: ComputeWorker) => void }[] = [];

  /**
   * @param url The worker entry module.
   * @param size How many workers (at least 1).
   * @param engine The document's database access, shared by the workers (null: none).
   */
  constructor(url: URL, size: number = defaultWorkers(), engine: EngineClient | null = null) {
    this.workers = Array.from(
      { length: Math.max(1, Math.floor(size)) },
      () => new ComputeWorker(url, engine),
    );
    for (const w of this.workers) this.#load.set(w, 0);
  }

  /**
   * Waits for a place on a worker: an idle one first, else a place in the
   * queue of the least busy (at most {@link QUEUE_DEPTH} runs waiting, so the
   * worker goes on to the next cell without waiting for this thread); among
   * equals, the one that holds the most of `inputs` (then the first started).
   *
   * @param inputs Cache keys of the outputs the cell reads.
   * @returns The worker, to be given back with {@link release}.
   */
  acquire(inputs: readonly string[]): Promise<ComputeWorker> {
    const best = this.#best(inputs);
    if (best === null) return new Promise((take) => this.#waiting.push({ inputs, take }));
    this.#load.set(best, this.#load.get(best)! + 1);
    return Promise.resolve(best);
  }

  #best(inputs: readonly string[]): ComputeWorker | null {
    const held = (w: ComputeWorker) => inputs.filter((k) => w.has(k)).length;
    let best: ComputeWorker | null = null;
    for (const w of this.workers) {
      const load = this.#load.get(w)!;
      if (load >= 1 + QUEUE_DEPTH) continue;
      const b = best === null ? Infinity : this.#load.get(best)!;
      if (load < b || (load === b && held(w) > held(best!))) best = w;
    }
    return best;
  }

  /**
   * Takes a place in a busy worker's queue, for a cell whose inputs are being
   * computed there (it runs right after them, with no round trip between).
   *
   * @param w The worker computing the inputs.
   * @returns True when `w` had fewer than {@link QUEUE_DEPTH} runs waiting; then
   *   give it back with {@link release} like an acquired one.
   */
  queueOn(w: ComputeWorker): boolean {
    const load = this.#load.get(w) ?? Infinity;
    if (load >= 1 + QUEUE_DEPTH) return false;
    this.#load.set(w, load + 1);
    return true;
  }

  /**
   * Gives a place back, to the cell that has waited longest for one.
   *
   * @param w A worker from {@link acquire} or {@link queueOn}.
   */
  release(w: ComputeWorker): void {
    this.#load.set(w, Math.max(0, (this.#load.get(w) ?? 1) - 1));
    const next = this.#waiting[0];
    if (next === undefined) return;
    const best = this.#best(next.inputs);
    if (best === null) return;
    this.#waiting.shift();
    this.#load.set(best, this.#load.get(best)! + 1);
    next.take(best);
  }

  /**
   * A worker other than `except` holding the output under `key`.
   *
   * @param key A cache key.
   * @param except The worker that lacks it.
   * @returns The holder, or undefined when no other worker holds it.
   */
  holderOf(key: string, except?: ComputeWorker): ComputeWorker | undefined {
    return this.workers.find((w) => w !== except && w.has(key));
  }

  /**
   * Lets every worker drop the outputs and files not listed.
   *
   * @param keys Output keys still needed.
   * @param shas File digests still needed.
   */
  retain(keys: Iterable<string>, shas: Iterable<string>): void {
    const k = [...keys], s = [...shas];
    for (const w of this.workers) w.retain(k, s);
  }

  /**
   * Stops each worker's computing run whose key is not listed (see
   * `ComputeWorker.stopComputingUnless`).
   *
   * @param keys The cache keys a newer plan wants.
   */
  stopComputingUnless(keys: ReadonlySet<string>): void {
    for (const w of this.workers) w.stopComputingUnless(keys);
  }

  /** Stops every worker. */
  close(): void {
    for (const w of this.workers) w.close();
  }
}
