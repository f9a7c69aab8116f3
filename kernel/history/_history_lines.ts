/**
 * The lines of a run history record, written and recognised (format 1;
 * docs/history.md describes it):
 *
 * ```
 *  {"history":1,"record":ID,"time":…,"plumb":…,"document":{…},"files":[…],"level":…,"cells":N}
 *  {"record":ID,"cell":NAME,"kind":…,"state":…,"kept":…}      ← N lines, document order
 *  {"record":ID,"end":N+2}
 * ```
 *
 * Keys are written in this order whatever the order of the record object's
 * own keys, so the same record always gives the same bytes. Recognising a
 * line looks at its first bytes only (the record id and the key after it): a
 * cell line's `kept` can be hundreds of kilobytes, and only the reader of a
 * complete record needs it parsed.
 *
 * @module
 */
import type { HistoryRecord, RecordedCell, RecordedFile } from "./types.ts";

/** The format version this code writes and reads. */
export const FORMAT = 1;

/**
 * The record's lines, without line breaks.
 *
 * @param r The record.
 * @returns Head line, one line a cell, end line.
 */
export function recordLines(r: HistoryRecord): string[] {
  const head = JSON.stringify({
    history: FORMAT,
    record: r.record,
    time: r.time,
    plumb: r.plumb,
    document: { path: r.document.path, sha256: r.document.sha256 },
    files: r.files.map((f) => ({ path: f.path, sha256: f.sha256, bytes: f.bytes, lines: f.lines })),
    level: r.level,
    cells: r.cells.length,
  });
  const cells = r.cells.map((c) =>
    JSON.stringify({
      record: r.record,
      cell: c.name,
      kind: c.kind,
      state: c.state,
      kept: c.kept ?? null,
    })
  );
  return [head, ...cells, JSON.stringify({ record: r.record, end: r.cells.length + 2 })];
}

/** What a line's first bytes say it is. */
export type LineRole =
  | { role: "head"; id: string }
  | { role: "cell"; id: string }
  | { role: "end"; id: string; count: number }
  | { role: "other"; id: string };

// A JSON string token; record ids need no escapes, but a hand-edited one may have them.
const STR = String.raw`"(?:[^"\\]|\\.)*"`;
const HEAD = new RegExp(String.raw`^\{"history":\d+,"record":(${STR})`);
const CELL = new RegExp(String.raw`^\{"record":(${STR}),"cell":`);
const END = new RegExp(String.raw`^\{"record":(${STR}),"end":(\d+)\}\s*$`);

/**
 * A line's role and record id from its opening bytes, as this module writes
 * them; null when they are not ours (the caller then parses the whole line).
 *
 * @param prefix The line's first bytes, decoded (the whole line for short ones).
 * @returns The role, or null.
 */
export function roleOfPrefix(prefix: string): LineRole | null {
  let m = HEAD.exec(prefix);
  if (m) return { role: "head", id: JSON.parse(m[1]) };
  m = CELL.exec(prefix);
  if (m) return { role: "cell", id: JSON.parse(m[1]) };
  m = END.exec(prefix);
  if (m) return { role: "end", id: JSON.parse(m[1]), count: Number(m[2]) };
  return null;
}

const ID = new RegExp(String.raw`^\{(?:"history":\d+,)?"record":(${STR})`);

/**
 * The record id at the start of a line, even of a line cut short after it.
 *
 * @param prefix The line's first bytes, decoded.
 * @returns The id, or null.
 */
export function idOfPrefix(prefix: string): string | null {
  const m = ID.exec(prefix);
  return m ? JSON.parse(m[1]) : null;
}

/**
 * A parsed line's role: the slow way, for lines written otherwise (spaces, other key order).
 *
 * @param value The parsed line.
 * @returns The role, or null when the line names no record.
 */
export function roleOfValue(value: unknown): LineRole | null {
  if (!isObject(value) || typeof value.record !== "string") return null;
  const id = value.record;
  if ("history" in value) return { role: "head", id };
  if ("end" in value) {
    return Number.isInteger(value.end)
      ? { role: "end", id, count: value.end as number }
      : { role: "other", id };
  }
  return "cell" in value ? { role: "cell", id } : { role: "other", id };
}

/** A record's head line, checked: the record without its cells, its format and how many cells follow. */
export type Head = Omit<HistoryRecord, "cells"> & { version: number; cells: number };

/**
 * A parsed head line checked for shape; a newer format's head is accepted
 * with its version only (the caller leaves that record out and says why).
 *
 * @param v The parsed line.
 * @returns The head, or a phrase on what is wrong.
 */
export function checkHead(v: unknown): Head | string {
  if (!isObject(v)) return "it is not a JSON object";
  const version = v.history;
  if (typeof version !== "number" || !Number.isInteger(version) || version < 1) {
    return `"history" is not a format number`;
  }
  const bad = version > FORMAT ? null : headTrouble(v);
  if (bad) return bad;
  return {
    version,
    record: v.record as string,
    time: v.time as string,
    plumb: v.plumb as string,
    document: v.document as Head["document"],
    files: v.files as RecordedFile[],
    level: v.level as number,
    cells: v.cells as number,
  };
}

function headTrouble(v: Record<string, unknown>): string | null {
  for (const key of ["record", "time", "plumb"]) {
    if (typeof v[key] !== "string") return `"${key}" is not text`;
  }
  const doc = v.document;
  if (!isObject(doc) || typeof doc.path !== "string" || typeof doc.sha256 !== "string") {
    return `"document" is not a path and a SHA-256`;
  }
  if (!Array.isArray(v.files) || !v.files.every(isRecordedFile)) {
    return `"files" is not a list of files with path, SHA-256, bytes and lines`;
  }
  if (typeof v.level !== "number") return `"level" is not a number`;
  if (!Number.isInteger(v.cells) || (v.cells as number) < 0) return `"cells" is not a count`;
  return null;
}

function isRecordedFile(f: unknown): boolean {
  return isObject(f) && typeof f.path === "string" && typeof f.sha256 === "string" &&
    typeof f.bytes === "number" && typeof f.lines === "number";
}

const STATES: readonly string[] = ["current", "failed", "held"];

/**
 * A parsed cell line checked for shape.
 *
 * @param v The parsed line.
 * @returns The cell, or a phrase on what is wrong.
 */
export function checkCell(v: unknown): RecordedCell | string {
  if (!isObject(v)) return "it is not a JSON object";
  if (typeof v.cell !== "string") return `"cell" is not a name`;
  if (typeof v.kind !== "string") return `"kind" is not text`;
  if (typeof v.state !== "string" || !STATES.includes(v.state)) {
    return `"state" is not one of current, failed, held`;
  }
  if (!("kept" in v)) return `"kept" is missing`;
  return { name: v.cell, kind: v.kind, state: v.state as RecordedCell["state"], kept: v.kept };
}

/**
 * A record's time as people read it: `2026-12-04 18:55:02 UTC`.
 *
 * @param time ISO 8601 UTC, or a record id starting with one.
 * @returns The readable time, or null when `time` does not start with one.
 */
export function readableTime(time: string): string | null {
  const m = /^(\d{4}-\d{2}-\d{2})T(\d{2}:\d{2}:\d{2})(?:\.\d+)?Z/.exec(time);
  return m ? `${m[1]} ${m[2]} UTC` : null;
}

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}
