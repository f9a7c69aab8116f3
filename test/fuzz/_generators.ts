/**
 * Structure-aware pieces of hostile text: names that are JavaScript's own,
 * non-finite number spellings, odd Unicode, mixed line ends, deep nesting,
 * huge repetition and very long lines. The targets build inputs from these;
 * the mutator inserts them.
 *
 * @module
 */
import type { Rng } from "./_rng.ts";

/** Names an object already has, or that a loader treats specially. */
export const PROTO_NAMES = [
  "__proto__",
  "constructor",
  "prototype",
  "toString",
  "hasOwnProperty",
  "valueOf",
  "__defineGetter__",
  "then",
  "length",
] as const;

/** Number spellings at or past the edge of the grammar. */
export const NUMBER_EDGES = [
  "NaN",
  "nan",
  "Infinity",
  "-Infinity",
  "inf",
  ".inf",
  "-.inf",
  ".nan",
  "1e309",
  "-1e309",
  "1e-400",
  "4.9e-324",
  "2.2250738585072011e-308",
  "-0",
  "0x1F",
  "1_000",
  "1e",
  "+.5",
  "5.",
  "１２",
  "1,5",
  "9".repeat(400),
  "0." + "0".repeat(350) + "1",
] as const;

/** Characters that break naive assumptions about text. */
export const ODD_UNICODE = [
  "\u0000",
  "\uFEFF",
  "\u2028",
  "\u2029",
  "\uD800",
  "\uDC00",
  "\u200D",
  "\u202E",
  "e\u0301",
  "\u{1D465}",
  "\u{1F600}",
  "\uFFFE",
  "\u0085",
  "\u00A0",
  "\t",
  "\v",
  "\f",
  "\u0130",
  "\uFB01",
] as const;

/** Punctuation that matters to Markdown, YAML, CSV or expressions. */
const SYNTAX = [
  "```",
  "~~~",
  "---",
  "...",
  ": ",
  "- ",
  "#",
  "&a ",
  "*a",
  "<<: *a",
  "!!binary ",
  "!!js/function ",
  "{",
  "}",
  "[",
  "]",
  '"',
  "'",
  "|",
  ">",
  "@(",
  "$$",
  "(",
  ")",
  "=",
  "^",
  ",",
  ";",
] as const;

/** A line end: mostly LF, often CRLF, sometimes a lone CR. */
export function lineEnd(rng: Rng): string {
  const r = rng.next();
  return r < 0.6 ? "\n" : r < 0.9 ? "\r\n" : "\r";
}

/** One hostile token of any family. */
export function spice(rng: Rng): string {
  const family = rng.int(5);
  if (family === 0) return rng.pick(PROTO_NAMES);
  if (family === 1) return rng.pick(NUMBER_EDGES);
  if (family === 2) return rng.pick(ODD_UNICODE);
  if (family === 3) return rng.pick(SYNTAX);
  return lineEnd(rng);
}

/**
 * `open` repeated `depth` times, the inner text, then `close` as often.
 *
 * @param open The opening piece.
 * @param inner The text at the bottom.
 * @param close The closing piece ("" leaves it unclosed).
 * @param depth How deep.
 * @returns The nested text.
 */
export function nest(open: string, inner: string, close: string, depth: number): string {
  return open.repeat(depth) + inner + close.repeat(depth);
}

/** A line of `n` characters drawn from a small alphabet (no line end). */
export function longLine(rng: Rng, n: number): string {
  const unit = rng.pick(["x", "ab ", "1,", "é", "\u{1F600}", "a*", "- "]);
  return unit.repeat(Math.ceil(n / unit.length)).slice(0, n);
}

/** A name for a cell or column: ordinary, prototype-like, odd or long. */
export function name(rng: Rng): string {
  const r = rng.next();
  if (r < 0.55) return rng.pick(["x", "y", "t", "cycle", "capacity", "a", "b", "d1", "q_0"]);
  if (r < 0.75) return rng.pick(PROTO_NAMES);
  if (r < 0.85) return "n" + rng.pick(ODD_UNICODE) + rng.int(9);
  if (r < 0.95) {
    return rng.pick(["pi", "e", "exp", "log", "polynomial", "linear", "NaN", "Infinity"]);
  }
  return "v".repeat(rng.size(5000));
}
