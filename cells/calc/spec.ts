/**
 * A `calc` cell's body and its normaliser. The body is a short header of
 * `key: value` lines, a line `---`, then TypeScript: the body of a function
 * whose `return` gives the cell's value.
 *
 * ```calc end-of-life
 * reads: power, cycles            # cells the code reads, each by its name
 * gives: value                    # value (any data; default) or table
 * time: 10 s                      # time limit (default 10 s)
 * memory: 256 MB                  # memory limit (default 256 MB)
 * ---
 * const q = power.evaluate({ cycle: 500 });
 * return { capacity_at_500: q };
 * ```
 *
 * A cell whose name is not an identifier is read under one of our own
 * choosing: `reads: end-of-life as eol`. A body without `---` is all code and
 * reads nothing.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { checkOptionKeys, type OptionDecls, type ParseContext } from "../../kernel/contract/mod.ts";
import { didYouMean } from "../../kernel/suggest.ts";

/** One cell the code reads: the cell's name and the variable the code sees it as. */
export interface CalcInput {
  cell: string;
  as: string;
  /** Where the cell's name is written in the body (for error positions). */
  offset: number;
}

/** A `calc` cell's normalised options and code (plain JSON: hashed into the cache key). */
export interface CalcSpec {
  reads: CalcInput[];
  gives: "value" | "table";
  /** Time limit, seconds. */
  seconds: number;
  /** Memory limit, MB. */
  memoryMb: number;
  /** The code as written (after the `---` line). */
  code: string;
  /** Offset of the code in the body (for error positions). */
  codeOffset: number;
}

/** Header keys a `calc` cell understands, each declared once. */
export const CALC_OPTIONS: OptionDecls = {
  reads: {
    type: "list",
    doc: "the cells the code reads, by name (`name as alias` for a name that is not an identifier)",
    names: "cells",
  },
  gives: {
    type: "choice",
    doc: "what the code returns: any data (value) or a table other cells can read",
    default: "value",
    choices: ["value", "table"],
  },
  time: { type: "number", doc: "the time limit in seconds (`10 s`)", default: 10 },
  memory: { type: "number", doc: "the memory limit in MB (`256 MB`)", default: 256 },
};

/** Most seconds and MB a cell may ask for. */
export const MAX_SECONDS = 600;
export const MAX_MEMORY_MB = 4096;

const IDENT = /^[A-Za-z_$][A-Za-z0-9_$]*$/;
/** Words a variable cannot be (TypeScript's reserved words, and what the sandbox takes). */
const RESERVED = new Set(
  ("break case catch class const continue debugger default delete do else enum export extends " +
    "false finally for function if import in instanceof new null return super switch this throw " +
    "true try typeof var void while with as implements interface let package private protected " +
    "public static yield await any boolean number string symbol type of Deno globalThis console " +
    "Math JSON Object Array Number String")
    .split(" "),
);

/** Where a header line starts in the body, and its text. */
interface HeaderLine {
  text: string;
  offset: number;
}

function headerLines(body: string): { lines: HeaderLine[]; codeOffset: number } | null {
  const re = /^[ \t]*---[ \t]*\r?$/m;
  const m = re.exec(body);
  if (m === null) return null;
  const lines: HeaderLine[] = [];
  let at = 0;
  for (const text of body.slice(0, m.index).split("\n")) {
    lines.push({ text: text.replace(/\r$/, ""), offset: at });
    at += text.length + 1;
  }
  const after = m.index + m[0].length;
  return { lines, codeOffset: body[after] === "\n" ? after + 1 : after };
}

function readInputs(value: string, offset: number): CalcInput[] {
  const out: CalcInput[] = [];
  let at = 0;
  for (const part of value.split(",")) {
    const here = offset + at + (part.length - part.trimStart().length);
    at += part.length + 1;
    const words = part.trim().split(/\s+/).filter((w) => w !== "");
    if (words.length === 0) continue;
    let cell: string, as: string;
    if (words.length === 1) cell = as = words[0];
    else if (words.length === 3 && words[1] === "as") [cell, , as] = words;
    else {
      throw new CellError(
        `Cannot read "${part.trim()}": write a cell's name, or "name as alias"`,
        [],
        here,
      );
    }
    if (!IDENT.test(as) || RESERVED.has(as)) {
      throw new CellError(
        IDENT.test(as)
          ? `"${as}" cannot name an input: it is a word TypeScript or the sandbox takes; write "${cell} as another_name"`
          : `"${as}" is not a name code can use: write "${cell} as ${
            as.replace(/[^A-Za-z0-9_$]+/g, "_")
          }"`,
        [],
        here,
      );
    }
    if (out.some((i) => i.as === as)) throw new CellError(`"${as}" is read twice`, [], here);
    out.push({ cell, as, offset: here });
  }
  return out;
}

function readAmount(
  value: string,
  unit: string,
  max: number,
  offset: number,
  what: string,
): number {
  const m = new RegExp(`^(\\d+(?:\\.\\d+)?)\\s*(?:${unit})?$`, "i").exec(value.trim());
  const v = m ? Number(m[1]) : NaN;
  if (!(v > 0) || v > max) {
    throw new CellError(
      `The ${what} must be a number above 0 and at most ${max} ${unit}, as in "${what}: ${
        what === "time" ? "10 s" : "256 MB"
      }"`,
      [],
      offset,
    );
  }
  return v;
}

/**
 * Checks and normalises a `calc` cell's header and keeps its code.
 *
 * @param ctx The parse context (the body is the code, with its header).
 * @returns The spec.
 * @throws {CellError} For an unknown header key (with the nearest), a line
 *   that is not `key: value`, an input that code cannot name, a `gives` other
 *   than value or table, a time or memory out of range, or no code.
 * @example
 * ```ts
 * import { parseCalcSpec } from "./spec.ts";
 * const spec = parseCalcSpec({
 *   name: "eol", kind: "calc", options: {}, warn() {},
 *   body: "reads: power, end-of-life as life\ntime: 5 s\n---\nreturn 1;\n",
 *   settings: { title: "", confidence: 0.95, seed: 1, criterion: "aicc", maxFileBytes: 1, extra: {} },
 * });
 * if (spec.reads[1].as !== "life" || spec.seconds !== 5 || spec.code !== "return 1;\n") throw new Error();
 * ```
 */
export function parseCalcSpec(ctx: ParseContext): CalcSpec {
  checkOptionKeys(ctx, CALC_OPTIONS); // options come from the header; none arrive as YAML
  const spec: CalcSpec = {
    reads: [],
    gives: "value",
    seconds: 10,
    memoryMb: 256,
    code: ctx.body,
    codeOffset: 0,
  };
  const header = headerLines(ctx.body);
  if (header !== null) {
    spec.code = ctx.body.slice(header.codeOffset);
    spec.codeOffset = header.codeOffset;
    const seen = new Set<string>();
    for (const line of header.lines) {
      const text = line.text.replace(/(^|\s)#.*$/, "");
      if (text.trim() === "") continue;
      const m = /^(\s*)([A-Za-z_]+)\s*:\s*(.*)$/.exec(text);
      if (m === null) {
        throw new CellError(
          `Cannot read "${text.trim()}" in the header: write "key: value" lines, then a line "---" and the code`,
          [],
          line.offset,
        );
      }
      const [, lead, key, value] = m;
      const at = line.offset + lead.length;
      const valueAt = line.offset + text.indexOf(value, lead.length + key.length);
      if (!Object.hasOwn(CALC_OPTIONS, key)) {
        const keys = Object.keys(CALC_OPTIONS);
        const hint = didYouMean(key, keys) ||
          `: a calc cell takes ${keys.map((k) => `"${k}"`).join(", ")}`;
        throw new CellError(`Unknown option "${key}" in calc "${ctx.name}"${hint}`, [], at);
      }
      if (seen.has(key)) throw new CellError(`"${key}" is given twice`, [], at);
      seen.add(key);
      if (key === "reads") spec.reads = readInputs(value, valueAt);
      else if (key === "gives") {
        const g = value.trim();
        if (g !== "value" && g !== "table") {
          throw new CellError(
            `"gives" is value or table, not "${g}"${didYouMean(g, ["value", "table"])}`,
            [],
            valueAt,
          );
        }
        spec.gives = g;
      } else if (key === "time") {
        spec.seconds = readAmount(value, "s", MAX_SECONDS, valueAt, "time");
      } else spec.memoryMb = readAmount(value, "MB", MAX_MEMORY_MB, valueAt, "memory");
    }
  }
  if (spec.code.trim() === "") {
    throw new CellError(
      'This calc cell has no code: write it after the header\'s "---" line',
      [],
      spec.codeOffset,
    );
  }
  const imp = /\bimport\b/.exec(spec.code);
  if (imp) {
    throw new CellError(
      "calc cells cannot import modules: everything the code reads comes through `reads`",
      [],
      spec.codeOffset + imp.index,
    );
  }
  const exp = /\bexport\b/.exec(spec.code);
  if (exp) {
    throw new CellError(
      "calc cells cannot export: the code's answer is what it returns",
      [],
      spec.codeOffset + exp.index,
    );
  }
  return spec;
}
