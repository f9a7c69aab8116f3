/**
 * A cell's source opened in place: a monospace text area, saved with
 * Ctrl+S / Cmd+S or the button. A save carries the document version the
 * edit started from; when the disk moved on the server answers with a
 * conflict and this shows both versions (disk and yours) with two choices —
 * take the disk's, or keep editing yours — and never overwrites silently.
 * A saved edit can be undone for a while (ui/undo.ts): the undo saves the
 * body the edit replaced, based on the version the edit made.
 *
 * @module
 */
import type { VNode } from "preact";
import { useRef, useState } from "preact/hooks";
import type { ConflictResponse } from "../kernel/server/protocol.ts";
import { saveCell } from "./api.ts";
import { cellBody } from "./cell_body.ts";
import { undoList } from "./undo.ts";

/** Props of {@link Editor}. */
export interface EditorProps {
  name: string;
  /** The body when editing started. */
  body: string;
  /** The document version when editing started. */
  base: string;
  /** The cell's body in the latest document message (to tell of a change on disk). */
  diskBody: string;
  onClose(): void;
}

/**
 * The in-place editor of one cell.
 *
 * @param props See {@link EditorProps}.
 * @returns The editor.
 */
export function Editor(props: EditorProps): VNode {
  const [text, setText] = useState(props.body);
  const [base, setBase] = useState(props.base);
  // The body on disk that a save replaces: the one opened, or the disk's after a conflict.
  const [before, setBefore] = useState(props.body);
  const [conflict, setConflict] = useState<ConflictResponse | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [saving, setSaving] = useState(false);
  const area = useRef<HTMLTextAreaElement>(null);

  async function save() {
    if (saving) return;
    setSaving(true);
    setError(null);
    const out = await saveCell({ name: props.name, body: text, base });
    setSaving(false);
    if (out.ok) {
      const name = props.name;
      const version = out.value.version;
      if (before !== text) {
        undoList.remember(
          `edit of "${name}"`,
          () => saveCell({ name, body: before, base: version }),
        );
      }
      props.onClose();
    } else if (out.conflict !== null) setConflict(out.conflict);
    else setError(out.error);
  }

  function onKey(e: KeyboardEvent) {
    if ((e.ctrlKey || e.metaKey) && e.key.toLowerCase() === "s") {
      e.preventDefault();
      save();
    }
  }

  const changedOnDisk = conflict === null && props.diskBody !== props.body;
  const rows = Math.min(30, Math.max(3, text.split("\n").length + 1));
  return (
    <div class="pl-editor" data-editor={props.name}>
      {changedOnDisk && (
        <p class="pl-note" role="status">
          ⚠ This cell changed on disk since you opened it; saving will show both versions.
        </p>
      )}
      <textarea
        ref={area}
        class="pl-editor-text"
        aria-label={`Source of ${props.name}`}
        spellcheck={false}
        rows={rows}
        value={text}
        onInput={(e) => setText((e.target as HTMLTextAreaElement).value)}
        onKeyDown={onKey}
      />
      <div class="pl-editor-bar">
        <button type="button" class="pl-button pl-primary" onClick={save} disabled={saving}>
          {saving ? "Saving…" : "Save"}
        </button>
        <button type="button" class="pl-button" onClick={props.onClose}>Close</button>
        <span class="pl-hint">Ctrl+S or ⌘S saves</span>
      </div>
      {error !== null && <p class="pl-error" role="alert">✕ {error}</p>}
      {conflict !== null && (
        <Conflict
          name={props.name}
          conflict={conflict}
          yours={text}
          onTakeDisk={(body) => {
            setText(body);
            setBefore(body);
            setBase(conflict.diskVersion);
            setConflict(null);
            area.current?.focus();
          }}
          onKeepMine={() => {
            setBefore(cellBody(conflict.disk, props.name) ?? before);
            setBase(conflict.diskVersion);
            setConflict(null);
            area.current?.focus();
          }}
        />
      )}
    </div>
  );
}

function Conflict(props: {
  name: string;
  conflict: ConflictResponse;
  /** The text being edited (the server does not send it back). */
  yours: string;
  onTakeDisk(body: string): void;
  onKeepMine(): void;
}): VNode {
  const disk = cellBody(props.conflict.disk, props.name);
  return (
    <section class="pl-conflict" role="alert" aria-label="Save conflict">
      <h4>✕ Not saved: the file changed on disk after you started editing</h4>
      <p>
        Nothing was written. Compare the two versions of <code>{props.name}</code>{" "}
        and choose; saving again after “keep editing mine” replaces the disk's version of this cell.
      </p>
      {props.conflict.note !== undefined && <p>{props.conflict.note}</p>}
      <div class="pl-conflict-sides">
        <figure>
          <figcaption>On disk now</figcaption>
          <pre class="pl-conflict-disk">{disk ?? "(this cell is no longer in the file)"}</pre>
        </figure>
        <figure>
          <figcaption>Yours</figcaption>
          <pre class="pl-conflict-yours">{props.yours}</pre>
        </figure>
      </div>
      <div class="pl-editor-bar">
        <button
          type="button"
          class="pl-button"
          disabled={disk === null}
          onClick={() => disk !== null && props.onTakeDisk(disk)}
        >
          Reload the disk version
        </button>
        <button type="button" class="pl-button" onClick={props.onKeepMine}>
          Keep editing mine
        </button>
      </div>
    </section>
  );
}
