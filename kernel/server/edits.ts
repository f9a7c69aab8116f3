/**
 * The browser's edits, applied to a document's text. Pure: text in, text out.
 * The edits go through the document layer's lossless writers, so bytes
 * outside the edited cell stay as they were.
 *
 * ```
 *  save    {name, body}            ─replaceCellBody─▶ that cell's body only
 *  new     {after, kind, name}     ─insertCell──────▶ a cell with the kind's template
 *  delete  {name}                  ─removeCell──────▶ removed text + its offset (for undo)
 *  restore {text, at}              ─splice at offset, or insertCell after a cell
 * ```
 *
 * @module
 */
import {
  type CellBlock,
  insertCell,
  type ParsedDocument,
  parseDocument,
  removeCell,
  replaceCellBody,
} from "../document/mod.ts";
import type { Registry } from "../contract/mod.ts";
import { didYouMean } from "../suggest.ts";
import { templateFor } from "./templates.ts";

/** An edit the server cannot apply: `status` 400 (malformed) or 404 (no such cell). */
export class EditError extends Error {
  override name = "EditError";
  /**
   * @param message What is wrong.
   * @param status The HTTP status to answer with.
   */
  constructor(message: string, readonly status: 400 | 404) {
    super(message);
  }
}

/** The outcome of an edit: the new text, and for a delete what it removed and where. */
export interface Edited {
  source: string;
  removed?: string;
  at?: number;
}

const cellsIn = (doc: ParsedDocument): CellBlock[] =>
  doc.blocks.filter((b): b is CellBlock => b.type === "cell");

/**
 * Names a JSON value's type for a message, never calling its methods (a
 * `toString` sent as data must not run or throw).
 */
const describe = (v: unknown): string =>
  v === undefined
    ? "nothing"
    : v === null
    ? "null"
    : Array.isArray(v)
    ? "a list"
    : typeof v === "object"
    ? "an object"
    : typeof v === "string"
    ? `"${v}"`
    : String(v);

/** The field's value as text, or a 400 naming the field and what came instead. */
function text(field: string, v: unknown): string {
  if (typeof v !== "string") {
    throw new EditError(`"${field}" must be text: got ${describe(v)}`, 400);
  }
  return v;
}

function cellNamed(doc: ParsedDocument, value: unknown, field = "name"): CellBlock {
  const name = text(field, value);
  const all = cellsIn(doc);
  const cell = all.find((c) => c.name === name);
  if (!cell) {
    throw new EditError(`No cell named "${name}"${didYouMean(name, all.map((c) => c.name))}`, 404);
  }
  return cell;
}

/** Runs a document-layer writer, turning its RangeError into a 400. */
function guarded(write: () => string): string {
  try {
    return write();
  } catch (err) {
    if (err instanceof RangeError) throw new EditError(err.message, 400);
    throw err;
  }
}

/**
 * Replaces one cell's body.
 *
 * @param source The document text.
 * @param name The cell's name.
 * @param body The new body.
 * @returns The new text.
 * @throws {EditError} 404 for an unknown cell, 400 for a body that would close the fence.
 * @example
 * ```ts
 * import { saveCell } from "./edits.ts";
 * const out = saveCell("A\n\n~~~fit a\non: t\n~~~\n", "a", "on: u\n");
 * if (out.source !== "A\n\n~~~fit a\non: u\n~~~\n") throw new Error(out.source);
 * ```
 */
export function saveCell(source: string, name: unknown, body: unknown): Edited {
  const doc = parseDocument(source);
  const cell = cellNamed(doc, name);
  const next = text("body", body);
  return { source: guarded(() => replaceCellBody(doc, cell.name, next)) };
}

/**
 * Adds a cell after another (or at the end) with the kind's template body.
 *
 * @param source The document text.
 * @param req `after` (a cell name or null for the end), `kind`, `name`, optional `body`.
 * @param registry The known kinds (for the check and the template).
 * @param resultOf The last result of a cell by name (what templates read), or null.
 * @returns The new text.
 * @throws {EditError} 404 for an unknown `after`, 400 for an unknown kind or a bad or taken name.
 * @example
 * ```ts
 * import { newCell } from "./edits.ts";
 * const out = newCell("# A\n", { after: null, kind: "note", name: "n", body: "x: 1" }, new Map());
 * const F = "`".repeat(3);
 * if (!out.source.endsWith(`${F}note n\nx: 1\n${F}\n`)) throw new Error(out.source);
 * ```
 */
export function newCell(
  source: string,
  req: { after?: unknown; kind?: unknown; name?: unknown; body?: unknown },
  registry: Registry,
  resultOf: (name: string) => unknown = () => null,
): Edited {
  const doc = parseDocument(source);
  const all = cellsIn(doc);
  const kind = text("kind", req.kind);
  const name = text("name", req.name);
  if (registry.size > 0 && !registry.has(kind)) {
    throw new EditError(`Unknown cell kind "${kind}"${didYouMean(kind, registry.keys())}`, 400);
  }
  if (req.body !== undefined) text("body", req.body);
  const index = req.after === null || req.after === undefined
    ? all.length - 1
    : all.indexOf(cellNamed(doc, req.after, "after"));
  const at = index === -1 && all.length === 0 ? { offset: source.length } : index;
  const body = (req.body as string | undefined) ?? templateFor(kind, registry, doc, resultOf);
  return { source: guarded(() => insertCell(doc, at, kind, name, body)) };
}

/**
 * Removes a cell, returning its exact text and offset so {@link restoreCell} can put it back.
 *
 * @param source The document text.
 * @param name The cell's name.
 * @returns The new text, `removed` (the bytes taken out) and `at` (their offset).
 * @throws {EditError} 404 for an unknown cell.
 * @example
 * ```ts
 * import { deleteCell, restoreCell } from "./edits.ts";
 * const src = "Intro\n\n~~~fit a\non: t\n~~~\n\nEnd\n";
 * const d = deleteCell(src, "a");
 * if (restoreCell(d.source, d.removed!, d.at!).source !== src) throw new Error("not undone");
 * ```
 */
export function deleteCell(source: string, name: unknown): Edited {
  const doc = parseDocument(source);
  const cell = cellNamed(doc, name);
  const out = removeCell(doc, cell.name);
  const removed = source.slice(cell.start, cell.start + source.length - out.length);
  return { source: out, removed, at: cell.start };
}

/**
 * Puts a removed cell back: at an offset (exact undo, when nothing changed
 * since the delete), after a named cell, or at the end (null).
 *
 * @param source The document text.
 * @param removed The removed text (one cell, as returned by {@link deleteCell}).
 * @param at An offset, a cell name, or null.
 * @returns The new text.
 * @throws {EditError} 400 when `text` is not one cell or the offset is not a line start between blocks.
 * @example
 * ```ts
 * import { restoreCell } from "./edits.ts";
 * const out = restoreCell("# A\n", "~~~fit a\non: t\n~~~\n", null);
 * if (!out.source.startsWith("# A\n\n") || !out.source.includes("fit a\non: t\n")) {
 *   throw new Error(out.source);
 * }
 * ```
 */
export function restoreCell(source: string, removed: unknown, at: unknown): Edited {
  const cell = text("text", removed);
  const parsed = cellsIn(parseDocument(cell.trim() + "\n"));
  if (parsed.length !== 1 || parsed[0].error) {
    throw new EditError(`Cannot restore: "text" must hold exactly one closed cell`, 400);
  }
  const doc = parseDocument(source);
  if (typeof at === "number") {
    const between = doc.blocks.some((b) => b.start === at) || at === source.length;
    const inside = doc.blocks.some((b) => b.type === "cell" && b.start < at && at < b.end);
    if (!Number.isInteger(at) || !between && !lineStartInProse(doc, at) || inside) {
      throw new EditError(`Cannot restore at offset ${at}: not a line start between blocks`, 400);
    }
    return { source: source.slice(0, at) + cell + source.slice(at) };
  }
  if (at !== null && at !== undefined && typeof at !== "string") {
    throw new EditError(`"at" must be an offset, a cell name or null: got ${describe(at)}`, 400);
  }
  const { kind, name, body } = parsed[0];
  return newCell(source, { after: at, kind, name, body }, new Map());
}

function lineStartInProse(doc: ParsedDocument, at: number): boolean {
  const { source } = doc;
  if (at <= 0 || at > source.length || source[at - 1] !== "\n") return false;
  return doc.blocks.some((b) =>
    b.type === "prose" && b.start <= at && at < b.end &&
    !b.fences.some((f) => f.start < at && at < f.end)
  );
}
