/**
 * The page's requests to the server (kernel/server/protocol.ts): save a
 * cell's body, add, remove and restore cells. Every POST carries the token
 * header (read from `<meta name="plumb-token">`) besides the cookie.
 *
 * @module
 */
import {
  type ConflictResponse,
  type DeleteCellRequest,
  type DeletedResponse,
  type NewCellRequest,
  type RestoreCellRequest,
  type SaveCellRequest,
  type SavedResponse,
  TOKEN_HEADER,
} from "../kernel/server/protocol.ts";

/** What a save came to. */
export type SaveOutcome<T = SavedResponse> =
  | { ok: true; value: T }
  | { ok: false; conflict: ConflictResponse }
  | { ok: false; conflict: null; error: string };

function token(): string {
  const meta = globalThis.document?.querySelector('meta[name="plumb-token"]');
  return meta?.getAttribute("content") ?? "";
}

async function post<T>(path: string, body: unknown): Promise<SaveOutcome<T>> {
  let res: Response;
  try {
    res = await fetch(path, {
      method: "POST",
      headers: { "content-type": "application/json", [TOKEN_HEADER]: token() },
      body: JSON.stringify(body),
      credentials: "same-origin",
    });
  } catch (e) {
    return { ok: false, conflict: null, error: `Cannot reach the server: ${String(e)}` };
  }
  const text = await res.text();
  let json: unknown = null;
  try {
    json = JSON.parse(text);
  } catch {
    // Not JSON: reported below with the status.
  }
  if (res.ok) return { ok: true, value: json as T };
  if (res.status === 409 && json !== null && (json as ConflictResponse).conflict === true) {
    return { ok: false, conflict: json as ConflictResponse };
  }
  const msg = (json as { error?: string } | null)?.error ?? (text.slice(0, 200) || res.statusText);
  return { ok: false, conflict: null, error: `The server refused (${res.status}): ${msg}` };
}

/**
 * Replaces one cell's body.
 *
 * @param req Name, new body and the version the edit was based on.
 * @returns The new version, a conflict with both versions, or an error.
 */
export function saveCell(req: SaveCellRequest): Promise<SaveOutcome> {
  return post("/api/cell", req);
}

/**
 * Adds a cell with its kind's template.
 *
 * @param req Where, kind, name, base version.
 * @returns The new version, a conflict, or an error.
 */
export function newCell(req: NewCellRequest): Promise<SaveOutcome> {
  return post("/api/cell/new", req);
}

/**
 * Removes a cell.
 *
 * @param req Name and base version.
 * @returns The new version and the removed text (for undo), a conflict, or an error.
 */
export function deleteCell(req: DeleteCellRequest): Promise<SaveOutcome<DeletedResponse>> {
  return post("/api/cell/delete", req);
}

/**
 * Puts a removed cell's text back.
 *
 * @param req The text, the cell to insert after (null: first), base version.
 * @returns The new version, a conflict, or an error.
 */
export function restoreCell(req: RestoreCellRequest): Promise<SaveOutcome> {
  return post("/api/cell/restore", req);
}
