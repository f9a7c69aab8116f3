/**
 * The live page: top bar, the document as a report (prose and cell blocks in
 * order), the rail, and the add-a-cell form. Removing a cell keeps its text
 * in this page's memory for undo until the page is reloaded; for 30 s the
 * undo is exact (the removal's version and offset), from the top bar's
 * notice or Alt+U (ui/undo.ts).
 *
 * @module
 */
import type { VNode } from "preact";
import { memo } from "preact/compat";
import { useCallback, useEffect, useRef, useState } from "preact/hooks";
import type { DocumentMessage } from "../kernel/server/protocol.ts";
import { deleteCell, newCell, restoreCell, type SaveOutcome } from "./api.ts";
import { CellBlock } from "./cell_block.tsx";
import { ChangesPanel } from "./changes_panel.tsx";
import { InlineRef } from "./inline_ref.tsx";
import { Prose } from "./prose.tsx";
import { Rail, type Removed } from "./rail.tsx";
import type { LiveStore } from "./store.ts";
import { TopBar } from "./top_bar.tsx";
import { isUndoKey, undoList } from "./undo.ts";
import { pages } from "../cells/pages.ts";

/** Kinds offered when adding a cell (every kind with a page face); the server gives each its template. */
export const ADDABLE_KINDS: readonly string[] = [...pages.keys()];

/** Removed cells already put back (by the rail or by undo), so neither puts one back twice. */
const restored = new WeakSet<Removed>();

function cellNames(doc: DocumentMessage): string[] {
  return doc.blocks.flatMap((b) => b.type === "cell" ? [b.name] : []);
}

/**
 * A free cell name for a kind: the kind itself, then kind-2, kind-3, …
 *
 * @param kind The kind.
 * @param taken Names in use.
 * @returns A name not in `taken`.
 * @example
 * ```ts
 * import { freeName } from "./app.tsx";
 * if (freeName("fit", ["fit", "fit-2"]) !== "fit-3") throw new Error("name");
 * ```
 */
export function freeName(kind: string, taken: readonly string[]): string {
  if (!taken.includes(kind)) return kind;
  for (let i = 2;; i++) if (!taken.includes(`${kind}-${i}`)) return `${kind}-${i}`;
}

function AddCell(props: {
  doc: DocumentMessage;
  after: string | null;
  onDone(): void;
  onError(e: string): void;
}): VNode {
  const names = cellNames(props.doc);
  const [kind, setKind] = useState<string>("fit");
  const [name, setName] = useState<string>("");
  const chosen = name.trim() || freeName(kind, names);
  async function add(e: Event) {
    e.preventDefault();
    const out = await newCell({ after: props.after, kind, name: chosen, base: props.doc.version });
    if (out.ok) props.onDone();
    else props.onError(failure(out));
  }
  return (
    <form class="pl-add" onSubmit={add} aria-label="Add a cell">
      <span>Add a cell{props.after ? ` after ${props.after}` : " at the end"}:</span>
      <label>
        kind{" "}
        <select value={kind} onChange={(e) => setKind((e.target as HTMLSelectElement).value)}>
          {ADDABLE_KINDS.map((k) => <option key={k} value={k}>{k}</option>)}
        </select>
      </label>
      <label>
        name{" "}
        <input
          value={name}
          placeholder={freeName(kind, names)}
          onInput={(e) => setName((e.target as HTMLInputElement).value)}
          size={12}
        />
      </label>
      <button type="submit" class="pl-button">Add</button>
    </form>
  );
}

interface LiveProseProps {
  text: string;
  line: number;
  store: LiveStore;
  names: string[];
}

/** A prose block with live inline values; re-rendered only when its text or the cell names change. */
const LiveProse = memo(
  (p: LiveProseProps) => (
    <Prose
      text={p.text}
      line={p.line}
      refs={(ref, key) => <InlineRef key={key} ref_={ref} store={p.store} names={p.names} />}
    />
  ),
  (a: LiveProseProps, b: LiveProseProps) =>
    a.text === b.text && a.line === b.line && a.store === b.store &&
    a.names.join("\n") === b.names.join("\n"),
);

function failure(out: SaveOutcome<unknown>): string {
  if (out.ok) return "";
  return out.conflict !== null
    ? "The file changed on disk meanwhile; nothing was written. Try again on the new version"
    : out.error;
}

/**
 * The whole page.
 *
 * @param props The page's store.
 * @returns The page.
 */
export function App(props: { store: LiveStore }): VNode {
  const { store } = props;
  const doc = store.doc.value;
  const [removed, setRemoved] = useState<Removed[]>([]);
  const [addAfter, setAddAfter] = useState<string | null | undefined>(undefined);
  const [error, setError] = useState<string | null>(null);
  const actions = useRef({ remove: (_: string) => {}, addBelow: (_: string) => {} });
  const onRemove = useCallback((n: string) => actions.current.remove(n), []);
  const onAddBelow = useCallback((n: string) => actions.current.addBelow(n), []);
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (!isUndoKey(e)) return;
      e.preventDefault();
      undoList.undoLatest().then((why) => why !== null && setError(why));
    };
    globalThis.addEventListener("keydown", onKey);
    return () => globalThis.removeEventListener("keydown", onKey);
  }, []);

  if (doc === null) {
    return (
      <div class="pl-page">
        <TopBar doc={null} store={store} />
        <main class="pl-main">
          <p class="pl-muted">◌ Waiting for the document…</p>
        </main>
      </div>
    );
  }
  const names = cellNames(doc);

  async function remove(name: string) {
    const i = names.indexOf(name);
    const block = doc!.blocks.find((b) => b.type === "cell" && b.name === name);
    const out = await deleteCell({ name, base: doc!.version });
    if (!out.ok) return setError(failure(out));
    const r: Removed = {
      name,
      kind: block?.type === "cell" ? block.kind : "",
      text: out.value.removed,
      after: i > 0 ? names[i - 1] : null,
      version: out.value.version,
      at: out.value.at,
    };
    setRemoved((list) => [...list, r]);
    undoList.remember(`removed ${r.kind} "${name}"`, () => putBack(r));
  }

  /** Exactly where it was while the file is as the removal left it, else after the cell it followed. */
  async function putBack(r: Removed): Promise<SaveOutcome<unknown>> {
    if (restored.has(r)) return { ok: false, conflict: null, error: "it is back already" };
    let out = await restoreCell({ text: r.text, at: r.at, base: r.version });
    if (!out.ok && out.conflict !== null) {
      const after = r.after !== null && cellNames(store.doc.value!).includes(r.after)
        ? r.after
        : null;
      out = await restoreCell({ text: r.text, at: after, base: out.conflict.diskVersion });
    }
    if (out.ok) {
      restored.add(r);
      setRemoved((list) => list.filter((x) => x !== r));
    }
    return out;
  }

  async function undo(r: Removed) {
    const out = await putBack(r);
    if (!out.ok) setError(failure(out));
  }

  actions.current = { remove, addBelow: (n) => setAddAfter(n) };
  const run = store.lastRun.value;
  return (
    <div
      class="pl-page"
      data-version={doc.version}
      data-run={run?.run ?? 0}
      data-run-ms={run?.ms ?? ""}
    >
      <TopBar doc={doc} store={store} />
      <div class="pl-body">
        <main class="pl-main">
          <ChangesPanel changes={store.changes.value} />
          {error !== null && (
            <p class="pl-error" role="alert">
              ✕ {error}{" "}
              <button type="button" class="pl-link" onClick={() => setError(null)}>dismiss</button>
            </p>
          )}
          {run !== null && run.errors.length > 0 && (
            <ul class="pl-doc-errors" role="alert">
              {run.errors.map((e) => (
                <li key={`${e.line}:${e.column}`}>
                  ✕ {e.message} <span class="pl-where">(line {e.line}, column {e.column})</span>
                </li>
              ))}
            </ul>
          )}
          {doc.blocks.map((b) =>
            b.type === "prose"
              ? (
                <LiveProse
                  key={`p${b.line}`}
                  text={b.text}
                  line={b.line}
                  store={store}
                  names={names}
                />
              )
              : (
                <div key={`c-${b.name}`}>
                  <CellBlock
                    store={store}
                    block={b}
                    version={doc.version}
                    onRemove={onRemove}
                    onAddBelow={onAddBelow}
                  />
                  {addAfter === b.name && (
                    <AddCell
                      doc={doc}
                      after={b.name}
                      onDone={() => setAddAfter(undefined)}
                      onError={setError}
                    />
                  )}
                </div>
              )
          )}
          <AddCell doc={doc} after={null} onDone={() => {}} onError={setError} />
        </main>
        <Rail store={store} doc={doc} removed={removed} onUndo={undo} />
      </div>
    </div>
  );
}
