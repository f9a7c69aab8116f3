/**
 * Document settings from the YAML front matter, validated, with defaults.
 *
 * | key | default | rule |
 * |---|---|---|
 * | `title` | `"Untitled analysis"` | text (a number is taken as text) |
 * | `confidence` | `0.95` | a number strictly between 0 and 1 |
 * | `seed` | `1` | a whole number, 0 or more |
 * | `criterion` | `"aicc"` | `aic`, `aicc`, `bic` or `loo` (any letter case) |
 * | `max_file_size` | 512 MiB | bytes, or text like `512 MB`, `2 GiB` |
 * | `history` | `100` | records the run history keeps: a whole number 1 to 100,000, or `off` |
 * | `intervals` | Wald (+ profile for nonlinear fits) | interval methods fits compute by default: any of `wald`, `profile`, `bootstrap` (one word or a list) |
 * | `query_time_limit` | 1,800 s | seconds a database statement may run: a number, text like `90 s`, `30 min`, `2 h`, or `none` (also 0) |
 *
 * Every other key is kept in `extra`.
 *
 * @module
 */
import { isMap, isPair, isScalar, type Node } from "yaml";
import { LocatedError, type SourcePos } from "../errors.ts";
import type { DocSettings } from "../contract/mod.ts";
import type { ParsedDocument } from "./types.ts";
import { didYouMean } from "../suggest.ts";
import { parseYamlRegion, type YamlRegion } from "./_yaml.ts";
import { byteSize } from "./_byte_size.ts";
import { lineColumnAt } from "./line_column.ts";

/** Settings and the problems found reading them. */
export interface SettingsResult {
  settings: DocSettings;
  errors: LocatedError[];
}

const CRITERIA = ["aic", "aicc", "bic", "loo"];
const KNOWN = new Set([
  "title",
  "confidence",
  "seed",
  "criterion",
  "max_file_size",
  "history",
  "query_time_limit",
  "intervals",
]);

/** The interval methods the `intervals` setting may name. */
const INTERVAL_METHODS = ["wald", "profile", "bootstrap"];

/** The most records a history may keep (a bound on the file, not a target). */
const MOST_RECORDS = 100_000;

/** The longest statement time limit, in seconds (a week; longer is `none`). */
const MOST_QUERY_SECONDS = 7 * 24 * 3600;

const TIME_UNITS: Record<string, number> = { s: 1, min: 60, h: 3600 };

/**
 * A statement time limit in seconds (0 for none), from a number of seconds,
 * text with a unit (`90 s`, `30 min`, `1.5 h`), or `none`/`off`; null when
 * it is none of these.
 */
function querySeconds(v: unknown): number | null {
  if (v === false) return 0;
  if (typeof v === "number") return Number.isFinite(v) && v >= 0 ? v : null;
  if (typeof v !== "string") return null;
  const t = v.trim().toLowerCase();
  if (t === "none" || t === "off") return 0;
  const m = /^(\d+(?:\.\d+)?)\s*(s|min|h)$/.exec(t);
  return m ? Number(m[1]) * TIME_UNITS[m[2]] : null;
}

function describe(value: unknown): string {
  if (Array.isArray(value)) return "a list";
  if (value !== null && typeof value === "object") return "a mapping";
  return typeof value === "string" ? `"${value}"` : String(value);
}

function valuePos(doc: ParsedDocument, region: YamlRegion, key: string): SourcePos {
  const top = region.yaml.contents;
  if (isMap(top)) {
    const pair = top.items.find((p) => isPair(p) && isScalar(p.key) && p.key.value === key);
    const node = (pair?.value ?? pair?.key) as Node | undefined;
    if (node?.range) return lineColumnAt(doc, region.toSource(node.range[0]));
  }
  return { line: 1, column: 1 };
}

type Check = (v: unknown) => { value: unknown } | { problem: string; hint?: string };

const CHECKS: Record<string, [keyof DocSettings, Check]> = {
  title: [
    "title",
    (v) =>
      typeof v === "string" || typeof v === "number"
        ? { value: String(v) }
        : { problem: "must be text" },
  ],
  confidence: ["confidence", (v) =>
    typeof v === "number" && v > 0 && v < 1 ? { value: v } : {
      problem: "must be a number between 0 and 1, exclusive",
      hint: typeof v === "number" && v > 1 && v < 100 ? `; for ${v}% write ${v / 100}` : "",
    }],
  seed: ["seed", (v) =>
    Number.isSafeInteger(v) && (v as number) >= 0 ? { value: v } : {
      problem: "must be a whole number, 0 or more",
    }],
  criterion: ["criterion", (v) => {
    const c = typeof v === "string" ? v.toLowerCase() : "";
    return CRITERIA.includes(c) ? { value: c } : {
      problem: `must be one of ${CRITERIA.join(", ")}`,
      hint: didYouMean(c || String(v), CRITERIA),
    };
  }],
  max_file_size: ["maxFileBytes", (v) => {
    const n = byteSize(v);
    return n === null
      ? { problem: "must be a size such as 512 MB, 2 GiB or a number of bytes" }
      : { value: n };
  }],
  history: [
    "history",
    (v) =>
      v === false || (typeof v === "string" && v.toLowerCase() === "off")
        ? { value: 0 }
        : Number.isSafeInteger(v) && (v as number) >= 1 && (v as number) <= MOST_RECORDS
        ? { value: v }
        : {
          problem: `must be a whole number from 1 to ${MOST_RECORDS.toLocaleString("en")}, or off`,
        },
  ],
  intervals: ["intervals", (v) => {
    const list = Array.isArray(v) ? v : [v];
    const words = list.map((w) => (typeof w === "string" ? w.trim().toLowerCase() : ""));
    const bad = words.findIndex((w) => !INTERVAL_METHODS.includes(w));
    if (list.length === 0 || bad >= 0) {
      return {
        problem: `must name interval methods among ${INTERVAL_METHODS.join(", ")}`,
        hint: bad >= 0 ? didYouMean(String(list[bad]), INTERVAL_METHODS) : "",
      };
    }
    return { value: [...new Set(words)] };
  }],
  query_time_limit: ["queryTimeLimit", (v) => {
    const s = querySeconds(v);
    if (s === null) {
      return { problem: "must be seconds (a number, or text such as 90 s, 30 min, 2 h), or none" };
    }
    return s <= MOST_QUERY_SECONDS ? { value: s } : {
      problem: `must be at most ${MOST_QUERY_SECONDS.toLocaleString("en")} seconds (a week)`,
      hint: "; for no limit write none",
    };
  }],
};

/** The settings of a document without front matter (each key's default). */
export const DEFAULT_SETTINGS: Readonly<DocSettings> = Object.freeze({
  title: "Untitled analysis",
  confidence: 0.95,
  seed: 1,
  criterion: "aicc",
  maxFileBytes: 512 * 2 ** 20,
  history: 100,
  extra: {},
});

/**
 * Reads a document's settings from its front matter. Problems are returned
 * (never thrown) at the offending value's line and column; a bad value keeps
 * its default.
 *
 * @param doc A parsed document (with or without front matter).
 * @returns The settings with defaults filled in, and any errors.
 * @example
 * ```ts
 * import { parseDocument, readSettings } from "./mod.ts";
 * const doc = parseDocument("---\ntitle: Fade\nmax_file_size: 2 GiB\n---\n");
 * const { settings } = readSettings(doc);
 * if (settings.maxFileBytes !== 2 * 2 ** 30 || settings.confidence !== 0.95) {
 *   throw new Error(JSON.stringify(settings));
 * }
 * ```
 */
export function readSettings(doc: ParsedDocument): SettingsResult {
  const settings: DocSettings = { ...DEFAULT_SETTINGS, extra: {} };
  const fm = doc.frontMatter;
  if (fm === null) return { settings, errors: [] };
  const region = parseYamlRegion(doc, fm.bodyStart, fm.bodyEnd, {
    invalid: (d) => `Front matter is not valid YAML: ${d}`,
    repeat: (k) => `Front matter repeats key "${k}": each key may appear once`,
    notMapping: "Front matter must be a YAML mapping of key: value",
    tooMany: (limit) =>
      `Front matter has more than ${limit} keys: it holds a few document settings`,
  });
  const errors = region.errors;
  for (const [key, value] of Object.entries(region.data)) {
    if (!KNOWN.has(key)) {
      settings.extra[key] = value;
      continue;
    }
    const [field, check] = CHECKS[key];
    const r = check(value);
    if ("value" in r) (settings as unknown as Record<string, unknown>)[field] = r.value;
    else {
      const msg = `Setting "${key}" ${r.problem}: got ${describe(value)}${r.hint ?? ""}`;
      errors.push(new LocatedError(msg, valuePos(doc, region, key)));
    }
  }
  return { settings, errors };
}
