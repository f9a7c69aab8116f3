/**
 * Helpers shared by the editing functions: finding a cell, line endings,
 * and fences that a body cannot close.
 *
 * @module
 */
import { didYouMean } from "../suggest.ts";
import type { CellBlock, Fence, ParsedDocument } from "./types.ts";
import { dominantEnding, scanLines } from "./_lines.ts";
import { isClosing } from "./_fence.ts";

/** The cells of a document in order. */
export function cells(doc: ParsedDocument): CellBlock[] {
  return doc.blocks.filter((b): b is CellBlock => b.type === "cell");
}

/** The first cell named `name`, or a `ReferenceError` naming the near miss. */
export function findCell(doc: ParsedDocument, name: string, verb: string): CellBlock {
  const all = cells(doc);
  const cell = all.find((c) => c.name === name);
  if (cell === undefined) {
    const hint = didYouMean(name, all.map((c) => c.name));
    throw new ReferenceError(`Cannot ${verb} "${name}": no cell has that name${hint}`);
  }
  return cell;
}

/** Whether `source` has a line ending just before `at`. */
export function endsLine(source: string, at: number): boolean {
  const c = source.charCodeAt(at - 1);
  return c === 10 || c === 13;
}

/** The line ending of the line that ends just before `at`, else the document's usual one. */
export function endingBefore(source: string, at: number): string {
  if (source[at - 1] === "\n") return source[at - 2] === "\r" ? "\r\n" : "\n";
  if (source[at - 1] === "\r") return "\r";
  return dominantEnding(source);
}

/** `body` with every line ending turned into `eol`, ending with `eol` unless empty. */
export function withEnding(body: string, eol: string): string {
  const lf = body.replace(/\r\n?/g, "\n");
  const out = lf.length === 0 || lf.endsWith("\n") ? lf : lf + "\n";
  return eol === "\n" ? out : out.replaceAll("\n", eol);
}

/** The 1-based number of the first line of `body` that would close `fence`, or 0. */
export function closingLineIn(body: string, fence: Fence): number {
  const lines = scanLines(body);
  const k = lines.findIndex((l) => isClosing(body, l, fence));
  return k + 1;
}

/** A backtick fence that no line of `body` can close. */
export function fenceFor(body: string): Fence {
  let longest = 0;
  for (const m of body.matchAll(/^ {0,3}(`+)/gm)) longest = Math.max(longest, m[1].length);
  return { char: "`", length: Math.max(3, longest + 1), indent: 0 };
}

/** Whether the line that ends just before `at` is blank (true at the start of the text). */
export function blankBefore(source: string, at: number, from: number): boolean {
  if (at <= from) return true;
  let end = at;
  if (source[end - 1] === "\n") end--;
  if (source[end - 1] === "\r") end--;
  let s = end;
  while (s > from && source[s - 1] !== "\n" && source[s - 1] !== "\r") s--;
  return /^[ \t]*$/.test(source.slice(s, end));
}

/** Offset just past the line starting at `at` when that line is blank, else `at`. */
export function blankLineAt(source: string, at: number): number {
  let i = at;
  while (source[i] === " " || source[i] === "\t") i++;
  if (i === source.length && i > at) return i;
  if (source[i] === "\r") return source[i + 1] === "\n" ? i + 2 : i + 1;
  if (source[i] === "\n") return i + 1;
  return at;
}

/** Where the document's blocks start (after the BOM and front matter). */
export function contentStart(doc: ParsedDocument): number {
  return doc.frontMatter?.end ?? (doc.bom ? 1 : 0);
}
