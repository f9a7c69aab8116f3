/**
 * The undo notice in the top bar: the newest change of this page that can
 * still be taken back (ui/undo.ts), with its undo control and the key
 * (Alt+U), for as long as it can be. Part of the bar, so it covers nothing;
 * not printed.
 *
 * @module
 */
import type { VNode } from "preact";
import { useState } from "preact/hooks";
import { now } from "./clock.ts";
import { undoList } from "./undo.ts";

/**
 * Renders the notice, or nothing when there is nothing to undo.
 *
 * @returns The notice.
 */
export function UndoNotice(): VNode | null {
  const [why, setWhy] = useState<string | null>(null);
  void now.value; // re-read on the clock's tick, so an entry past its time goes
  void undoList.entries.value; // and on every change of the list
  const e = undoList.live().at(-1);
  if (why !== null) {
    return (
      <p class="pl-undo pl-live-only" role="alert">
        ✕ {why} <button type="button" class="pl-link" onClick={() => setWhy(null)}>dismiss</button>
      </p>
    );
  }
  if (e === undefined) return null;
  return (
    <p class="pl-undo pl-live-only" role="status" data-undo={e.id}>
      ↶ {e.what[0].toUpperCase() + e.what.slice(1)}:{" "}
      <button
        type="button"
        class="pl-link"
        data-action="undo"
        onClick={() => undoList.undoLatest().then(setWhy)}
      >
        undo
      </button>{" "}
      <span class="pl-hint">
        or <kbd>Alt</kbd>+<kbd>U</kbd>
      </span>{" "}
      <button
        type="button"
        class="pl-link pl-undo-close"
        aria-label="Dismiss"
        onClick={() => undoList.forget(e.id)}
      >
        ×
      </button>
    </p>
  );
}
