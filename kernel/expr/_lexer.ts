/**
 * Splits expression text into tokens, each with its 0-based offset.
 *
 * Numbers are decimal with an optional fraction and exponent (`12`, `1.5`,
 * `.5`, `1.5e-3`); identifiers are `[A-Za-z_][A-Za-z0-9_]*`; the symbols are
 * `+ - * / ^ ( ) , =`. White space separates tokens and is otherwise ignored.
 *
 * @module
 */
import { ExprError } from "./expr_error.ts";

/** Kinds of token. */
export type TokenKind = "num" | "id" | "sym" | "end";

/** One token. */
export interface Token {
  kind: TokenKind;
  /** The characters as written (empty for `end`). */
  text: string;
  /** 0-based offset of the first character. */
  start: number;
  /** Offset just past the last character. */
  end: number;
}

const NUMBER = /(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?/y;
const IDENT = /[A-Za-z_][A-Za-z0-9_]*/y;
const SPACE = /\s+/y;
const SYMBOLS = "+-*/^(),=";

/** `column N` for a 0-based offset, as messages say it (1-based). */
export function at(offset: number): string {
  return `column ${offset + 1}`;
}

/**
 * Tokenises `text`, ending with one `end` token at `text.length`.
 *
 * @param text The expression text.
 * @returns The tokens in order.
 * @throws {ExprError} On a character that starts no token or a malformed number.
 */
export function tokenize(text: string): Token[] {
  const tokens: Token[] = [];
  let i = 0;
  while (i < text.length) {
    SPACE.lastIndex = i;
    if (SPACE.test(text)) {
      i = SPACE.lastIndex;
      continue;
    }
    const c = text[i];
    if (SYMBOLS.includes(c)) {
      tokens.push({ kind: "sym", text: c, start: i, end: i + 1 });
      i++;
      continue;
    }
    const num = match(NUMBER, text, i);
    if (num !== undefined) {
      checkNumberEnd(text, i, i + num.length);
      tokens.push({ kind: "num", text: num, start: i, end: i + num.length });
      i += num.length;
      continue;
    }
    const id = match(IDENT, text, i);
    if (id !== undefined) {
      tokens.push({ kind: "id", text: id, start: i, end: i + id.length });
      i += id.length;
      continue;
    }
    const ch = String.fromCodePoint(text.codePointAt(i)!);
    throw new ExprError(`Unexpected character "${ch}" at ${at(i)}`, i, ch.length);
  }
  tokens.push({ kind: "end", text: "", start: text.length, end: text.length });
  return tokens;
}

function match(re: RegExp, text: string, i: number): string | undefined {
  re.lastIndex = i;
  const m = re.exec(text);
  return m === null ? undefined : m[0];
}

/** A number running straight into `.` or into an exponent without digits is malformed. */
function checkNumberEnd(text: string, start: number, end: number): void {
  const next = text[end] ?? "";
  const after = text[end + 1] ?? "";
  let stop = end;
  let detail = "";
  if (next === ".") {
    while (stop < text.length && /[0-9.]/.test(text[stop])) stop++;
    detail = "more than one decimal point";
  } else if (/[eE]/.test(next) && /[+-]/.test(after)) {
    stop = end + 2;
    detail = "the exponent needs digits";
  } else if (/[eE]/.test(next) && !/[A-Za-z0-9_]/.test(after)) {
    stop = end + 1;
    detail = "the exponent needs digits";
  } else {
    return;
  }
  const written = text.slice(start, stop);
  throw new ExprError(
    `Malformed number "${written}" at ${at(start)}: ${detail}`,
    start,
    stop - start,
  );
}
