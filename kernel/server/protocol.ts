/**
 * The live protocol between `plumb serve` and the browser.
 *
 * ```
 *  browser                                         server (127.0.0.1)
 *   │ GET /enter/T ──▶ 303 to /, Set-Cookie plumb_token=T (HttpOnly, SameSite=Strict)
 *   │ GET /  ──▶ HTML shell loading /app.<hash>.js (and CSS)
 *   │ GET /live (WebSocket, same Origin, cookie)
 *   │   ◀── document {version, path, title, source, blocks, data}   on connect and on change
 *   │   ◀── cell {version, name, kind, state, ms?, result?, …}      per cell as a run goes
 *   │   ◀── run {version, run, ran, ms, errors}                     a run finished
 *   │   ◀── changes {report, notes}                                 what changed since the last data
 *   │ POST /api/cell         {name, body, base}           ──▶ 200 {version} | 409 conflict
 *   │ POST /api/cell/new     {after, kind, name, base}    ──▶ 200 {version}
 *   │ POST /api/cell/delete  {name, base}                 ──▶ 200 {version, removed}
 *   │ POST /api/cell/restore {text, at, base}             ──▶ 200 {version}
 *   │ any POST: 400 malformed, 404 no such cell or document gone, 413 body over
 *   │   16 MiB, 422 document not UTF-8, 403/507/500 the write failed (file intact);
 *   │   every refusal is {error: "<plain sentence>"}
 * ```
 *
 * Every request after the token exchange needs the cookie (401 without it);
 * a Host other than `127.0.0.1:PORT` or `localhost:PORT` gets 421; a
 * WebSocket upgrade from another Origin gets 403; a POST needs the header
 * `X-Plumb-Token` equal to the token or an Origin equal to the page's own
 * (403 otherwise). The page finds the token for the header in
 * `<meta name="plumb-token">` of the shell.
 *
 * A WebSocket frame carries one message, or several as a JSON array in
 * order (the messages of a short run, sent together when it ends). A run's
 * messages are held for its first 200 ms (kernel/server/live_workspace.ts),
 * a cell's later message replacing its earlier one: a cell that settles in
 * that time is never seen queued or computing.
 *
 * A `version` is the lower-case hex SHA-256 of the document text on disk.
 * Messages arrive in order; a browser applies a `cell` message only when its
 * `version` equals that of the last `document` message, and a higher `run`
 * number supersedes a lower one.
 *
 * Changes to this file are made by agreement between the server and the front
 * end, and noted here. Changes: restore's `at` also takes the offset that
 * delete now returns (`DeletedResponse.at`), for an exact undo. A current
 * `cell` message leaves out `result` when this connection was already sent
 * that same result (reused from the cache): the page keeps the one it has.
 * Results leave out the per-row fields no view reads (ui/page_fields.ts),
 * named in `omitted`, unless an inline value of the document names them; a
 * large check's result carries its residual charts counted (`density`)
 * instead of the five per-row arrays they read.
 * A 409 no longer echoes the request's body (`yours` removed: the page shows
 * its own text) and may carry a `note`.
 * Added: the `changes` message (the run history's change report).
 *
 * @module
 */

import type { ChangeReport } from "../history/types.ts";

/** The states of a cell, in our own words. */
export type LiveCellState = "current" | "queued" | "computing" | "failed" | "held";

/** A position in the document (1-based). */
export interface LivePosition {
  message: string;
  line: number;
  column: number;
}

/** A block of the document as the page shows it. */
export type LiveBlock =
  | { type: "prose"; line: number; text: string }
  | { type: "cell"; name: string; kind: string; line: number; body: string };

/** One data file the document reads. */
export interface LiveDataFile {
  /** The path as written in the cell. */
  path: string;
  /** Data rows (lines after the header), or null when not a delimited table. */
  rows: number | null;
  bytes: number;
  /** Last modification, ISO 8601. */
  changed: string;
}

/** The document as on disk: sent on connect and whenever its text changes. */
export interface DocumentMessage {
  type: "document";
  version: string;
  /** The document's path as given to `plumb serve`. */
  path: string;
  /** The front matter title, or the file name when there is none. */
  title: string;
  source: string;
  blocks: LiveBlock[];
  data: LiveDataFile[];
}

/** A cell's state changed during a run. `result` only with state current. */
export interface CellMessage {
  type: "cell";
  version: string;
  name: string;
  kind: string;
  state: LiveCellState;
  /** Time the computation took (settled cells), or elapsed so far (computing). */
  ms?: number;
  /** Progress from 0 to 1 of long work. */
  fraction?: number;
  note?: string;
  /**
   * The kind's summary (RUN-JSON `result`) less the fields in `omitted`;
   * absent on a current message when this connection already has it (the
   * same cache key: kernel/server/live_channel.ts).
   */
  result?: unknown;
  /** Fields of the complete result left out of `result` (per-row arrays no view reads). */
  omitted?: string[];
  summaryLine?: string;
  error?: LivePosition;
  warnings?: string[];
  /** The run this update belongs to. */
  run?: number;
  /** True when the result was reused from the cache (not recomputed). */
  cached?: boolean;
}

/** A run finished. `ran` names the cells actually recomputed. */
export interface RunMessage {
  type: "run";
  version: string;
  run: number;
  ran: string[];
  ms: number;
  /** Errors outside cells: front matter, inline references in prose. */
  errors: LivePosition[];
}

/**
 * What changed since the previous data revision (kernel/history): sent after a
 * run that appended a history record, and on connect when there is a report.
 * `report` is null when the history holds fewer than two records; `notes` say
 * what the history could not do (not writable, a torn last record skipped).
 */
export interface ChangesMessage {
  type: "changes";
  report: ChangeReport | null;
  notes: string[];
}

/** A server → browser message. */
export type ServerMessage = DocumentMessage | CellMessage | RunMessage | ChangesMessage;

/** `POST /api/cell`: replace one cell's body. */
export interface SaveCellRequest {
  name: string;
  body: string;
  /** The document version the edit was based on. */
  base: string;
}

/** `POST /api/cell/new`: add a cell with its kind's template body. */
export interface NewCellRequest {
  /** The cell to insert after, or null for the end of the document. */
  after: string | null;
  kind: string;
  name: string;
  base: string;
  /** A body to use instead of the kind's template (optional). */
  body?: string;
}

/** `POST /api/cell/delete`: remove one cell. */
export interface DeleteCellRequest {
  name: string;
  base: string;
}

/** `POST /api/cell/restore`: put back a removed cell's text. */
export interface RestoreCellRequest {
  /** The removed cell's text, as returned by delete. */
  text: string;
  /**
   * Where: the offset returned by delete (exact undo; valid while `base` is
   * the version delete returned), a cell name to insert after, or null for
   * the end of the document.
   */
  at: number | string | null;
  base: string;
}

/** 200 answer of every save request. */
export interface SavedResponse {
  version: string;
}

/** 200 answer of delete: the removed text and its offset, for undo. */
export interface DeletedResponse extends SavedResponse {
  removed: string;
  /** Offset in the new text where `removed` was taken out. */
  at: number;
}

/**
 * 409 answer: the disk moved on since `base`, or an editor wrote during the
 * save; nothing of the request stays written. The request's own body is not
 * sent back (the page has it).
 */
export interface ConflictResponse {
  conflict: true;
  /** The document source now on disk. */
  disk: string;
  diskVersion: string;
  /** What else happened, when the disk changed twice during the save. */
  note?: string;
}

/** 4xx answer other than a conflict. */
export interface ErrorResponse {
  error: string;
}

/** Name of the cookie holding the token. */
export const TOKEN_COOKIE = "plumb_token";
/** Header a POST carries with the token (CSRF defence). */
export const TOKEN_HEADER = "X-Plumb-Token";
