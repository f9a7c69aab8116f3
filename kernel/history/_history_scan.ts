/**
 * A history file's bytes sorted into records, in one pass and without
 * parsing what need not be parsed:
 *
 * ```
 *  bytes ──split at \n──▶ lines ──role and id from the first 256 bytes──▶ groups by record id
 *     head lines: parsed (small)          cell lines: left as byte ranges
 *     end lines: matched whole            exact duplicate lines: dropped (a union merge)
 *  group complete ⇔ one head, one end, distinct lines = end count = head's cells + 2
 * ```
 *
 * Lines are grouped by record id, not by position, so histories of two
 * branches combined line by line read back whole. A group that is not
 * complete is left out with one sentence: cut short (a crash during the
 * append; the only one the appender repairs), or damaged (a line of the wrong
 * shape, two versions of a line). Records of a newer format are neither read
 * nor dropped. Only a complete record's cell lines are decoded and parsed
 * ({@link readGroup}), so the appender's scan of a large history stays cheap.
 *
 * @module
 */
import {
  checkCell,
  checkHead,
  FORMAT,
  type Head,
  idOfPrefix,
  type LineRole,
  readableTime,
  roleOfPrefix,
  roleOfValue,
} from "./_history_lines.ts";
import type { HistoryRecord, RecordedCell } from "./types.ts";

/** One line: its number (1-based) and byte range, without the line break. */
export interface Line {
  no: number;
  start: number;
  end: number;
}

/** The lines of one record id. */
export interface Group {
  id: string;
  /** Distinct lines, in file order. */
  lines: Line[];
  /** The distinct cell lines among them. */
  cells: Line[];
  head: Head | null;
  /** The end line's count. */
  end: number | null;
  /** A line of this record that cannot be read, and why. */
  trouble: { no: number; why: string } | null;
  /** The file's last line belongs to this record and stops before its end. */
  cut: boolean;
  /** The file's last line belongs to this record. */
  last: boolean;
}

/** What a scan found. */
export interface Scan {
  bytes: Uint8Array;
  /** Complete records of this format, by time then id. */
  complete: Group[];
  /** Complete records of a newer format: kept as they are by a rewrite, never read. */
  newer: Group[];
  /** Records cut short (or a cut last line of no record): a rewrite drops them. */
  cut: number;
  /** Everything else left out: damaged records and stray lines. */
  damaged: number;
  /** A sentence for each part left out, in file order. */
  problems: Problem[];
}

const decoder = new TextDecoder();
const PREFIX_BYTES = 256;
const NOT_JSON = Symbol("not JSON");

/**
 * Sorts a history file's bytes into records.
 *
 * @param bytes The file's content.
 * @returns Complete records and what was left out.
 */
export function scanHistory(bytes: Uint8Array): Scan {
  const groups = new Map<string, Group>();
  const seen = new Map<string, Line[]>();
  const problems: Problem[] = [];
  const { lines, cutNo } = splitLines(bytes);
  const lastNo = lines.length > 0 ? lines[lines.length - 1].no : 0;
  let prev: Group | null = null;
  for (const line of lines) {
    const prefix = decoder.decode(
      bytes.subarray(line.start, Math.min(line.end, line.start + PREFIX_BYTES)),
    );
    let role = roleOfPrefix(prefix);
    // Head lines are parsed whole (they are small); so are lines not written our way and a cut last line.
    const value = !role || role.role === "head" || line.no === cutNo
      ? parseLine(bytes, line)
      : undefined;
    if (value === NOT_JSON && line.no === cutNo) {
      // The write stopped in this line: it belongs to its record (by its id, or to the one it follows).
      const id = idOfPrefix(prefix);
      const g = id === null ? prev : groups.get(id) ?? newGroup(groups, id);
      if (g && g.end === null) g.cut = g.last = true;
      else {problems.push({
          no: line.no,
          text: `The last line (line ${line.no}) was cut short; it is left out.`,
          cut: true,
        });}
      continue;
    }
    if (!role && value !== NOT_JSON) role = roleOfValue(value);
    if (!role) {
      const what = value === NOT_JSON ? "is not JSON" : "is not a line of a run history record";
      problems.push({ no: line.no, text: `Line ${line.no} ${what}; it is skipped.`, cut: false });
      continue;
    }
    const g = prev = groups.get(role.id) ?? newGroup(groups, role.id);
    g.last = line.no === lastNo;
    if (value === NOT_JSON) g.trouble ??= { no: line.no, why: "is not JSON" };
    else if (!isDuplicate(bytes, seen, line, prefix)) addLine(g, line, role, value);
  }
  const complete: Group[] = [], newer: Group[] = [];
  for (const g of groups.values()) {
    const verdict = judge(g);
    if (verdict !== "complete") problems.push(verdict);
    else if (g.head!.version <= FORMAT) complete.push(g);
    else {
      newer.push(g);
      const text = `The record of ${timeOf(g)} is in a newer history format (${
        g.head!.version
      }); it is not read.`;
      problems.push({ no: g.lines[0].no, text, cut: false, newer: true });
    }
  }
  complete.sort(byTime);
  newer.sort(byTime);
  problems.sort((a, b) => a.no - b.no);
  const cut = problems.filter((p) => p.cut).length;
  return {
    bytes,
    complete,
    newer,
    cut,
    damaged: problems.length - cut - newer.length,
    problems,
  };
}

/** A part of the file left out: its first line's number and the sentence. */
export interface Problem {
  no: number;
  text: string;
  /** Cut short by a write that stopped: the appender repairs these. */
  cut: boolean;
  newer?: true;
}

function addLine(g: Group, line: Line, role: LineRole, value: unknown): void {
  g.lines.push(line);
  if (role.role === "cell") g.cells.push(line);
  else if (role.role === "head") {
    const head = checkHead(value);
    if (typeof head === "string") {
      g.trouble ??= { no: line.no, why: `is not a record's first line: ${head}` };
    } else if (g.head) {
      g.trouble ??= { no: line.no, why: "is a second, different first line of its record" };
    } else g.head = head;
  } else if (role.role === "end") {
    if (g.end !== null) {
      g.trouble ??= { no: line.no, why: "is a second, different end line of its record" };
    } else g.end = role.count;
  } else g.trouble ??= { no: line.no, why: "is neither a first, a cell nor an end line" };
}

/**
 * A complete group read into a record: its cell lines decoded, parsed and checked.
 *
 * @param bytes The file's content.
 * @param g A complete group of this format.
 * @returns The record, or why it is left out.
 */
export function readGroup(bytes: Uint8Array, g: Group): HistoryRecord | { problem: Problem } {
  const cells: RecordedCell[] = [];
  for (const line of g.cells) {
    let value: unknown;
    try {
      value = JSON.parse(decoder.decode(bytes.subarray(line.start, line.end)));
    } catch {
      return { problem: { no: line.no, text: leftOut(g, line.no, "is not JSON"), cut: false } };
    }
    const cell = checkCell(value);
    if (typeof cell === "string") {
      return {
        problem: {
          no: line.no,
          text: leftOut(g, line.no, `is not a cell line: ${cell}`),
          cut: false,
        },
      };
    }
    cells.push(cell);
  }
  const { record, time, plumb, document, files, level } = g.head!;
  return { record, time, plumb, document, files, level, cells };
}

/** The sentence for a record left out because of one of its lines. */
function leftOut(g: Group, no: number, why: string): string {
  return `Line ${no} ${why}; the record of ${timeOf(g)} is left out.`;
}

function judge(g: Group): "complete" | Problem {
  const no = g.lines[0]?.no ?? Number.MAX_SAFE_INTEGER;
  if (g.trouble) {
    return { no: g.trouble.no, text: leftOut(g, g.trouble.no, g.trouble.why), cut: false };
  }
  const found = g.lines.length;
  const announced = g.head && Number.isInteger(g.head.cells) ? g.head.cells + 2 : null;
  const expected = announced ?? g.end;
  if (announced !== null && g.end !== null && g.end !== announced) {
    const text =
      `The record of ${timeOf(g)} announces ${
        g.head!.cells
      } cells but ends after ${g.end} lines; ` +
      `it is left out.`;
    return { no, text, cut: false };
  }
  if (!g.cut && g.head && g.end !== null && found === g.end) return "complete";
  if (expected !== null && found > expected) {
    const text = `The record of ${
      timeOf(g)
    } has ${found} lines where it should have ${expected}; it is left out.`;
    return { no, text, cut: false };
  }
  const who = g.last ? `The last record (${timeOf(g)})` : `The record of ${timeOf(g)}`;
  if (!g.head && found === 0) {
    return { no, text: `${who} was cut short in its first line; it is left out.`, cut: true };
  }
  if (!g.head) return { no, text: `${who} has no first line; it is left out.`, cut: false };
  const of = expected === null ? "" : ` of ${expected}`;
  return { no, text: `${who} was cut short: ${found}${of} lines; it is left out.`, cut: true };
}

function timeOf(g: Group): string {
  return readableTime(g.head?.time ?? "") ?? readableTime(g.id) ?? JSON.stringify(g.id);
}

function newGroup(groups: Map<string, Group>, id: string): Group {
  const g: Group = {
    id,
    lines: [],
    cells: [],
    head: null,
    end: null,
    trouble: null,
    cut: false,
    last: false,
  };
  groups.set(id, g);
  return g;
}

function byTime(a: Group, b: Group): number {
  const ta = a.head!.time, tb = b.head!.time;
  return ta < tb ? -1 : ta > tb ? 1 : a.id < b.id ? -1 : a.id > b.id ? 1 : 0;
}

/**
 * Lines of the file, blank ones left out; a `\r` before the `\n` is not part
 * of a line. `cutNo` is the last line's number when no line break ends it.
 */
function splitLines(bytes: Uint8Array): { lines: Line[]; cutNo: number } {
  const lines: Line[] = [];
  let cutNo = 0;
  let start = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? 3 : 0;
  for (let no = 1; start < bytes.length; no++) {
    const nl = bytes.indexOf(10, start);
    const stop = nl < 0 ? bytes.length : nl;
    const end = stop > start && bytes[stop - 1] === 13 ? stop - 1 : stop;
    if (!isBlank(bytes, start, end)) {
      lines.push({ no, start, end });
      if (nl < 0) cutNo = no;
    }
    start = stop + 1;
  }
  return { lines, cutNo };
}

function isBlank(bytes: Uint8Array, start: number, end: number): boolean {
  for (let i = start; i < end; i++) {
    if (bytes[i] !== 32 && bytes[i] !== 9 && bytes[i] !== 13) return false;
  }
  return true;
}

function parseLine(bytes: Uint8Array, line: Line): unknown {
  try {
    return JSON.parse(decoder.decode(bytes.subarray(line.start, line.end)));
  } catch {
    return NOT_JSON;
  }
}

/** Whether the same bytes came earlier for this record (merged histories repeat lines). */
function isDuplicate(
  bytes: Uint8Array,
  seen: Map<string, Line[]>,
  line: Line,
  prefix: string,
): boolean {
  const key = `${line.end - line.start}\u0000${prefix}`;
  const earlier = seen.get(key);
  if (!earlier) {
    seen.set(key, [line]);
    return false;
  }
  if (earlier.some((e) => sameRange(bytes, e, line))) return true;
  earlier.push(line);
  return false;
}

function sameRange(bytes: Uint8Array, a: Line, b: Line): boolean {
  const n = a.end - a.start;
  if (n !== b.end - b.start) return false;
  for (let i = 0; i < n; i++) if (bytes[a.start + i] !== bytes[b.start + i]) return false;
  return true;
}
