/**
 * YAML parsing of a slice of the document, with errors placed in the
 * document. The slice's line endings are normalised to LF first (the `yaml`
 * package does not treat a lone CR as a line break); `toSource` maps offsets
 * in the normalised text back to document offsets.
 *
 * @module
 */
import { type Document, isMap, isPair, isScalar, isSeq, parseDocument } from "yaml";
import { LocatedError } from "../errors.ts";
import type { ParsedDocument } from "./types.ts";
import { floorIndex } from "./_lines.ts";
import { lineColumnAt } from "./line_column.ts";
import { MAX_KEYS, MAX_NESTING, pastKeyLimit, pastNestingLimit } from "./_key_limit.ts";

/** Messages for one YAML region ("Options of cell …", "Front matter …"). */
export interface YamlWording {
  invalid(detail: string): string;
  repeat(key: string): string;
  notMapping: string;
  /** More than `limit` keys (`_key_limit.ts`). */
  tooMany(limit: string): string;
}

/** A parsed YAML region. */
export interface YamlRegion {
  yaml: Document.Parsed;
  /** The LF-normalised text that was parsed. */
  text: string;
  /** Document offset of an offset in `text`. */
  toSource(local: number): number;
  /** The plain data (`{}` for empty text or when there were errors). */
  data: Record<string, unknown>;
  errors: LocatedError[];
}

/** Offsets in the normalised text where a CR was dropped (a CRLF became LF). */
function normalise(raw: string): { text: string; dropped: number[] } {
  const dropped: number[] = [];
  let text = "";
  let from = 0;
  for (let i = 0; i < raw.length; i++) {
    if (raw.charCodeAt(i) !== 13) continue;
    text += raw.slice(from, i);
    if (raw.charCodeAt(i + 1) === 10) dropped.push(text.length);
    else text += "\n";
    from = i + 1;
  }
  return { text: text + raw.slice(from), dropped };
}

/** Our own words where the package's message names its API. */
const OWN_WORDS: Record<string, string> = {
  MULTIPLE_DOCS: 'a line "---" starts a second YAML document; write one mapping',
};

function detail(message: string, code?: string): string {
  if (code !== undefined && code in OWN_WORDS) return OWN_WORDS[code];
  const d = message.replace(/ at line \d+, column \d+:[\s\S]*$/, "").trim();
  return /^[A-Z][a-z]/.test(d) ? d[0].toLowerCase() + d.slice(1) : d;
}

/**
 * Keys repeated within one mapping, in document order: `[key, offset]`.
 * One Set a mapping, so linear in the keys (the package's `uniqueKeys`
 * compares each key with every earlier one). Keys compare as the plain data
 * will hold them (`1` and `"1"` are one key there). A loop with its own
 * stack, not recursion, so nesting depth costs no call stack.
 */
function repeatedKeys(yaml: Document.Parsed): [string, number][] {
  const out: [string, number][] = [];
  const stack: unknown[] = [yaml.contents];
  while (stack.length > 0) {
    const node = stack.pop();
    if (isMap(node)) {
      const seen = new Set<string>();
      for (const pair of node.items) {
        if (isScalar(pair.key)) {
          const key = String(pair.key.value);
          if (seen.has(key)) out.push([key, pair.key.range?.[0] ?? 0]);
          seen.add(key);
        }
        stack.push(pair.key, pair.value);
      }
    } else if (isSeq(node)) { for (const item of node.items) stack.push(item); }
    else if (isPair(node)) stack.push(node.key, node.value);
  }
  return out.sort((a, b) => a[1] - b[1]);
}

/**
 * Parses `doc.source.slice(start, end)` as one YAML document whose top level
 * must be a mapping (or empty).
 */
export function parseYamlRegion(
  doc: ParsedDocument,
  start: number,
  end: number,
  wording: YamlWording,
): YamlRegion {
  const { text, dropped } = normalise(doc.source.slice(start, end));
  const toSource = (local: number) => {
    const before = dropped.length === 0 || local < dropped[0] ? 0 : floorIndex(dropped, local) + 1;
    return start + local + before;
  };
  const at = (local: number) => lineColumnAt(doc, toSource(local));
  const past = pastKeyLimit(text);
  if (past >= 0) {
    const limit = MAX_KEYS.toLocaleString("en-US");
    const yaml = parseDocument("");
    return {
      yaml,
      text,
      toSource,
      data: {},
      errors: [new LocatedError(wording.tooMany(limit), at(past))],
    };
  }
  const deep = pastNestingLimit(text);
  if (deep >= 0) {
    return {
      yaml: parseDocument(""),
      text,
      toSource,
      data: {},
      errors: [
        new LocatedError(
          wording.invalid(`it nests more than ${MAX_NESTING} levels deep here: write it flatter`),
          at(deep),
        ),
      ],
    };
  }
  let yaml: Document.Parsed;
  try {
    yaml = parseDocument(text, { uniqueKeys: false, prettyErrors: false });
  } catch (e) {
    // The package recurses once a level; what the scan above does not see may still overflow.
    if (!(e instanceof RangeError)) throw e;
    return {
      yaml: parseDocument(""),
      text,
      toSource,
      data: {},
      errors: [new LocatedError(wording.invalid("it nests too deeply to read"), at(0))],
    };
  }
  const errors = yaml.errors.map((e) =>
    new LocatedError(wording.invalid(detail(e.message, e.code)), at(e.pos[0]))
  );
  if (errors.length === 0) {
    for (const [key, pos] of repeatedKeys(yaml)) {
      errors.push(new LocatedError(wording.repeat(key), at(pos)));
    }
  }
  let data: Record<string, unknown> = {};
  const top = yaml.contents;
  const empty = top === null ||
    isScalar(top) && top.value === null && top.range[0] === top.range[1];
  if (errors.length === 0 && !empty) {
    try {
      const js = yaml.toJS({ maxAliasCount: 1000 });
      if (js !== null && typeof js === "object" && !Array.isArray(js)) data = js;
      else errors.push(new LocatedError(wording.notMapping, at(top.range[0])));
    } catch (e) {
      errors.push(new LocatedError(wording.invalid(detail(String((e as Error).message))), at(0)));
    }
  }
  return { yaml, text, toSource, data, errors };
}
