/**
 * The cells of a run not yet sent, and which of them to look at again.
 *
 * A run used to look at every waiting cell after every change and to race
 * every cell on its way: with 10,000 cells that is 10,000 × 10,000 checks
 * and promise reactions (99 s and 3.8 GB, issue 11). A cell's readiness
 * changes only when one of its inputs settles or starts computing, or, for
 * a cell waiting to queue behind its inputs, when a worker's queue has a
 * place again; so a change marks just those cells, and the run looks at the
 * marked ones, in the graph's order.
 *
 * ```
 *  input settles / starts computing ──changed(input)──▶ its waiting readers marked
 *  a place in a worker's queue frees ──placeFreed()──▶ cells parked for a place marked
 *  take() ──▶ the marked cells still waiting, in graph order (marks cleared)
 * ```
 *
 * @module
 */
import type { CellNode } from "../graph/build.ts";

/** Waiting cells with their readers indexed, so a change marks only whom it concerns. */
export class Waiting {
  /** Position in the graph's order (the order cells are sent in). */
  #position = new Map<CellNode, number>();
  #left = new Set<CellNode>();
  #marked = new Set<CellNode>();
  /** Cells that could queue behind their inputs but found the worker's queue full. */
  #parked = new Set<CellNode>();
  #readers = new Map<CellNode, CellNode[]>();
  #inputs = new Map<CellNode, CellNode[]>();

  /**
   * @param order Every cell, inputs before readers.
   * @param byName The graph's lookup by name.
   */
  constructor(order: readonly CellNode[], byName: ReadonlyMap<string, CellNode>) {
    order.forEach((node, i) => {
      this.#position.set(node, i);
      this.#left.add(node);
      this.#marked.add(node);
      const inputs = node.deps.flatMap((d) => byName.get(d) ?? []);
      this.#inputs.set(node, inputs);
      for (const input of inputs) {
        const list = this.#readers.get(input);
        if (list === undefined) this.#readers.set(input, [node]);
        else list.push(node);
      }
    });
  }

  /** How many cells are not yet sent. */
  get size(): number {
    return this.#left.size;
  }

  /**
   * The cells a node reads (those in the graph).
   *
   * @param node A cell of the run.
   * @returns Its input cells.
   */
  inputsOf(node: CellNode): readonly CellNode[] {
    return this.#inputs.get(node) ?? [];
  }

  /**
   * The marked cells still waiting, in the graph's order; the marks are cleared.
   *
   * @returns Cells to look at now.
   */
  take(): CellNode[] {
    const out = [...this.#marked].filter((n) => this.#left.has(n));
    this.#marked.clear();
    if (out.length > 1) out.sort((a, b) => this.#position.get(a)! - this.#position.get(b)!);
    return out;
  }

  /**
   * Marks the waiting readers of a cell that settled or started computing.
   *
   * @param node The cell.
   */
  changed(node: CellNode): void {
    for (const r of this.#readers.get(node) ?? []) if (this.#left.has(r)) this.#marked.add(r);
  }

  /**
   * Remembers a cell that waits for a place in a worker's queue.
   *
   * @param node The cell.
   */
  park(node: CellNode): void {
    this.#parked.add(node);
  }

  /** Marks the cells waiting for a place in a worker's queue (a place may have freed). */
  placeFreed(): void {
    for (const n of this.#parked) this.#marked.add(n);
    this.#parked.clear();
  }

  /**
   * Takes a cell off the waiting list (it was sent).
   *
   * @param node The cell.
   */
  remove(node: CellNode): void {
    this.#left.delete(node);
    this.#parked.delete(node);
  }

  /**
   * Takes every cell still waiting off the list.
   *
   * @returns Those cells, in the graph's order.
   */
  drain(): CellNode[] {
    const out = [...this.#left]; // a Set keeps insertion order: the graph's
    this.#left.clear();
    this.#marked.clear();
    this.#parked.clear();
    return out;
  }
}
