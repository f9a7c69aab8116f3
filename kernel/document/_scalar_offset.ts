/**
 * Character offsets inside a YAML scalar's value mapped to offsets in its
 * source text (YAML 1.2.2 §7.3 flow scalars, §8.1 block scalars).
 *
 * - Plain: one to one on a line; a line break with the following
 *   indentation folds to one value character.
 * - Single quoted: `''` is one character; the opening quote is skipped.
 * - Double quoted: escapes (`\n`, `\x41`, `\u00e9`, `\U0001F600`, …) are
 *   decoded; `\` before a line break joins lines.
 * - Block (`|`, `>`): best effort: each value line maps to the same line in
 *   the source after the content indentation (that of the first non-blank
 *   line); a line break counts as one value character, which is exact for
 *   literal scalars and for folded scalars without blank lines.
 *
 * @module
 */

const ESCAPE_LENGTH: Record<string, number> = { x: 4, u: 6, U: 10 };

function breakLength(raw: string, i: number): number {
  if (raw[i] !== "\n") return 0;
  let j = i + 1;
  while (raw[j] === " " || raw[j] === "\t") j++;
  return j - i;
}

function flowOffset(raw: string, quote: string, offset: number): number {
  let i = quote === "" ? 0 : 1;
  let v = 0;
  while (i < raw.length && v < offset) {
    const brk = breakLength(raw, i);
    if (brk > 0) {
      i += brk;
      v++;
    } else if (quote === "'" && raw.startsWith("''", i)) {
      i += 2;
      v++;
    } else if (quote === '"' && raw[i] === "\\") {
      const next = raw[i + 1];
      if (next === "\n") i += 1 + breakLength(raw, i + 1);
      else {
        const n = ESCAPE_LENGTH[next] ?? 2;
        const code = n > 2 ? parseInt(raw.slice(i + 2, i + n), 16) : 0;
        i += n;
        v += code > 0xffff ? 2 : 1;
      }
    } else {
      i++;
      v++;
    }
  }
  return i;
}

function blockOffset(raw: string, offset: number): number {
  const lines = raw.split("\n");
  const first = lines.slice(1).find((l) => l.trim() !== "") ?? "";
  const indent = first.length - first.trimStart().length;
  let at = lines[0].length + 1;
  let v = offset;
  for (let k = 1; k < lines.length; k++) {
    const line = lines[k];
    let lead = 0;
    while (lead < indent && line[lead] === " ") lead++;
    const len = line.length - lead;
    if (v <= len) return at + lead + v;
    v -= len + 1;
    at += line.length + 1;
  }
  return raw.length;
}

/**
 * Offset in a scalar's source text of a character offset in its value.
 *
 * @param raw The scalar's source text, LF line endings (quotes, block header included).
 * @param type The `yaml` package's scalar type (`PLAIN`, `QUOTE_DOUBLE`, …).
 * @param offset 0-based offset in the value.
 * @returns 0-based offset in `raw`, at most `raw.length`.
 */
export function scalarOffset(raw: string, type: string | undefined, offset: number): number {
  if (type === "BLOCK_LITERAL" || type === "BLOCK_FOLDED") return blockOffset(raw, offset);
  const quote = type === "QUOTE_DOUBLE" ? '"' : type === "QUOTE_SINGLE" ? "'" : "";
  return Math.min(flowOffset(raw, quote, offset), raw.length);
}
