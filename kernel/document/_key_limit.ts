/**
 * A bound on the keys of one YAML region (a cell's options, the front
 * matter), checked on the text before the YAML package sees it.
 *
 * The `yaml` package's own cost is linear but not small: about 16 µs a key
 * here (100,000 keys: 1.6 s, lexing alone 0.36 s), and its `uniqueKeys`
 * check compares each key with every earlier one (50,000 keys: 23 s). We
 * check repeats ourselves (`_yaml.ts`, one Set a mapping) and refuse a region
 * with more than {@link MAX_KEYS} keys at once. Counting is a single regular
 * expression pass: a colon followed by a space, tab or line end (how a YAML
 * key ends, YAML 1.2.2 §7.4 and §8.2.2), or directly after a quote
 * (`"a":1` in a flow mapping). Colons inside quoted text count too, so the
 * count is an upper bound; the bound is generous for that reason.
 *
 * @module
 */

/** Most keys one cell's options (or the front matter) may have. */
export const MAX_KEYS = 10_000;

/**
 * Where the text passes {@link MAX_KEYS} keys.
 *
 * @param text The region's text.
 * @param limit The bound (default {@link MAX_KEYS}).
 * @returns The offset of the first key's colon past the bound, or -1.
 * @example
 * ```ts
 * import { pastKeyLimit } from "./_key_limit.ts";
 * if (pastKeyLimit("a: 1\nb: 2\nc: 3\n", 2) !== 11) throw new Error("the third colon");
 * if (pastKeyLimit("a: 1\n", 2) !== -1) throw new Error("within the bound");
 * ```
 */
export function pastKeyLimit(text: string, limit: number = MAX_KEYS): number {
  const colon = /["']:|:(?=[ \t\r\n]|$)/g;
  let count = 0;
  for (let m = colon.exec(text); m !== null; m = colon.exec(text)) {
    if (++count > limit) return colon.lastIndex - 1;
  }
  return -1;
}

/** Deepest nesting of sequences, mappings and flow brackets the options may have. */
export const MAX_NESTING = 64;

/**
 * Where the options first nest deeper than `limit`, by a linear scan (the
 * YAML package's parser recurses once a level and overflows the call stack
 * on a line of some thousand compact dashes, `- - - …`): per line, the
 * indentation (two columns a level) plus the dashes of a compact sequence,
 * and across lines the open flow brackets `[` and `{` outside quotes.
 *
 * @param text The YAML text.
 * @param limit The deepest nesting allowed.
 * @returns The offset where the nesting goes past `limit`, or −1.
 * @example
 * ```ts
 * import { pastNestingLimit } from "./_key_limit.ts";
 * if (pastNestingLimit("a: [1, 2]\nb:\n  - c\n") !== -1) throw new Error("flat");
 * if (pastNestingLimit("x:\n" + "- ".repeat(100) + "1", 64) < 0) throw new Error("deep");
 * ```
 */
export function pastNestingLimit(text: string, limit: number = MAX_NESTING): number {
  let flow = 0, quote = "", lineStart = 0;
  for (let i = 0; i <= text.length; i++) {
    const c = text[i];
    if (i === lineStart) {
      let j = i, depth = 0;
      while (text[j] === " ") j++;
      depth = (j - i) >> 1;
      // Compact sequences: "- - - x" opens one level a dash.
      while (text[j] === "-" && (text[j + 1] === " " || text[j + 1] === "\t")) {
        depth++;
        j += 2;
        while (text[j] === " " || text[j] === "\t") j++;
      }
      if (depth + flow > limit) return j;
    }
    if (c === "\n" || c === undefined) {
      lineStart = i + 1;
      if (quote === "'") quote = ""; // single-quoted scalars do not span lines here
      continue;
    }
    if (quote !== "") {
      if (c === quote && text[i - 1] !== "\\") quote = "";
    } else if (c === '"' || c === "'") quote = c;
    else if (c === "#" && (i === 0 || text[i - 1] === " ")) {
      while (i + 1 < text.length && text[i + 1] !== "\n") i++;
    } else if (c === "[" || c === "{") {
      if (++flow > limit) return i;
    } else if ((c === "]" || c === "}") && flow > 0) flow--;
  }
  return -1;
}
