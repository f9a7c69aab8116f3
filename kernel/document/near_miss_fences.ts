/**
 * Code blocks that were almost cells. A fence whose info string is not
 * exactly `<kind> <name>` is prose (a code sample), so a slip such as
 * `Fit power` (letter case), `fit` (no name) or `fit power law` (a name of
 * two words) would silently leave the cell out. These are found here and
 * reported as warnings, each at the info string with the nearest reading:
 *
 * ```
 * line 14:4  Code block "Fit power" is prose, not a cell: did you mean "fit power"?
 * line 19:4  Code block "fit" is prose, not a cell: a fit cell needs a name, as in "fit name"
 * ```
 *
 * A lone word that is not a kind (`python`, `text`) is an ordinary code
 * sample and is left alone; so is any info string whose first word is not
 * within an edit or two of a kind. Front matter that starts below line 1
 * (after blank lines) is prose too and is reported the same way.
 *
 * @module
 */
import { LocatedError } from "../errors.ts";
import { nearest } from "../suggest.ts";
import { KIND_RE, NAME_RE } from "./_fence.ts";
import { lineColumnAt } from "./line_column.ts";
import type { ParsedDocument, ProseFence } from "./types.ts";

/** The kind a word was meant to be: itself in any letter case, or a near miss. */
function meantKind(word: string, kinds: readonly string[]): string | undefined {
  const lower = word.toLowerCase();
  if (kinds.includes(lower)) return lower;
  return nearest(lower, kinds);
}

/** A name made well formed: words joined by "-", other characters dropped. */
function meantName(words: readonly string[]): string | null {
  const joined = words.join("-").replace(/[^A-Za-z0-9_-]/g, "");
  return NAME_RE.test(joined) ? joined : null;
}

/** What is wrong with one fence's info string, or null when it is a plain code sample. */
function nearMiss(info: string, kinds: readonly string[]): string | null {
  const words = info.trim().split(/[ \t]+/).filter((w) => w !== "");
  if (words.length === 0) return null;
  const kind = meantKind(words[0], kinds);
  if (kind === undefined) return null;
  const head = `Code block "${info.trim()}" is prose, not a cell`;
  if (words.length === 1) {
    // A lone near miss (`fitt`) may be a language tag; only a kind itself is a slip.
    if (kind !== words[0].toLowerCase()) return null;
    return `${head}: a ${kind} cell needs a name, as in "${kind} name"`;
  }
  const name = meantName(words.slice(1));
  if (name === null) {
    return `${head}: a cell name is one word of letters, digits, "_" and "-"`;
  }
  if (!KIND_RE.test(words[0]) || words.length > 2 || name !== words[1]) {
    return `${head}: did you mean "${kind} ${name}"?`;
  }
  return null;
}

/**
 * Warnings for code blocks whose info string is almost `<kind> <name>`.
 *
 * @param doc The parsed document.
 * @param kinds The kinds the registry knows.
 * @returns One warning a near miss, at its info string, in document order.
 * @example
 * ```ts
 * import { nearMissFences, parseDocument } from "./mod.ts";
 * const doc = parseDocument("~~~Fit power\non: t\n~~~\n\n~~~python\nx = 1\n~~~\n");
 * const [w, ...rest] = nearMissFences(doc, ["table", "fit"]);
 * if (rest.length !== 0 || !w.message.endsWith('did you mean "fit power"?')) throw new Error();
 * if (w.pos.line !== 1 || w.pos.column !== 4) throw new Error(JSON.stringify(w.pos));
 * ```
 */
export function nearMissFences(doc: ParsedDocument, kinds: readonly string[]): LocatedError[] {
  const out: LocatedError[] = [];
  const late = lateFrontMatter(doc);
  if (late !== null) out.push(late);
  for (const block of doc.blocks) {
    if (block.type !== "prose") continue;
    for (const f of block.fences) {
      const message = nearMiss(f.info, kinds);
      if (message !== null) out.push(new LocatedError(message, infoPos(doc, f)));
    }
  }
  return out;
}

/** Blank lines, then a `---` line, key lines and a closing `---`: front matter that is not on line 1. */
const LATE_FRONT_MATTER =
  /^((?:[ \t]*\r?\n)+)---[ \t]*\r?\n(?:[^\r\n]*\r?\n)*?---[ \t]*(?:\r?\n|$)/;

function lateFrontMatter(doc: ParsedDocument): LocatedError | null {
  if (doc.frontMatter !== null) return null;
  const from = doc.bom ? 1 : 0;
  const m = LATE_FRONT_MATTER.exec(doc.source.slice(from, from + 65_536));
  if (m === null) return null;
  const pos = lineColumnAt(doc, from + m[1].length);
  return new LocatedError(
    `Front matter must start on line 1: the "---" on line ${pos.line} follows blank lines, so it is read as prose`,
    pos,
  );
}

/** The position of a fence's info string (after the indent and the fence characters). */
function infoPos(doc: ParsedDocument, f: ProseFence) {
  const line = doc.source.slice(f.start, f.end);
  const lead = f.fence.indent + f.fence.length;
  const spaces = /^[ \t]*/.exec(line.slice(lead))![0].length;
  return lineColumnAt(doc, f.start + lead + spaces);
}
