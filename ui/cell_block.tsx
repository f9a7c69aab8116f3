/**
 * One cell on the page: a thin header (kind, name, state as shape and word,
 * time taken), a progress bar while computing, the kind's view of its result
 * (kept, dimmed, while it recomputes), warnings, and for a failed cell the
 * message with the offending source line marked. Its source opens in place.
 * A failed or held cell's earlier result is folded away under "from an
 * earlier run" (ui/store.ts `standing`), never shown as if current.
 *
 * @module
 */
import type { VNode } from "preact";
import { memo } from "preact/compat";
import { useLayoutEffect, useRef, useState } from "preact/hooks";
import type { LiveBlock } from "../kernel/server/protocol.ts";
import { heldReason, type LiveCell, type LiveStore, standing } from "./store.ts";
import { StateMark } from "./state_mark.tsx";
import { formatDuration } from "../cells/shared/format.ts";
import { viewOf } from "../cells/pages.ts";
import { GenericView } from "./generic_view.tsx";
import { SourceListing } from "./source_listing.tsx";
import { Editor } from "./editor.tsx";
import { now } from "./clock.ts";

type CellBlockData = Extract<LiveBlock, { type: "cell" }>;

/** Props of {@link CellBlock}. */
export interface CellBlockProps {
  store: LiveStore;
  block: CellBlockData;
  version: string;
  onRemove(name: string): void;
  onAddBelow(name: string): void;
}

function Progress(props: { fraction: number | null; note: string | null }): VNode {
  const f = props.fraction;
  return (
    <>
      {props.note && <em class="pl-progress-note">{props.note}</em>}
      <div
        class={f === null ? "pl-progress pl-progress-open" : "pl-progress"}
        role="progressbar"
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={f === null ? undefined : Math.round(100 * f)}
        aria-label={props.note ?? "Computing"}
      >
        <span style={f === null ? undefined : { width: `${Math.round(100 * f)}%` }} />
      </div>
    </>
  );
}

interface ResultProps {
  kind: string;
  name: string;
  result: unknown;
  line: string | null;
}

/** Redrawn only for a new result (a chart of 10,000 points is not redrawn for a state word). */
const Result = memo(
  ResultOf,
  (a: ResultProps, b: ResultProps) =>
    a.result === b.result && a.kind === b.kind && a.name === b.name && a.line === b.line,
);

function ResultOf(props: ResultProps) {
  const View = viewOf(props.kind);
  if (props.result === undefined) return null;
  if (View === undefined) return <GenericView result={props.result} summaryLine={props.line} />;
  return <View name={props.name} result={props.result} />;
}

/** How far beyond the screen a block still shows its newest result: half a screen. */
const NEAR = "50% 0px";

/** One observer for every block: the callbacks of the blocks it watches. */
let near: IntersectionObserver | null = null;
const watchers = new Map<Element, (inView: boolean) => void>();

function nearObserver(): IntersectionObserver | null {
  if (near === null && typeof globalThis.IntersectionObserver === "function") {
    near = new IntersectionObserver((entries) => {
      for (const e of entries) watchers.get(e.target)?.(e.isIntersecting);
    }, { rootMargin: NEAR });
  }
  return near;
}

/**
 * Whether a block is on or near the screen (within half a screen of it), so
 * that it shows its newest result. True until the browser says otherwise,
 * where it cannot say (no IntersectionObserver), and while printing.
 *
 * The browser itself skips rendering blocks further off (`content-visibility:
 * auto`, ui/style.ts; Chrome's margin is larger, about one and a half
 * screens), but that alone saves layout and paint, not the page's own work
 * of redrawing a result nobody can see.
 */
function useNear(ref: { current: Element | null }): boolean {
  const [inView, setInView] = useState(true);
  useLayoutEffect(() => {
    const el = ref.current;
    const io = nearObserver();
    if (el === null || io === null) return;
    watchers.set(el, setInView);
    io.observe(el);
    const print = () => setInView(true);
    globalThis.addEventListener?.("beforeprint", print);
    return () => {
      io.unobserve(el);
      watchers.delete(el);
      globalThis.removeEventListener?.("beforeprint", print);
    };
  }, []);
  return inView;
}

/** A failed or held cell's last result, folded: it is not of the inputs as they are now. */
function Earlier(props: { cell: LiveCell; kind: string; result: unknown; line: string | null }) {
  const c = props.cell;
  return (
    <details class="pl-earlier pl-live-only" data-earlier={c.resultRun}>
      <summary>
        Result of an earlier run (run {c.resultRun}), not of the inputs as they are now
      </summary>
      <div class="pl-result">
        <Result kind={props.kind} name={c.name} result={props.result} line={props.line} />
      </div>
    </details>
  );
}

function same(a: CellBlockProps, b: CellBlockProps): boolean {
  return a.store === b.store && a.version === b.version && a.onRemove === b.onRemove &&
    a.onAddBelow === b.onAddBelow && a.block.name === b.block.name &&
    a.block.kind === b.block.kind && a.block.line === b.block.line && a.block.body === b.block.body;
}

/**
 * Renders a cell; re-renders only when its own cell signal changes or its
 * block in the document does (not for every message about other cells).
 *
 * @param props See {@link CellBlockProps}.
 * @returns The cell's block.
 */
export const CellBlock = memo(CellBlockOf, same);

function CellBlockOf(props: CellBlockProps): VNode {
  const { block, store } = props;
  const cell = store.cell(block.name, block.kind).value;
  const section = useRef<HTMLElement>(null);
  const rendered = useNear(section);
  // A block the browser is not rendering keeps showing the result it had and
  // draws the newest when it comes near the screen (data-pending meanwhile):
  // an update of a long analysis redraws what a reader can see, not all of it.
  const shown = useRef({ result: cell.result, line: cell.summaryLine });
  if (rendered || shown.current.result === undefined) {
    shown.current = { result: cell.result, line: cell.summaryLine };
  }
  const pending = shown.current.result !== cell.result;
  const [showSource, setShowSource] = useState(false);
  const [editing, setEditing] = useState<{ body: string; base: string } | null>(null);
  const failed = cell.state === "failed";
  const stand = standing(cell);
  const busy = cell.state === "computing" || cell.state === "queued";
  const elapsed = cell.state === "computing"
    ? (cell.ms ?? 0) + Math.max(0, now.value - cell.since)
    : cell.ms;
  return (
    <section
      ref={section}
      class={`pl-cell pl-cell-${cell.state}`}
      id={`cell-${block.name}`}
      data-block={block.name}
      data-kind={block.kind}
      data-state={cell.state}
      data-run={cell.run}
      data-computed={cell.computedRun}
      aria-busy={busy}
    >
      <header class="pl-cell-head">
        <span class="pl-cell-kind">{block.kind}</span>
        <h3 class="pl-cell-name">{block.name}</h3>
        <StateMark state={cell.state} />
        {elapsed !== null && cell.state !== "queued" && (
          <span
            class="pl-cell-ms pl-live-only"
            title={cell.cached ? "reused: inputs unchanged" : "time taken"}
          >
            {formatDuration(elapsed)}
            {cell.cached ? " · reused" : ""}
          </span>
        )}
        <span class="pl-cell-actions pl-live-only">
          <button
            type="button"
            class="pl-link"
            aria-expanded={showSource || editing !== null}
            onClick={() => setShowSource(!showSource)}
          >
            source
          </button>
          <button
            type="button"
            class="pl-link"
            data-action="edit"
            onClick={() => setEditing({ body: block.body, base: props.version })}
          >
            edit
          </button>
          <button type="button" class="pl-link" onClick={() => props.onAddBelow(block.name)}>
            add below
          </button>
          <button type="button" class="pl-link" onClick={() => props.onRemove(block.name)}>
            remove
          </button>
        </span>
        {cell.state === "computing" && <Progress fraction={cell.fraction} note={cell.note} />}
      </header>
      {failed && cell.error && (
        <p class="pl-error" role="alert">
          ✕ {cell.error.message}{" "}
          <span class="pl-where">(line {cell.error.line}, column {cell.error.column})</span>
        </p>
      )}
      {cell.state === "held" && (
        <p class="pl-note pl-held-why">
          ‖ Waiting on its inputs: {heldReason(cell.error?.message)}
        </p>
      )}
      {editing !== null
        ? (
          <Editor
            name={block.name}
            body={editing.body}
            base={editing.base}
            diskBody={block.body}
            onClose={() => setEditing(null)}
          />
        )
        : (showSource || failed) && (
          <SourceListing
            kind={block.kind}
            name={block.name}
            line={block.line}
            body={block.body}
            error={failed ? cell.error : null}
          />
        )}
      {cell.warnings.length > 0 && (
        <ul class="pl-warnings">
          {cell.warnings.map((w) => <li key={w}>⚠ {w}</li>)}
        </ul>
      )}
      {stand === "earlier"
        ? (
          <Earlier
            cell={cell}
            kind={block.kind}
            result={shown.current.result}
            line={shown.current.line}
          />
        )
        : (
          <div
            class={busy ? "pl-result pl-stale" : "pl-result"}
            data-pending={pending || undefined}
          >
            <Result
              kind={block.kind}
              name={block.name}
              result={shown.current.result}
              line={shown.current.line}
            />
          </div>
        )}
    </section>
  );
}
