/**
 * Gathers a record's input from a run: the document's blocks and hash, each
 * data file the tables read (path from the table's result, SHA-256 of the
 * bytes as read, rows read and used), the software and the time.
 *
 * The time is the run's, or `SOURCE_DATE_EPOCH` (seconds since 1970, UTC)
 * when that is set, the reproducible-builds convention
 * (https://reproducible-builds.org/specs/source-date-epoch/): the record is
 * then the same bytes on every export of the same inputs, so the run's
 * duration is left out too.
 *
 * @module
 */
import { parseDocument } from "../../kernel/document/mod.ts";
import { sha256Hex } from "../../kernel/hash.ts";
import { VERSION } from "../../kernel/version.ts";
import type { RunReport } from "../../kernel/session/types.ts";
import type { RunFacts } from "../../kernel/server/record_route.ts";

export type { RunFacts };
import type { RecordFile, RecordInput } from "./types.ts";

interface TableResult {
  source?: string | null;
  sha256?: string | null;
  rows_read?: number;
  rows_used?: number;
  excluded?: unknown[];
}

function filesOf(report: RunReport): RecordFile[] {
  const byPath = new Map<string, RecordFile>();
  for (const c of report.cells) {
    if (c.kind !== "table" || c.state !== "current") continue;
    const r = c.result as TableResult;
    if (typeof r.source !== "string") continue;
    const f = byPath.get(r.source) ?? { path: r.source, sha256: r.sha256 ?? null, tables: [] };
    f.tables.push({
      cell: c.name,
      rowsRead: r.rows_read ?? 0,
      rowsUsed: r.rows_used ?? 0,
      excluded: r.excluded?.length ?? 0,
    });
    byPath.set(r.source, f);
  }
  return [...byPath.values()];
}

/**
 * The time of the record, ISO 8601 UTC to the second.
 *
 * @param startedMs When the run started.
 * @param epoch `SOURCE_DATE_EPOCH`, if set.
 * @returns The time and whether it was fixed by the epoch.
 * @throws {RangeError} For an epoch that is not a whole number of seconds.
 * @example
 * ```ts
 * import { recordTime } from "./gather.ts";
 * if (recordTime(0, "86400").utc !== "1970-01-02T00:00:00Z") throw new Error("one day");
 * ```
 */
export function recordTime(startedMs: number, epoch?: string): { utc: string; fixed: boolean } {
  const fixed = epoch !== undefined && epoch !== "";
  if (fixed && !/^\d+$/.test(epoch!)) {
    throw new RangeError(
      `SOURCE_DATE_EPOCH must be a whole number of seconds since 1970: got "${epoch}"`,
    );
  }
  const ms = fixed ? Number(epoch) * 1000 : startedMs;
  return { utc: new Date(ms).toISOString().replace(/\.\d{3}Z$/, "Z"), fixed };
}

/**
 * The record's input from a run.
 *
 * @param facts The document, the run's report and its time.
 * @returns The input of `renderRecord`.
 */
export async function gatherRecord(facts: RunFacts): Promise<RecordInput> {
  const doc = parseDocument(facts.source);
  const time = recordTime(facts.startedMs, facts.sourceDateEpoch);
  return {
    title: facts.report.settings.title,
    document: {
      path: facts.path,
      sha256: await sha256Hex(facts.bytes),
      bytes: facts.bytes.length,
    },
    blocks: doc.blocks.map((b) =>
      b.type === "prose"
        ? { type: "prose", line: b.line, text: b.text }
        : { type: "cell", name: b.name, kind: b.kind, line: b.line, body: b.body }
    ),
    cells: facts.report.cells,
    errors: facts.report.errors,
    files: filesOf(facts.report),
    settings: facts.report.settings,
    versions: {
      plumb: VERSION,
      deno: Deno.version.deno,
      v8: Deno.version.v8,
      os: `${Deno.build.os} ${Deno.build.arch}`,
    },
    run: { utc: time.utc, ms: time.fixed ? null : facts.durationMs, reproducible: time.fixed },
    changes: facts.changes ?? null,
  };
}
