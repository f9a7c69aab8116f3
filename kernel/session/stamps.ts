/**
 * Stamps: fingerprints of what cells read from outside the document other
 * than files (a database query's answer, `CellKind.stamp`), asked on the
 * main thread and kept per cell spec across runs, so they can enter cache
 * keys as a data file's SHA-256 does.
 *
 * ```
 *  Run.plan ─▶ fill(cells): a spec not yet stamped is asked now (its answer kept)
 *           ─▶ Session keys each cell with its stamp
 *  live workspace, from time to time ─▶ recheck(): every kept stamp asked again;
 *           true when one differs (the workspace then reruns the document)
 * ```
 *
 * A database has no modification time to watch, so a live session asks
 * again on a timer (kernel/server/live_workspace.ts); `plumb run` asks once.
 *
 * @module
 */
import type { DocSettings } from "../contract/mod.ts";
import type { EngineAccess } from "../engine/types.ts";
import { hashValue } from "../hash.ts";
import { type CellNode, locateError } from "../graph/build.ts";
import type { LocatedError } from "../errors.ts";

/** Database access whose statements run under the document's `query_time_limit`. */
function withTimeLimit(engine: EngineAccess, settings: DocSettings): EngineAccess {
  const limit = settings.queryTimeLimit;
  if (limit === undefined) return engine;
  return {
    rows: (db, sql, maxRows, o) => engine.rows(db, sql, maxRows, { timeLimit: limit, ...o }),
    rfactor: (db, sql, o) => engine.rfactor(db, sql, { timeLimit: limit, ...o }),
  };
}

/** One kept stamp and how to ask for it again. */
interface Kept {
  stamp: string;
  /** Milliseconds the last answer took. */
  ms: number;
  ask: () => Promise<string> | null;
}

/** The session's stamps, by cell kind and spec. */
export class Stamps {
  readonly #engine: EngineAccess;
  readonly #kept = new Map<string, Kept>();

  /** @param engine The session's database access. */
  constructor(engine: EngineAccess) {
    this.#engine = engine;
  }

  /** The key a cell's stamp is kept under: its kind and spec (not its name). */
  static keyOf(node: Pick<CellNode, "kind" | "specJson">): string {
    return hashValue(["stamp", node.kind, node.specJson]);
  }

  /**
   * A cell's kept stamp.
   *
   * @param node The cell.
   * @returns The stamp, or null when its kind has none or it has not been asked.
   */
  of(node: CellNode): string | null {
    if (!node.plugin?.stamp) return null;
    return this.#kept.get(Stamps.keyOf(node))?.stamp ?? null;
  }

  /**
   * Asks the stamps the cells lack (all at once), keeping the answers.
   *
   * @param nodes The document's cells.
   * @param settings The document's settings.
   * @returns The error of each cell whose stamp could not be had, located on its option.
   */
  async fill(
    nodes: readonly CellNode[],
    settings: DocSettings,
  ): Promise<Map<CellNode, LocatedError>> {
    const errors = new Map<CellNode, LocatedError>();
    const asked: Promise<void>[] = [];
    for (const node of nodes) {
      if (node.error || !node.plugin?.stamp) continue;
      const key = Stamps.keyOf(node);
      if (this.#kept.has(key)) continue;
      const plugin = node.plugin;
      const engine = withTimeLimit(this.#engine, settings);
      const ask = () => plugin.stamp!(node.spec, { name: node.name, settings, engine });
      asked.push((async () => {
        const t0 = performance.now();
        try {
          const stamp = await ask();
          if (stamp !== null) this.#kept.set(key, { stamp, ms: performance.now() - t0, ask });
        } catch (err) {
          errors.set(node, locateError(node, err));
        }
      })());
    }
    await Promise.all(asked);
    return errors;
  }

  /**
   * Asks every kept stamp again. One that changed is kept anew; one that
   * fails is dropped, so the next run asks it and the cell says why.
   *
   * @param inUse Keys ({@link keyOf}) of the cells the document still has; the others are dropped.
   * @returns True when some stamp changed or failed.
   */
  async recheck(inUse: ReadonlySet<string>): Promise<boolean> {
    let changed = false;
    const asked: Promise<void>[] = [];
    for (const [key, kept] of this.#kept) {
      if (!inUse.has(key)) {
        this.#kept.delete(key);
        continue;
      }
      asked.push((async () => {
        const t0 = performance.now();
        try {
          const stamp = await kept.ask();
          if (stamp === kept.stamp) kept.ms = performance.now() - t0;
          else {
            changed = true;
            if (stamp === null) this.#kept.delete(key);
            else this.#kept.set(key, { ...kept, stamp, ms: performance.now() - t0 });
          }
        } catch {
          changed = true;
          this.#kept.delete(key);
        }
      })());
    }
    await Promise.all(asked);
    return changed;
  }

  /** How many stamps are kept. */
  get size(): number {
    return this.#kept.size;
  }

  /** Milliseconds the kept stamps took to ask, together (the last answers). */
  get costMs(): number {
    let ms = 0;
    for (const k of this.#kept.values()) ms += k.ms;
    return ms;
  }

  /** One hash of every kept stamp (for the live workspace's print of what a run saw). */
  print(): string {
    return hashValue([...this.#kept].map(([k, v]) => [k, v.stamp]).sort());
  }
}
