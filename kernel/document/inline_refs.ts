/**
 * Inline references: prose that shows a cell's value.
 *
 * Syntax (inside prose, outside code spans and fenced blocks):
 *
 * ```text
 * @(cell)                    the cell's value (for cells that give one value)
 * @(cell.field)              a field of the cell's result
 * @(cell.field, 3)           … shown with 3 digits (the kernel decides how digits apply)
 * @(cell.field.sub[0], 3)    deeper fields by `.name`, list items by `[index]`
 * ```
 *
 * `cell` is a cell name (`/^[A-Za-z_][A-Za-z0-9_-]*$/`), each field a name of
 * the same shape, each index a non-negative whole number; spaces and tabs are
 * allowed inside the parentheses around the parts. `\@(` is a literal `@(`.
 * Any other `@(` that does not complete this syntax is an error at its `@`.
 *
 * Code spans follow CommonMark §6.1 (a run of n backticks up to the next run
 * of exactly n, within a paragraph). Deviation: indented code blocks, HTML
 * blocks and HTML comments are not skipped.
 *
 * @module
 */
import { LocatedError, type SourcePos } from "../errors.ts";
import type { ProseBlock } from "./types.ts";
import { floorIndex, lineStarts } from "./_lines.ts";

/** One inline reference found in prose. */
export interface InlineRef {
  /** The referenced cell's name. */
  cell: string;
  /** Fields and list indexes after the name, e.g. `["coef", "a"]` or `["rows", 0]`. */
  path: (string | number)[];
  /** Digits asked for, when given. */
  digits?: number;
  /** Document offset of the `@`. */
  start: number;
  /** Document offset just past the `)`. */
  end: number;
  line: number;
  column: number;
}

const REF =
  /[ \t]*([A-Za-z_][A-Za-z0-9_-]*)((?:\.[A-Za-z_][A-Za-z0-9_-]*|\[\d+\])*)[ \t]*(?:,[ \t]*(\d+)[ \t]*)?\)/y;
const STEP = /\.([A-Za-z_][A-Za-z0-9_-]*)|\[(\d+)\]/g;
const BLANK_LINE = /(?:\r\n|\r|\n)[ \t]*(?:\r\n|\r|\n)/g;
const PUNCT = /[!-/:-@[-`{-~]/;

/**
 * What one block's scan has learnt, so that its cost stays linear: the next
 * paragraph break found, and for each run length the end up to which no
 * closing run exists. Without it, every run that never closes scanned to the
 * paragraph's end: one line of "`a``" 40,000 times took 1.5-3 s.
 */
interface SpanScan {
  breakFrom: number;
  breakAt: number;
  misses: Map<number, number>;
}

/** The offset of the first paragraph break at or after `j` (the text's length when none). */
function paragraphBreak(text: string, j: number, scan: SpanScan): number {
  if (j >= scan.breakFrom && j <= scan.breakAt) return scan.breakAt;
  BLANK_LINE.lastIndex = j;
  const para = BLANK_LINE.exec(text);
  scan.breakFrom = j;
  scan.breakAt = para === null ? text.length : para.index;
  return scan.breakAt;
}

/** Offset just past the code span opening at `i`, or past its backticks when it never closes. */
function skipCodeSpan(text: string, i: number, limit: number, scan: SpanScan): number {
  let j = i;
  while (text[j] === "`") j++;
  const n = j - i;
  const stop = Math.min(limit, paragraphBreak(text, j, scan));
  if (scan.misses.get(n) === stop) return i + n; // no run of n closes before `stop`
  while (j < stop) {
    if (text[j] !== "`") {
      j++;
      continue;
    }
    let k = j;
    while (text[k] === "`") k++;
    if (k - j === n && k <= stop) return k;
    j = k;
  }
  scan.misses.set(n, stop);
  return i + n;
}

function readRef(text: string, i: number): Omit<InlineRef, "line" | "column"> | null {
  REF.lastIndex = i + 2;
  const m = REF.exec(text);
  if (m === null) return null;
  const path = [...m[2].matchAll(STEP)].map((s) => s[1] ?? Number(s[2]));
  const ref = { cell: m[1], path, start: i, end: REF.lastIndex };
  return m[3] === undefined ? ref : { ...ref, digits: Number(m[3]) };
}

/**
 * Finds the inline references in a prose block.
 *
 * @param block A prose block of a parsed document.
 * @returns References in order, with document offsets and positions, and an
 *   error for each malformed `@(`.
 * @example
 * ```ts
 * import { findInlineRefs, parseDocument } from "./mod.ts";
 * const doc = parseDocument("R² is @(root.r2, 3), not `@(x.y)`.\n");
 * const prose = doc.blocks[0];
 * if (prose.type !== "prose") throw new Error("expected prose");
 * const { refs } = findInlineRefs(prose);
 * if (refs.length !== 1 || refs[0].cell !== "root" || refs[0].digits !== 3) {
 *   throw new Error(JSON.stringify(refs));
 * }
 * ```
 */
export function findInlineRefs(block: ProseBlock): { refs: InlineRef[]; errors: LocatedError[] } {
  const { text } = block;
  const starts = lineStarts(text);
  const posOf = (local: number): SourcePos => {
    const k = floorIndex(starts, local);
    return { line: block.line + k, column: local - starts[k] + 1 };
  };
  const fences = block.fences.map((f) => [f.start - block.start, f.end - block.start]);
  const refs: InlineRef[] = [];
  const errors: LocatedError[] = [];
  const scan: SpanScan = { breakFrom: 0, breakAt: -1, misses: new Map() };
  let f = 0;
  let i = 0;
  while (i < text.length) {
    if (f < fences.length && i >= fences[f][0]) {
      i = Math.max(i, fences[f++][1]);
      continue;
    }
    const c = text[i];
    const limit = f < fences.length ? fences[f][0] : text.length;
    if (c === "\\") i += PUNCT.test(text[i + 1] ?? "") ? 2 : 1;
    else if (c === "`") i = skipCodeSpan(text, i, limit, scan);
    else if (c === "@" && text[i + 1] === "(") {
      const ref = readRef(text, i);
      if (ref === null) {
        const snippet = /^@\([^)\r\n]{0,40}\)?/.exec(text.slice(i))![0];
        const msg =
          `Malformed inline reference "${snippet}": write @(cell.field) or @(cell.field, digits)`;
        errors.push(new LocatedError(msg, posOf(i)));
        i += 2;
      } else {
        refs.push({ ...ref, start: block.start + i, end: block.start + ref.end, ...posOf(i) });
        i = ref.end;
      }
    } else i++;
  }
  return { refs, errors };
}
