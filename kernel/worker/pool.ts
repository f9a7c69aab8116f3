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

/** Compute workers handed out one cell at a time. */
export class WorkerPool {
  /** The workers, in start order. */
  readonly workers: readonly ComputeWorker[];
  #free: ComputeWorker[];
  #waiting: { inputs: readonly string[]; take: (w: ComputeWorker) => void }[] = [];

  /**
   * @param url The worker entry module.
   * @param size How many workers (at least 1).
   */
  constructor(url: URL, size: number = defaultWorkers()) {
    this.workers = Array.from(
      { length: Math.max(1, Math.floor(size)) },
      () => new ComputeWorker(url),
    );
    this.#free = [...this.workers];
  }

  /**
   * Waits for a free worker; when several are free, takes the one that holds
   * the most of `inputs` (then the first started).
   *
   * @param inputs Cache keys of the outputs the cell reads.
   * @returns The worker, to be given back with {@link release}.
   */
  acquire(inputs: readonly string[]): Promise<ComputeWorker> {
    if (this.#free.length === 0) {
      return new Promise((take) => this.#waiting.push({ inputs, take }));
    }
    const held = (w: ComputeWorker) => inputs.filter((k) => w.has(k)).length;
    let best = this.#free[0];
    for (const w of this.#free) if (held(w) > held(best)) best = w;
    this.#free.splice(this.#free.indexOf(best), 1);
    return Promise.resolve(best);
  }

  /**
   * Gives a worker back: to the cell that has waited longest, else to the free list.
   *
   * @param w A worker from {@link acquire}.
   */
  release(w: ComputeWorker): void {
    const next = this.#waiting.shift();
    if (next) next.take(w);
    else this.#free.push(w);
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

  /** Stops every worker. */
  close(): void {
    for (const w of this.workers) w.close();
  }
}
