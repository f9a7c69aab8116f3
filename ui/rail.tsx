/**
 * The right rail: the model ledger (the preferred model of each comparison
 * with its evidence in one line), the failures one click away, an outline
 * of headings and cells with their states, and the cells removed in this
 * page's life with an undo each.
 *
 * @module
 */
import type { VNode } from "preact";
import { memo } from "preact/compat";
import type { DocumentMessage } from "../kernel/server/protocol.ts";
import { formatValue } from "./inline_value.ts";
import { headingsOf } from "./markdown.ts";
import { StateMark } from "./state_mark.tsx";
import type { LiveCell, LiveStore } from "./store.ts";

/** A cell removed from this page, kept for undo until the page reloads. */
export interface Removed {
  name: string;
  kind: string;
  text: string;
  /** The cell it followed (null: it was the first). */
  after: string | null;
}

interface CompareRow {
  fit: string;
  delta?: number | null;
  weight?: number | null;
}

interface CompareLike {
  by?: string;
  preferred?: string | null;
  rows?: CompareRow[];
  verdict?: string;
}

/**
 * The ledger's line for one comparison.
 *
 * @param name The compare cell's name.
 * @param r Its result.
 * @returns One line of evidence, e.g. "root preferred: weight 0.93; next line at Δaicc 4.20".
 * @example
 * ```ts
 * import { ledgerLine } from "./rail.tsx";
 * const l = ledgerLine("fade", { by: "aicc", preferred: "root",
 *   rows: [{ fit: "root", delta: 0, weight: 0.93 }, { fit: "line", delta: 5.3, weight: 0.07 }] });
 * if (!l.includes("root") || !l.includes("Δaicc 5.30")) throw new Error(l);
 * ```
 */
export function ledgerLine(name: string, r: CompareLike): string {
  const rows = r.rows ?? [];
  if (!r.preferred) return `${name}: no preferred model`;
  const best = rows.find((x) => x.fit === r.preferred);
  const next = rows.filter((x) => x.fit !== r.preferred)
    .sort((a, b) => (a.delta ?? Infinity) - (b.delta ?? Infinity))[0];
  const by = r.by ?? "criterion";
  const parts = [`${r.preferred} preferred`];
  if (best?.weight != null) parts.push(`weight ${formatValue(best.weight, 2)}`);
  if (next !== undefined && next.delta != null) {
    parts.push(`next ${next.fit} at Δ${by} ${next.delta.toFixed(2)}`);
  }
  return `${parts.join("; ")} (${rows.length} fits)`;
}

function Ledger(props: { cells: LiveCell[] }): VNode {
  const compares = props.cells.filter((c) => c.kind === "compare");
  return (
    <section class="pl-rail-part" aria-label="Model ledger">
      <h2>Model ledger</h2>
      {compares.length === 0
        ? <p class="pl-muted">No comparison in this document yet.</p>
        : (
          <ul class="pl-ledger">
            {compares.map((c) => (
              <li key={c.name}>
                <a href={`#cell-${c.name}`}>{c.name}</a> <StateMark state={c.state} word={false} />
                {" "}
                {c.result !== undefined
                  ? (
                    <span title={(c.result as CompareLike).verdict}>
                      {ledgerLine(c.name, c.result as CompareLike)}
                    </span>
                  )
                  : <span class="pl-muted">not computed yet</span>}
              </li>
            ))}
          </ul>
        )}
    </section>
  );
}

/** One cell in the outline: reads only its own cell's signal. */
function OutlineCell(props: { name: string; kind: string; store: LiveStore }): VNode {
  const c = props.store.cell(props.name, props.kind).value;
  return (
    <li class="pl-outline-cell" data-outline={props.name}>
      <StateMark state={c.state} word={false} />{" "}
      <a href={`#cell-${props.name}`}>
        <span class="pl-muted">{props.kind}</span> {props.name}
      </a>
    </li>
  );
}

interface OutlineProps {
  blocks: DocumentMessage["blocks"];
  store: LiveStore;
}

/** Redrawn only for new blocks (the headings are not re-parsed for a cell's state). */
const Outline = memo(
  (props: OutlineProps): VNode => {
    const items: VNode[] = [];
    for (const b of props.blocks) {
      if (b.type === "prose") {
        for (const hd of headingsOf(b.text, b.line)) {
          items.push(
            <li key={hd.id} class={`pl-outline-h pl-outline-h${hd.level}`}>
              <a href={`#${hd.id}`}>{hd.text}</a>
            </li>,
          );
        }
      } else {
        items.push(
          <OutlineCell key={`c-${b.name}`} name={b.name} kind={b.kind} store={props.store} />,
        );
      }
    }
    return (
      <nav class="pl-rail-part" aria-label="Outline">
        <h2>Outline</h2>
        <ul class="pl-outline">{items}</ul>
      </nav>
    );
  },
  (a: OutlineProps, b: OutlineProps) => a.blocks === b.blocks && a.store === b.store,
);

function Failures(props: { cells: LiveCell[] }): VNode | null {
  const bad = props.cells.filter((c) => c.state === "failed");
  if (bad.length === 0) return null;
  return (
    <section class="pl-rail-part pl-failures" aria-label="Failures">
      <h2>✕ {bad.length} failed</h2>
      <ul>
        {bad.map((c) => (
          <li key={c.name}>
            <a href={`#cell-${c.name}`}>{c.kind} {c.name}</a>
            {c.error && <span class="pl-muted">: {c.error.message}</span>}
          </li>
        ))}
      </ul>
    </section>
  );
}

function RemovedList(props: { removed: Removed[]; onUndo(r: Removed): void }): VNode | null {
  if (props.removed.length === 0) return null;
  return (
    <section class="pl-rail-part" aria-label="Removed cells">
      <h2>Removed</h2>
      <ul>
        {props.removed.map((r) => (
          <li key={r.name + r.text.length}>
            {r.kind} {r.name}{" "}
            <button type="button" class="pl-link" onClick={() => props.onUndo(r)}>undo</button>
          </li>
        ))}
      </ul>
    </section>
  );
}

/**
 * Renders the rail.
 *
 * @param props The store, the document, the removed cells and the undo action.
 * @returns The rail.
 */
export function Rail(props: {
  store: LiveStore;
  doc: DocumentMessage;
  removed: Removed[];
  onUndo(r: Removed): void;
}): VNode {
  const cells = props.store.cells();
  return (
    <aside class="pl-rail">
      <Ledger cells={cells} />
      <Failures cells={cells} />
      <Outline blocks={props.doc.blocks} store={props.store} />
      <RemovedList removed={props.removed} onUndo={props.onUndo} />
    </aside>
  );
}
