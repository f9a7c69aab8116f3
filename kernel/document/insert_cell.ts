/**
 * Inserting a new cell with the fewest byte changes.
 *
 * @module
 */
import type { ParsedDocument } from "./types.ts";
import { KIND_RE, NAME_RE } from "./_fence.ts";
import {
  blankBefore,
  blankLineAt,
  cells,
  contentStart,
  endingBefore,
  endsLine,
  fenceFor,
  withEnding,
} from "./_edit.ts";

/** Where to insert: after the cell with this index (`-1`: before everything), or at an offset. */
export type InsertAt = number | { offset: number };

function insertionPoint(doc: ParsedDocument, at: InsertAt): number {
  const all = cells(doc);
  const from = contentStart(doc);
  if (typeof at === "number") {
    if (at === -1) return from;
    if (!Number.isInteger(at) || at < -1 || at >= all.length) {
      throw new RangeError(
        `Cannot insert a cell after cell index ${at}: the document has ${all.length} cells`,
      );
    }
    return all[at].end;
  }
  const p = at.offset;
  const { source } = doc;
  const inside = doc.blocks.some((b) =>
    b.type === "cell" ? b.start < p && p < b.end : b.fences.some((f) => f.start < p && p < f.end)
  );
  const lineStart = p === source.length || p === from || endsLine(source, p) &&
      !(source[p - 1] === "\r" && source[p] === "\n");
  if (!Number.isInteger(p) || p < from || p > source.length || inside || !lineStart) {
    throw new RangeError(
      `Cannot insert a cell at offset ${p}: it must be a line start outside front matter and fences`,
    );
  }
  return p;
}

/**
 * The document's new source with a cell added. The cell is written as a
 * backtick fence long enough that no body line closes it, with the line
 * ending found at the insertion point; blank lines are added around it only
 * where the neighbouring line is not already blank.
 *
 * @param doc A parsed document.
 * @param at After which cell (index into the document's cells, `-1` for the
 *   start of the content after any front matter), or `{ offset }`: a line
 *   start outside front matter and fenced blocks.
 * @param kind The kind word, e.g. `fit`.
 * @param name The new cell's name; must not be taken.
 * @param body The body text, any line endings.
 * @returns The new document source.
 * @throws {RangeError} For a malformed kind or name, a taken name or a bad position.
 * @example
 * ```ts
 * import { insertCell, parseDocument } from "./mod.ts";
 * const F = "`".repeat(3);
 * const doc = parseDocument(`${F}table t\nfrom: a.csv\n${F}\n`);
 * const out = insertCell(doc, 0, "fit", "line", "on: t");
 * if (out !== `${F}table t\nfrom: a.csv\n${F}\n\n${F}fit line\non: t\n${F}\n`) throw new Error(out);
 * ```
 */
export function insertCell(
  doc: ParsedDocument,
  at: InsertAt,
  kind: string,
  name: string,
  body: string,
): string {
  if (!KIND_RE.test(kind)) {
    throw new RangeError(
      `Cannot insert a cell of kind "${kind}": a kind is lower case letters, digits, _ or -`,
    );
  }
  if (!NAME_RE.test(name)) {
    throw new RangeError(
      `Cannot insert a cell named "${name}": a name is letters, digits, _ or - and starts with a letter or _`,
    );
  }
  const taken = cells(doc).find((c) => c.name === name);
  if (taken !== undefined) {
    throw new RangeError(
      `Cannot insert a cell named "${name}": the cell at line ${taken.line} has that name`,
    );
  }
  const { source } = doc;
  const p = insertionPoint(doc, at);
  const eol = endingBefore(source, p);
  const text = withEnding(body, eol);
  const f = fenceFor(text);
  const fence = f.char.repeat(f.length);
  const from = contentStart(doc);
  const lead = (p > from && !endsLine(source, p) ? eol : "") +
    (blankBefore(source, p, from) ? "" : eol);
  const trail = p < source.length && blankLineAt(source, p) === p ? eol : "";
  const cell = `${fence}${kind} ${name}${eol}${text}${fence}${eol}`;
  return source.slice(0, p) + lead + cell + trail + source.slice(p);
}
