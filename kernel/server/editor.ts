/**
 * The save path: the page's edits applied one at a time, each only onto the
 * version it was based on, every refusal answered in plain words.
 *
 * ```
 *  POST /api/cell…  ─▶ body ≤ limit? (413)  ─▶ JSON object with text "base"? (400)
 *    ─▶ remove stray temporary files of earlier crashes (stray_temps.ts)
 *    ─▶ read the bytes, decode strictly (422 not UTF-8, 404 gone)
 *    ─▶ version == base? (409 with the disk's text; the request's body is never echoed)
 *    ─▶ edit the text (edits.ts: 400 malformed, 404 no such cell)
 *    ─▶ replace if unchanged (replace_if_unchanged.ts: 409 when an editor's write
 *       landed meanwhile; 403/507/500 with the file intact when writing fails)
 *    ─▶ 200 {version}, and the workspace reruns
 * ```
 *
 * @module
 */
import { basename, dirname } from "node:path";
import type { Registry } from "../contract/mod.ts";
import { sha256Hex } from "../hash.ts";
import { decodeDocument, DocumentRefusal, readDocumentBytes } from "./document_bytes.ts";
import { deleteCell, type Edited, EditError, newCell, restoreCell, saveCell } from "./edits.ts";
import type { LiveWorkspace } from "./live_workspace.ts";
import type { ConflictResponse } from "./protocol.ts";
import { replaceIfUnchanged, type SaveHooks } from "./replace_if_unchanged.ts";
import { BodyRefusal, MAX_BODY_BYTES, readJsonObject } from "./request_body.ts";
import { removeStrayTemps } from "./stray_temps.ts";

/** What the editor needs: the workspace (its document and results) and the kinds. */
export interface EditorOptions {
  workspace: LiveWorkspace;
  registry: Registry;
  /** The largest request body in bytes (default {@link MAX_BODY_BYTES}). */
  maxBodyBytes?: number;
  /** Test hooks of the save path (failure and race injection). */
  saveHooks?: SaveHooks;
}

/** Applies edits one at a time, each only on the version it was based on. */
export class Editor {
  #lock: Promise<unknown> = Promise.resolve();

  /** @param opts The workspace, kinds, body limit and test hooks. */
  constructor(readonly opts: EditorOptions) {}

  /**
   * Answers one edit request, after the ones before it.
   *
   * @param pathname The endpoint.
   * @param req The request.
   * @returns The answer: never a bare 500, never the request's body.
   */
  handle(pathname: string, req: Request): Promise<Response> {
    const next = this.#lock.then(() => this.#apply(pathname, req));
    this.#lock = next.catch(() => {});
    return next;
  }

  async #apply(pathname: string, req: Request): Promise<Response> {
    const path = this.opts.workspace.documentPath;
    try {
      const edit = Object.hasOwn(EDITS, pathname) ? EDITS[pathname] : undefined;
      if (!edit) return refuse(404, `No such endpoint "${pathname}"`);
      const body = await readJsonObject(req, this.opts.maxBodyBytes ?? MAX_BODY_BYTES);
      if (typeof body.base !== "string") return refuse(400, `"base" must be the document version`);
      await removeStrayTemps(path).catch(() => {});
      const disk = await readDocumentBytes(path);
      if (disk.version !== body.base) return conflict(path, disk.bytes);
      const { registry, workspace } = this.opts;
      const edited = edit(disk.source, body, registry, (n) => workspace.resultOf(n));
      const next = new TextEncoder().encode(edited.source);
      const out = await replaceIfUnchanged(path, disk.bytes, next, this.opts.saveHooks);
      if (!out.written) return conflict(path, out.disk, out.note);
      void workspace.request([path]);
      const extra = edited.removed === undefined ? {} : { removed: edited.removed, at: edited.at };
      return Response.json({ version: await sha256Hex(next), ...extra });
    } catch (err) {
      return refusal(err, path);
    }
  }
}

const refuse = (status: number, error: string): Response => Response.json({ error }, { status });

async function conflict(path: string, bytes: Uint8Array, note?: string): Promise<Response> {
  const answer: ConflictResponse = {
    conflict: true,
    disk: decodeDocument(bytes, path),
    diskVersion: await sha256Hex(bytes),
    ...(note === undefined ? {} : { note }),
  };
  return Response.json(answer, { status: 409 });
}

/** The answer to a failed edit: its own status for a refusal, a plain sentence for a write error. */
function refusal(err: unknown, path: string): Response {
  if (err instanceof BodyRefusal || err instanceof EditError || err instanceof DocumentRefusal) {
    return refuse(err.status, err.message);
  }
  const name = `Cannot save "${basename(path)}"`;
  const kept = "the file is unchanged";
  if (err instanceof Deno.errors.NotFound) {
    return refuse(404, `${name}: the file is no longer there`);
  }
  if (err instanceof Deno.errors.PermissionDenied || err instanceof Deno.errors.NotCapable) {
    return refuse(403, `${name}: no permission to write in its folder "${dirname(path)}"; ${kept}`);
  }
  const code = (err as { code?: string } | null)?.code;
  if (code === "EROFS") return refuse(403, `${name}: its folder is on a read-only disk; ${kept}`);
  if (code === "ENOSPC" || code === "EDQUOT") {
    return refuse(507, `${name}: the disk is full; ${kept}`);
  }
  const why = err instanceof Error ? err.message : String(err);
  return refuse(500, `${name}: ${why}; ${kept}`);
}

type Edit = (
  source: string,
  body: Record<string, unknown>,
  registry: Registry,
  resultOf: (name: string) => unknown,
) => Edited;

const EDITS: Record<string, Edit> = {
  "/api/cell": (s, b) => saveCell(s, b.name, b.body),
  "/api/cell/new": (s, b, r, of) => newCell(s, b, r, of),
  "/api/cell/delete": (s, b) => deleteCell(s, b.name),
  "/api/cell/restore": (s, b) => restoreCell(s, b.text, b.at),
};
