/**
 * An inline value in prose, drawn live from its cell: the formatted value;
 * while the cell recomputes, the last value dimmed; an unknown cell or field,
 * or a failed cell, is an error in words at that spot.
 *
 * @module
 */
import type { VNode } from "preact";
import { didYouMean } from "../kernel/suggest.ts";
import { resolveValue } from "./inline_value.ts";
import type { ProseRef } from "./markdown.ts";
import type { LiveStore } from "./store.ts";

/**
 * Renders one inline value.
 *
 * @param props The reference, the store and the names of the document's cells.
 * @returns A span.
 */
export function InlineRef(
  props: { ref_: ProseRef; store: LiveStore; names: readonly string[] },
): VNode {
  const { ref_: ref } = props;
  if (!props.names.includes(ref.cell)) {
    return (
      <span class="pl-ref pl-ref-error" role="note" title={ref.text}>
        ✕ unknown cell “{ref.cell}”{didYouMean(ref.cell, props.names)}
      </span>
    );
  }
  const c = props.store.cell(ref.cell).value;
  if (c.state === "failed" || c.state === "held") {
    return (
      <span class="pl-ref pl-ref-error" title={ref.text}>
        ✕ {ref.cell} {c.state}
      </span>
    );
  }
  if (c.result === undefined) {
    return <span class="pl-ref pl-ref-wait" title={`${ref.text}: ${c.state}`}>◌ {ref.cell}…</span>;
  }
  const r = resolveValue(c.result, ref.cell, ref.path, ref.digits);
  if (!r.ok) return <span class="pl-ref pl-ref-error" title={ref.text}>✕ {r.error}</span>;
  const stale = c.state !== "current";
  return (
    <span class={stale ? "pl-ref pl-stale" : "pl-ref"} title={ref.text} data-ref={ref.text}>
      {r.text}
    </span>
  );
}
