/**
 * Undo of the page's own changes to the document: a removed cell or a saved
 * edit can be taken back for {@link UNDO_KEEP_MS}, from the notice in the
 * top bar or with Alt+U ({@link isUndoKey}). An undo goes through the save
 * API with the version the change made as its base, so it puts back the
 * exact previous bytes or, when the file moved on meanwhile, is refused
 * (409) and says so; it never writes over a change it did not see.
 *
 * ```
 *  remove / save ──remember(what, undo)──▶ entries (newest last, each kept 30 s)
 *  notice "undo" or Alt+U ──undoLatest()──▶ entry.undo() ──▶ POST /api/cell[/restore]
 * ```
 *
 * @module
 */
import { type Signal, signal } from "@preact/signals";
import type { SaveOutcome } from "./api.ts";

/** How long a change can be undone (ms). */
export const UNDO_KEEP_MS = 30_000;

/** One change that can be taken back. */
export interface UndoEntry {
  id: number;
  /** In words, e.g. `removed fit "root"`. */
  what: string;
  /** Local clock (ms) when it was made. */
  at: number;
  undo(): Promise<SaveOutcome<unknown>>;
}

/** The changes of this page that can still be undone. */
export class UndoList {
  /** Newest last; read by the notice. */
  readonly entries: Signal<UndoEntry[]> = signal([]);
  #next = 1;
  #clock: () => number;
  #keep: number;

  /**
   * @param clock The local clock in ms (injectable for tests).
   * @param keepMs How long an entry can be undone.
   */
  constructor(clock: () => number = () => Date.now(), keepMs = UNDO_KEEP_MS) {
    this.#clock = clock;
    this.#keep = keepMs;
  }

  /**
   * Remembers a change.
   *
   * @param what The change in words.
   * @param undo What takes it back.
   * @returns The entry.
   */
  remember(what: string, undo: () => Promise<SaveOutcome<unknown>>): UndoEntry {
    const e = { id: this.#next++, what, at: this.#clock(), undo };
    this.entries.value = [...this.live(), e];
    return e;
  }

  /**
   * The entries still within their time, newest last.
   *
   * @returns Them.
   */
  live(): UndoEntry[] {
    const t = this.#clock();
    return this.entries.value.filter((e) => t - e.at < this.#keep);
  }

  /** Forgets an entry (dismissed, or done). */
  forget(id: number): void {
    this.entries.value = this.entries.value.filter((e) => e.id !== id);
  }

  /** Forgets entries past their time (called by the page's clock). */
  prune(): void {
    const live = this.live();
    if (live.length !== this.entries.value.length) this.entries.value = live;
  }

  /**
   * Takes back the newest change still within its time.
   *
   * @returns Null when undone (or nothing to undo), else why it could not be.
   * @example
   * ```ts
   * import { UndoList } from "./undo.ts";
   * let t = 0;
   * const list = new UndoList(() => t, 1000);
   * let undone: string = "";
   * list.remember("removed a", () => { undone = "a"; return Promise.resolve({ ok: true, value: {} }); });
   * t = 2000; // past its time
   * if (await list.undoLatest() !== null || undone !== "") throw new Error("expired entry undone");
   * list.remember("removed b", () => { undone = "b"; return Promise.resolve({ ok: true, value: {} }); });
   * if (await list.undoLatest() !== null || (undone as string) !== "b") throw new Error("not undone");
   * ```
   */
  async undoLatest(): Promise<string | null> {
    const e = this.live().at(-1);
    if (e === undefined) return null;
    this.forget(e.id);
    const out = await e.undo();
    if (out.ok) return null;
    return out.conflict !== null
      ? `Cannot undo (${e.what}): the file changed since; nothing was written`
      : `Cannot undo (${e.what}): ${out.error}`;
  }
}

/** The page's undo list. */
export const undoList: UndoList = new UndoList();

/**
 * Whether a key press asks for undo: Alt+U (Option+U), outside text fields
 * (where it may type a character, and the field's own undo applies).
 *
 * @param e The key event.
 * @returns True for the undo key.
 * @example
 * ```ts
 * import { isUndoKey } from "./undo.ts";
 * const e = { altKey: true, ctrlKey: false, metaKey: false, code: "KeyU", target: null };
 * if (!isUndoKey(e as unknown as KeyboardEvent)) throw new Error("Alt+U");
 * ```
 */
export function isUndoKey(e: KeyboardEvent): boolean {
  if (!e.altKey || e.ctrlKey || e.metaKey || e.code !== "KeyU") return false;
  const t = e.target as { tagName?: string; isContentEditable?: boolean } | null;
  const tag = t?.tagName?.toLowerCase();
  return !(tag === "textarea" || tag === "input" || tag === "select" || t?.isContentEditable);
}
