/**
 * Prose of the analysis document as Markdown tokens: CommonMark by
 * markdown-it with raw HTML off, plus two inline rules of ours:
 *
 * - math: `$…$` (inline) and `$$…$$` (display). An opening `$` must not be
 *   followed by a space and a closing one not preceded by a space nor
 *   followed by a digit, so "$5 and $6" stays text (common practice, no
 *   source: the rule TeX-in-Markdown tools use). `\$` is a literal dollar.
 * - inline values: `@(cell.field.sub[0], digits)`, the same syntax as
 *   kernel/document/inline_refs.ts (which reports malformed ones with their
 *   position; here a malformed one stays visible text).
 *
 * Tokens, not HTML, leave this module: {@link ./prose.tsx} turns them into
 * Preact nodes so that inline values stay live.
 *
 * Prose is untrusted: markdown-it bounds block nesting (20 levels) but not
 * emphasis, which `*` ×6,000, `x`, `*` ×6,000 nests 3,000 deep, and Preact
 * draws an element tree recursively, so such a tree overflows the page's
 * stack. A block nesting deeper than {@link MAX_NESTING} is refused with a
 * {@link ProseError}; the page then shows its source and the reason.
 *
 * @module
 */
// @ts-types="npm:@types/markdown-it@14.2.0"
import MarkdownIt from "markdown-it";
// @ts-types="npm:@types/markdown-it@14.2.0"
import type { StateInline, Token } from "markdown-it";

export type { Token };

/** An inline value as found in prose. */
export interface ProseRef {
  cell: string;
  path: (string | number)[];
  digits: number | null;
  /** The text as written, e.g. `@(root.r2, 3)`. */
  text: string;
}

const REF =
  /@\([ \t]*([A-Za-z_][A-Za-z0-9_-]*)((?:\.[A-Za-z_][A-Za-z0-9_-]*|\[\d+\])*)[ \t]*(?:,[ \t]*(\d+)[ \t]*)?\)/y;
const STEP = /\.([A-Za-z_][A-Za-z0-9_-]*)|\[(\d+)\]/g;

function refRule(state: StateInline, silent: boolean): boolean {
  if (state.src.charCodeAt(state.pos) !== 0x40 || state.src.charCodeAt(state.pos + 1) !== 0x28) {
    return false;
  }
  REF.lastIndex = state.pos;
  const m = REF.exec(state.src);
  if (m === null) return false;
  if (!silent) {
    const token = state.push("plumb_ref", "", 0);
    const ref: ProseRef = {
      cell: m[1],
      path: [...m[2].matchAll(STEP)].map((s) => s[1] ?? Number(s[2])),
      digits: m[3] === undefined ? null : Number(m[3]),
      text: m[0],
    };
    token.meta = ref;
    token.content = m[0];
  }
  state.pos = REF.lastIndex;
  return true;
}

function isSpace(c: string | undefined): boolean {
  return c === " " || c === "\t" || c === "\n" || c === "\r";
}

/** Index of the next `close` at or after `from` that is not escaped, or -1. */
function findClose(src: string, from: number, close: string): number {
  let i = from;
  while (i < src.length) {
    const j = src.indexOf(close, i);
    if (j < 0) return -1;
    let backslashes = 0;
    for (let k = j - 1; k >= from && src[k] === "\\"; k--) backslashes++;
    if (backslashes % 2 === 0) return j;
    i = j + 1;
  }
  return -1;
}

function mathRule(state: StateInline, silent: boolean): boolean {
  const src = state.src, start = state.pos;
  if (src[start] !== "$") return false;
  const display = src[start + 1] === "$";
  const open = display ? 2 : 1;
  let end: number;
  if (display) {
    end = findClose(src, start + 2, "$$");
    if (end < 0 || end === start + 2) return false;
  } else {
    if (isSpace(src[start + 1]) || src[start + 1] === undefined) return false;
    end = findClose(src, start + 1, "$");
    while (end >= 0 && (isSpace(src[end - 1]) || /\d/.test(src[end + 1] ?? ""))) {
      end = findClose(src, end + 1, "$");
    }
    if (end < 0 || end === start + 1) return false;
  }
  if (!silent) {
    const token = state.push(display ? "math_display" : "math_inline", "", 0);
    token.content = src.slice(start + open, end).trim();
  }
  state.pos = end + open;
  return true;
}

const md = new MarkdownIt("commonmark", { html: false, linkify: false, typographer: false });
md.enable(["table", "strikethrough"]);
md.inline.ruler.after("escape", "plumb_math", mathRule);
md.inline.ruler.after("plumb_math", "plumb_ref", refRule);

/** The deepest nesting of elements a prose block may have (common practice, no source: far above any real prose, far below what overflows a browser's stack). */
export const MAX_NESTING = 100;

/** Why a prose block cannot be drawn; the message is in words for the page. */
export class ProseError extends Error {
  /** @param message What is wrong, e.g. `it nests 3,001 levels deep (at most 100)`. */
  constructor(message: string) {
    super(message);
    this.name = "ProseError";
  }
}

/**
 * The deepest nesting of a token stream, an inline token's children counted
 * below it (a loop with an explicit stack: the tokens may be thousands deep).
 */
function nestingOf(tokens: Token[]): number {
  let deepest = 0;
  const todo: [Token[], number][] = [[tokens, 0]];
  while (todo.length > 0) {
    const [list, base] = todo.pop()!;
    let level = base;
    for (const t of list) {
      level += t.nesting;
      if (level > deepest) deepest = level;
      if (t.children !== null && t.children.length > 0) todo.push([t.children, level]);
    }
  }
  return deepest;
}

function parseChecked(text: string): Token[] | ProseError {
  let tokens: Token[];
  try {
    tokens = md.parse(text, {});
  } catch (e) {
    return new ProseError(
      e instanceof RangeError
        ? "its Markdown nests too deeply to read"
        : "the Markdown reader failed on it",
    );
  }
  const depth = nestingOf(tokens);
  if (depth > MAX_NESTING) {
    return new ProseError(
      `it nests ${depth.toLocaleString("en")} levels deep (at most ${MAX_NESTING})`,
    );
  }
  return tokens;
}

const cache = new Map<string, Token[] | ProseError>();

/**
 * Parses one prose block into markdown-it tokens (cached by text: a
 * document message repeats unchanged prose).
 *
 * @param text The prose block's Markdown.
 * @returns Block tokens; inline tokens carry `children`.
 * @throws {ProseError} When the block nests deeper than {@link MAX_NESTING}
 *   or the reader fails on it.
 * @example
 * ```ts
 * import { parseProse } from "./markdown.ts";
 * const t = parseProse("R² is @(root.r2, 3) and $a^2$.");
 * const kinds = t[1].children!.map((c) => c.type);
 * if (!kinds.includes("plumb_ref") || !kinds.includes("math_inline")) throw new Error(kinds.join());
 * ```
 */
export function parseProse(text: string): Token[] {
  let tokens = cache.get(text);
  if (tokens === undefined) {
    tokens = parseChecked(text);
    if (cache.size > 500) cache.clear();
    cache.set(text, tokens);
  }
  if (tokens instanceof ProseError) throw tokens;
  return tokens;
}

/** A heading of the document, for the outline. */
export interface Heading {
  level: number;
  text: string;
  /** The element id the page gives the heading. */
  id: string;
}

/**
 * The id of a heading, from the document line it starts on (stable while
 * the text above it does not change length in lines).
 *
 * @param line The 1-based document line.
 * @returns The id.
 */
export function headingId(line: number): string {
  return `h-${line}`;
}

/**
 * The headings of one prose block.
 *
 * @param text The prose block's Markdown.
 * @param line The document line of its first line.
 * @returns Headings in order, with plain text (inline markup dropped); none
 *   for a block that cannot be drawn.
 * @example
 * ```ts
 * import { headingsOf } from "./markdown.ts";
 * const h = headingsOf("intro\n\n## Fade *laws*\n", 10);
 * if (h.length !== 1 || h[0].text !== "Fade laws" || h[0].id !== "h-12") throw new Error(JSON.stringify(h));
 * ```
 */
export function headingsOf(text: string, line: number): Heading[] {
  let tokens: Token[];
  try {
    tokens = parseProse(text);
  } catch (e) {
    if (e instanceof ProseError) return [];
    throw e;
  }
  const out: Heading[] = [];
  for (let i = 0; i < tokens.length; i++) {
    const t = tokens[i];
    if (t.type !== "heading_open") continue;
    const inline = tokens[i + 1];
    const plain = (inline.children ?? []).map((c) =>
      c.type === "text" || c.type === "code_inline" || c.type === "plumb_ref" ? c.content : ""
    ).join("");
    out.push({ level: Number(t.tag.slice(1)), text: plain, id: headingId(line + t.map![0]) });
  }
  return out;
}
