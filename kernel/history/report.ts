/**
 * The change report between two records of a document's run history: which
 * two (the previous data revision by default, or any record by time or hash),
 * what each kind says changed in its cells (`history.changes` of its compute
 * face), cells that appeared, went or changed state, and the values drawn over
 * every record (`history.trend`).
 *
 * ```
 *  records (oldest first) ──pick──▶ from, to
 *  per cell of `to` (then cells only in `from`):
 *     both current, same kind ──▶ kind.history.changes(from.kept, to.kept, ctx)
 *                                   ctx.rows = Σ `rows` of the changes of the tables it reads
 *     state changed            ──▶ one notable sentence
 *  sentences: notable first, then minor, each in document order
 * ```
 *
 * @module
 */
import type { Change, Registry, RowChanges } from "../contract/mod.ts";
import type {
  CellChanges,
  ChangeReport,
  FileChange,
  HistoryRead,
  HistoryRecord,
  RecordedCell,
  Trend,
} from "./types.ts";
import { sameData } from "./record.ts";

/**
 * Changes that decide what a reader does next, put before the other notable
 * ones: the preferred model changed, a cell stopped or started computing.
 */
const LEADING = new Set(["preferred-changed", "cell-stopped", "cell-recovered"]);

/** Which two records to compare. */
export interface ReportChoice {
  /**
   * The older record: a record id (or its start), a SHA-256 start (6 or more
   * hex digits) of the document or of a data file, or a time (ISO 8601, a date
   * alone meaning its start, UTC): the newest record at or before it.
   * Default: the previous data revision.
   */
  since?: string;
  /** The newer record, written as `since` is; default the newest. */
  until?: string;
}

/** A record that could not be picked, in words. */
export class ChoiceError extends Error {}

/**
 * The change report between two records of a history.
 *
 * @param history The history as read.
 * @param registry The kinds (their history faces).
 * @param path The history file's path (for the report).
 * @param choice Which records (default: the newest against the previous data revision).
 * @param inputsOf The cells a cell reads directly (from the current document); without
 *   it every table's row changes count for every cell.
 * @returns The report, or null when the history holds fewer than two records.
 * @throws ChoiceError when `since` or `until` names no record.
 */
export function changeReport(
  history: HistoryRead,
  registry: Registry,
  path: string,
  choice: ReportChoice = {},
  inputsOf?: (cell: string) => readonly string[],
): ChangeReport | null {
  const records = history.records;
  if (records.length < 2 && choice.since === undefined) return null;
  if (records.length === 0) throw new ChoiceError("The run history holds no records yet");
  const to = choice.until === undefined ? records[records.length - 1] : pick(records, choice.until);
  const before = records.filter((r) =>
    r.time < to.time || (r.time === to.time && r.record < to.record)
  );
  let from: HistoryRecord;
  let baseline: string;
  if (choice.since !== undefined) {
    from = pick(records, choice.since);
    baseline = "asked for";
  } else {
    if (before.length === 0) return null;
    const revision = [...before].reverse().find((r) => !sameData(r, to));
    from = revision ?? before[before.length - 1];
    baseline = revision ? "previous data revision" : "previous record";
  }
  const cells = compareCells(from, to, registry, inputsOf);
  const all = cells.flatMap((c) => c.changes);
  return {
    from: { record: from.record, time: from.time },
    to: { record: to.record, time: to.time },
    baseline,
    document_changed: from.document.sha256 !== to.document.sha256,
    files: fileChanges(from, to),
    sentences: [
      ...all.filter((c) => c.weight === "notable" && LEADING.has(c.code)).map((c) => c.sentence),
      ...all.filter((c) => c.weight === "notable" && !LEADING.has(c.code)).map((c) => c.sentence),
      ...all.filter((c) => c.weight !== "notable").map((c) => c.sentence),
    ],
    cells,
    cells_added: to.cells.filter((c) => !cellIn(from, c)).map((c) => c.name),
    cells_removed: from.cells.filter((c) => !cellIn(to, c)).map((c) => c.name),
    trends: trends(records.filter((r) => r.time <= to.time), to, registry),
    history: { path, records: records.length, problems: history.problems },
  };
}

/** A record named by id, hash or time. */
function pick(records: readonly HistoryRecord[], what: string): HistoryRecord {
  const w = what.trim();
  const byId = records.filter((r) => r.record.startsWith(w));
  if (byId.length === 1) return byId[0];
  if (/^[0-9a-f]{6,64}$/i.test(w)) {
    const h = w.toLowerCase();
    const hit = [...records].reverse().find((r) =>
      r.record.endsWith(h) || r.document.sha256.startsWith(h) ||
      r.files.some((f) => f.sha256.startsWith(h))
    );
    if (hit) return hit;
    throw new ChoiceError(`No record of the run history has a hash starting "${w}"`);
  }
  const t = Date.parse(/^\d{4}-\d{2}-\d{2}$/.test(w) ? `${w}T00:00:00Z` : w);
  if (Number.isNaN(t)) {
    throw new ChoiceError(
      `"${w}" is neither a time (such as 2026-12-01 or 2026-12-01T08:00Z) nor a record or hash`,
    );
  }
  const at = new Date(t).toISOString();
  const hit = [...records].reverse().find((r) => r.time <= at);
  if (hit) return hit;
  throw new ChoiceError(
    `The run history begins after ${at} (its first record is of ${records[0].time})`,
  );
}

function cellIn(record: HistoryRecord, cell: RecordedCell): boolean {
  return record.cells.some((c) => c.name === cell.name && c.kind === cell.kind);
}

function fileChanges(from: HistoryRecord, to: HistoryRecord): FileChange[] {
  const before = new Map(from.files.map((f) => [f.path, f]));
  const after = new Map(to.files.map((f) => [f.path, f]));
  const out: FileChange[] = [];
  for (const path of new Set([...after.keys(), ...before.keys()])) {
    const a = before.get(path), b = after.get(path);
    if (a?.sha256 === b?.sha256) continue;
    out.push({
      path,
      before: a?.sha256 ?? null,
      after: b?.sha256 ?? null,
      lines_before: a?.lines ?? null,
      lines_after: b?.lines ?? null,
    });
  }
  return out;
}

/** Each cell's changes, tables (and whatever reports rows) before their readers. */
function compareCells(
  from: HistoryRecord,
  to: HistoryRecord,
  registry: Registry,
  inputsOf?: (cell: string) => readonly string[],
): CellChanges[] {
  const older = new Map(from.cells.map((c) => [c.name, c]));
  const rowsOf = new Map<string, RowChanges>();
  const found = new Map<string, CellChanges>();
  // Records keep cells in document order, where a cell comes after what it reads.
  for (const cell of to.cells) {
    const was = older.get(cell.name);
    const entry: CellChanges = {
      name: cell.name,
      kind: cell.kind,
      state_before: was && was.kind === cell.kind ? was.state : null,
      state_after: cell.state,
      changes: [],
    };
    found.set(cell.name, entry);
    if (!was || was.kind !== cell.kind) {
      entry.changes.push(sentence(
        "cell-added",
        "minor",
        `${cell.kind} ${cell.name} is new since the earlier run.`,
      ));
      continue;
    }
    if (was.state !== cell.state) {
      entry.changes.push(stateChange(cell, was.state));
      continue;
    }
    const face = registry.get(cell.kind)?.history;
    if (cell.state !== "current" || !face || was.kept == null || cell.kept == null) continue;
    const rows = rowsFor(cell.name, rowsOf, inputsOf);
    try {
      entry.changes.push(
        ...face.changes(was.kept, cell.kept, { cell: cell.name, level: to.level, rows }),
      );
    } catch (err) {
      entry.changes.push(sentence(
        "not-compared",
        "minor",
        `${cell.kind} ${cell.name} could not be compared with the earlier run: ${
          (err as Error).message
        }`,
      ));
    }
    const own = sumRows(entry.changes.map((c) => c.rows));
    if (own) rowsOf.set(cell.name, own);
  }
  for (const was of from.cells) {
    if (to.cells.some((c) => c.name === was.name && c.kind === was.kind)) continue;
    found.set(`${was.name}\u0000gone`, {
      name: was.name,
      kind: was.kind,
      state_before: was.state,
      state_after: null,
      changes: [
        sentence("cell-removed", "minor", `${was.kind} ${was.name} is no longer in the document.`),
      ],
    });
  }
  return [...found.values()];
}

/** The row changes of the tables a cell reads, directly or through other cells. */
function rowsFor(
  cell: string,
  rowsOf: ReadonlyMap<string, RowChanges>,
  inputsOf?: (cell: string) => readonly string[],
): RowChanges | null {
  if (!inputsOf) return sumRows([...rowsOf.values()]);
  const seen = new Set<string>();
  const stack = [...inputsOf(cell)];
  while (stack.length > 0) {
    const c = stack.pop()!;
    if (seen.has(c)) continue;
    seen.add(c);
    stack.push(...inputsOf(c));
  }
  return sumRows([...seen].map((c) => rowsOf.get(c)));
}

function sumRows(list: readonly (RowChanges | undefined)[]): RowChanges | null {
  let out: RowChanges | null = null;
  for (const r of list) {
    if (!r) continue;
    out ??= { added: 0, removed: 0, changed: 0 };
    out.added += r.added;
    out.removed += r.removed;
    out.changed += r.changed;
  }
  return out;
}

const STATE_WORDS: Record<RecordedCell["state"], string> = {
  current: "computed",
  failed: "failed",
  held: "held (an input failed)",
};

function stateChange(cell: RecordedCell, before: RecordedCell["state"]): Change {
  return sentence(
    cell.state === "current" ? "cell-recovered" : "cell-stopped",
    "notable",
    `${cell.kind} ${cell.name} is now ${STATE_WORDS[cell.state]}; in the earlier run it ${
      before === "current" ? "was computed" : `was ${STATE_WORDS[before]}`
    }.`,
    { before, after: cell.state },
  );
}

function sentence(
  code: string,
  weight: Change["weight"],
  text: string,
  numbers: Record<string, unknown> = {},
): Change {
  return { code, weight, sentence: text, numbers };
}

/** Each drawn series over the records up to `to`, for the cells `to` holds. */
function trends(records: readonly HistoryRecord[], to: HistoryRecord, registry: Registry): Trend[] {
  const out = new Map<string, Trend>();
  for (const want of to.cells) {
    const face = registry.get(want.kind)?.history;
    if (!face?.trend) continue;
    for (const r of records) {
      const cell = r.cells.find((c) => c.name === want.name && c.kind === want.kind);
      if (!cell || cell.state !== "current" || cell.kept == null) continue;
      let samples;
      try {
        samples = face.trend(cell.kept);
      } catch {
        continue; // an older record this kind cannot read: no point, nothing else lost
      }
      for (const s of samples) {
        const id = `${want.name}\u0000${s.series}`;
        let t = out.get(id);
        if (!t) out.set(id, t = { cell: want.name, series: s.series, unit: s.unit, points: [] });
        t.points.push({
          record: r.record,
          time: r.time,
          n: s.n,
          value: s.value,
          lower: s.lower,
          upper: s.upper,
        });
      }
    }
  }
  return [...out.values()];
}
