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
import { headingsOf } from "./markdown.ts";
import { StateMark } from "./state_mark.tsx";
import { heldReason, type LiveCell, type LiveStore, standing } from "./store.ts";

/** A cell removed from this page, kept for undo until the page reloads. */
export interface Removed {
  name: string;
  kind: string;
  text: string;
  /** The cell it followed (null: it was the first). */
  after: string | null;
  /** The document version the removal made, and where the text was: an exact undo while unchanged. */
  version: string;
  at: number;
}

interface CompareLike {
  preferred?: string | null;
  verdict?: string;
}

/**
 * The verdict's own opening words, as the ledger's line: the comparison's
 * verdict (cells/compare/verdict.ts) up to its first "; " or ". ", so the
 * ledger and the block say the same ("No clear winner: …" in both).
 *
 * @param name The compare cell's name.
 * @param r Its result.
 * @returns One line of evidence.
 * @example
 * ```ts
 * import { ledgerLine } from "./rail.tsx";
 * const l = ledgerLine("fade", { preferred: "root", verdict: 'No clear winner: "root" and ' +
 *   '"line" are within 2 by AICc (ΔAICc 0.88); "root" is ahead (Akaike weight 0.46); more' });
 * if (l !== 'No clear winner: "root" and "line" are within 2 by AICc (ΔAICc 0.88)') throw new Error(l);
 * ```
 */
export function ledgerLine(name: string, r: CompareLike): string {
  const v = typeof r.verdict === "string" ? r.verdict.trim() : "";
  if (v !== "") {
    const cut = [v.indexOf("; "), v.indexOf(". ")].filter((i) => i > 0);
    return cut.length === 0 ? v : v.slice(0, Math.min(...cut));
  }
  return r.preferred ? `"${r.preferred}" ranked first` : `${name}: no fit ranked`;
}

/** What the ledger says of one comparison: its verdict only while that is of the current run. */
function LedgerEntry(props: { c: LiveCell }): VNode {
  const c = props.c;
  const s = standing(c);
  const verdict = (c.result as CompareLike | undefined)?.verdict;
  const text = s === "current" || s === "updating"
    ? ledgerLine(c.name, c.result as CompareLike)
    : c.state === "failed"
    ? `failed: ${c.error?.message ?? "see the block"}`
    : c.state === "held"
    ? `held: ${heldReason(c.error?.message)}`
    : c.state;
  return (
    <li data-ledger={c.name} data-standing={s}>
      <a href={`#cell-${c.name}`}>{c.name}</a> <StateMark state={c.state} word={false} />{" "}
      <span
        class={s === "current" ? "pl-ledger-text" : "pl-ledger-text pl-muted"}
        title={s === "current" ? verdict : undefined}
      >
        {text}
      </span>
    </li>
  );
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
            {compares.map((c) => <LedgerEntry key={c.name} c={c} />)}
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
  const bad = props.cells.filter((c) => c.state === "failed" || c.state === "held");
  if (bad.length === 0) return null;
  const failed = bad.filter((c) => c.state === "failed").length;
  const held = bad.length - failed;
  const head = [failed > 0 ? `✕ ${failed} failed` : "", held > 0 ? `‖ ${held} held` : ""];
  return (
    <section class="pl-rail-part pl-failures" aria-label="Failures">
      <h2>{head.filter((h) => h !== "").join(" · ")}</h2>
      <ul>
        {bad.map((c) => (
          <li key={c.name}>
            <StateMark state={c.state} word={false} />{" "}
            <a href={`#cell-${c.name}`}>{c.kind} {c.name}</a>
            <span class="pl-muted">
              : {c.state === "held" ? heldReason(c.error?.message) : c.error?.message ?? "failed"}
            </span>
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
    <aside class="pl-rail" id="rail" aria-label="Ledger and outline">
      <Ledger cells={cells} />
      <Failures cells={cells} />
      <Outline blocks={props.doc.blocks} store={props.store} />
      <RemovedList removed={props.removed} onUndo={props.onUndo} />
    </aside>
  );
}
