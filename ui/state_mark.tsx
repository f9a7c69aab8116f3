/**
 * A cell's state as a shape and a word, never colour alone:
 * current ●, queued ○, computing ◐, failed ✕, held ‖ (an input failed);
 * for the page as a whole also "not live" ⊘ (the connection is lost).
 *
 * @module
 */
import type { VNode } from "preact";
import type { LiveCellState } from "../kernel/server/protocol.ts";
import type { OverallState } from "./store.ts";

const SHAPE: Record<LiveCellState | OverallState, string> = {
  current: "●",
  queued: "○",
  computing: "◐",
  failed: "✕",
  held: "‖",
  empty: "·",
  offline: "⊘",
};

const WORD: Record<LiveCellState | OverallState, string> = {
  current: "current",
  queued: "queued",
  computing: "computing",
  failed: "failed",
  held: "held",
  empty: "empty",
  offline: "not live",
};

/**
 * Renders a state mark.
 *
 * @param props `state`; `word: false` shows the shape alone (with the word
 *   kept for screen readers and as a tooltip).
 * @returns A span with the shape and the word.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { StateMark } from "./state_mark.tsx";
 * const html = renderToString(StateMark({ state: "failed" }));
 * if (!html.includes("✕") || !html.includes("failed")) throw new Error(html);
 * ```
 */
export function StateMark(
  props: { state: LiveCellState | OverallState; word?: boolean; label?: string },
): VNode {
  const word = props.label ?? WORD[props.state];
  return (
    <span class={`pl-state pl-state-${props.state}`} title={word}>
      <span class="pl-state-shape" aria-hidden="true">{SHAPE[props.state]}</span>
      {props.word === false
        ? <span class="pl-sr">{word}</span>
        : <span class="pl-state-word">{word}</span>}
    </span>
  );
}
