/**
 * Fence lines by CommonMark 0.31 §4.5 (fenced code blocks), top level only:
 * an opening fence is up to 3 spaces, then 3 or more backticks or tildes,
 * then an info string; a backtick fence's info string may not contain a
 * backtick. A closing fence is up to 3 spaces, then at least as many of the
 * same character, then only spaces or tabs.
 *
 * Deviation: container blocks (block quotes, list items) and HTML blocks are
 * not tracked, so fences inside them are not seen; cells live at top level.
 *
 * @module
 */
import type { Fence } from "./types.ts";
import type { Line } from "./_lines.ts";

/** An opening fence line. */
export interface Opening extends Fence {
  /** The info string, trimmed of spaces and tabs. */
  info: string;
  /** Offset of the trimmed info string's first character. */
  infoStart: number;
}

/** The two words of a cell's info string with their offsets. */
export interface CellWords {
  kind: string;
  name: string;
  kindStart: number;
  nameStart: number;
}

/** A kind word: lower case letter, then lower case letters, digits, `_` or `-`. */
export const KIND_RE = /^[a-z][a-z0-9_-]*$/;
/** A cell name: a letter or `_`, then letters, digits, `_` or `-`. */
export const NAME_RE = /^[A-Za-z_][A-Za-z0-9_-]*$/;

function indentOf(source: string, line: Line): number {
  let i = line.start;
  while (i < line.contentEnd && source.charCodeAt(i) === 32 && i - line.start < 4) i++;
  return i - line.start;
}

/**
 * Reads an opening fence.
 *
 * @param source The document.
 * @param line The line to test.
 * @returns The fence and info string, or `null` when the line opens no fence.
 */
export function matchOpening(source: string, line: Line): Opening | null {
  const indent = indentOf(source, line);
  if (indent > 3) return null;
  const at = line.start + indent;
  const ch = source[at];
  if (ch !== "`" && ch !== "~") return null;
  let i = at;
  while (i < line.contentEnd && source[i] === ch) i++;
  const length = i - at;
  if (length < 3) return null;
  const rest = source.slice(i, line.contentEnd);
  if (ch === "`" && rest.includes("`")) return null;
  const lead = rest.length - rest.replace(/^[ \t]+/, "").length;
  const info = rest.replace(/^[ \t]+|[ \t]+$/g, "");
  return { char: ch, length, indent, info, infoStart: i + lead };
}

/**
 * Tests whether a line closes a fence.
 *
 * @param source The document.
 * @param line The line to test.
 * @param fence The open fence.
 * @returns `true` when the line is a closing fence for `fence`.
 */
export function isClosing(source: string, line: Line, fence: Fence): boolean {
  const indent = indentOf(source, line);
  if (indent > 3) return false;
  let i = line.start + indent;
  const at = i;
  while (i < line.contentEnd && source[i] === fence.char) i++;
  if (i - at < fence.length) return false;
  for (; i < line.contentEnd; i++) {
    const c = source[i];
    if (c !== " " && c !== "\t") return false;
  }
  return true;
}

/**
 * Splits a cell's info string into its kind and name words.
 *
 * @param open An opening fence.
 * @returns The words and their offsets, or `null` unless the info string is
 *   exactly `<kind> <name>` with both words well formed.
 */
export function cellWords(open: Opening): CellWords | null {
  const m = /^(\S+)[ \t]+(\S+)$/.exec(open.info);
  if (m === null || !KIND_RE.test(m[1]) || !NAME_RE.test(m[2])) return null;
  return {
    kind: m[1],
    name: m[2],
    kindStart: open.infoStart,
    nameStart: open.infoStart + open.info.length - m[2].length,
  };
}
