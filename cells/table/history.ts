/**
 * The table's face in the run history: what a record keeps of a table and
 * what changed between two records: rows added, removed or changed by their
 * content (not only counts), exclusions, columns, units and the source.
 *
 * ```
 *  keep:    used rows ─hash of the source columns' values─▶ 8 hex digits a row   (≤ 20,000 rows)
 *           blocks of 1,000 rows ─▶ 8 hex digits a block                         (more rows)
 *           all used rows in order ─▶ one content hash
 *  changes: rows by content (_history_rows.ts), then exclusions, columns, units
 * ```
 *
 * A 32-bit hash a row: a changed row passes for unchanged only when its new
 * content hashes like its old (odds 2⁻³² a row). Derived columns are left out
 * of the hash: a new or edited `derive` changes no row, and the fits that use
 * it report their own changes.
 *
 * @module
 */
import type { Change, ChangeContext, HistoryFace } from "../../kernel/contract/mod.ts";
import type { TableOutput } from "./run.ts";
import type { TableSpec } from "./spec.ts";
import type { TableResult } from "./summary.ts";
import { rowsInWords, toRuns } from "../shared/row_list.ts";
import {
  BLOCK_ROWS,
  blockHashes,
  hashOfRows,
  hex8,
  ROW_HASH,
  ROW_HASHES_UP_TO,
  rowChanges,
  rowHashes,
} from "./_history_rows.ts";

export { BLOCK_ROWS, LISTED_ROWS, ROW_HASHES_UP_TO } from "./_history_rows.ts";

/** What a record keeps of a table. */
export interface TableKept {
  source: string | null;
  sha256: string | null;
  rows_read: number;
  rows_used: number;
  excluded: { row: number; why: string }[];
  columns: { name: string; type: string; unit: string | null }[];
  /** Source row numbers of the used rows, as inclusive runs. */
  row_runs: [number, number][];
  /** The row fingerprint's method ({@link ROW_HASH}); records without it hashed rows otherwise. */
  hash: string;
  /** The columns the row hashes cover, in order: those read from the source. */
  hashed: string[];
  /** 8 hex digits over every used row's hash, in order. */
  content: string;
  /** 8 hex digits a used row, in order (up to {@link ROW_HASHES_UP_TO} rows), else null. */
  row_hashes: string | null;
  /** 8 hex digits a block of {@link BLOCK_ROWS} used rows (larger tables), else null. */
  block_hashes: string | null;
}

/**
 * What a record keeps of a table.
 *
 * @param out The table.
 * @param spec Its spec (its derived columns are left out of the row hashes).
 * @param result Its RUN-JSON result.
 * @returns The kept value.
 */
function keep(out: TableOutput, spec: TableSpec, result: TableResult): TableKept {
  const derived = new Set(spec.derive.map((d) => d.name));
  const read = out.columns.filter((c) => !derived.has(c.name));
  const n = out.rows.length;
  const h = rowHashes(read, n);
  let rows = "";
  if (n <= ROW_HASHES_UP_TO) { for (let i = 0; i < n; i++) rows += hex8(h[i]); }
  return {
    source: out.source,
    sha256: out.sha256,
    rows_read: out.rowsRead,
    rows_used: n,
    excluded: out.excluded.map((e) => ({ row: e.row, why: e.why })),
    columns: result.columns.map((c) => ({ name: c.name, type: c.type, unit: c.unit })),
    row_runs: toRuns(out.rows),
    hash: ROW_HASH,
    hashed: read.map((c) => c.name),
    content: hex8(hashOfRows(h, 0, n)),
    row_hashes: n <= ROW_HASHES_UP_TO ? rows : null,
    block_hashes: n <= ROW_HASHES_UP_TO ? null : blockHashes(h, BLOCK_ROWS),
  };
}

const isObject = (x: unknown): x is Record<string, unknown> =>
  typeof x === "object" && x !== null && !Array.isArray(x);

/** A record's exclusions by row (an older or damaged record: the readable ones). */
function exclusions(k: Partial<TableKept>): Map<number, string> {
  const list = Array.isArray(k.excluded) ? k.excluded : [];
  return new Map(
    list.filter((e) => isObject(e) && Number.isInteger(e.row)).map((e) => [e.row, String(e.why)]),
  );
}

/** A record's columns by name. */
function columnsOf(k: Partial<TableKept>): Map<string, { unit: string | null }> {
  const list = Array.isArray(k.columns) ? k.columns : [];
  return new Map(
    list.filter((c) => isObject(c) && typeof c.name === "string").map((c) => [c.name, c]),
  );
}

function exclusionChanges(cell: string, exA: Map<number, string>, exB: Map<number, string>) {
  const out: Change[] = [];
  const newlyOut = [...exB.keys()].filter((r) => !exA.has(r)).sort((x, y) => x - y);
  const backIn = [...exA.keys()].filter((r) => !exB.has(r)).sort((x, y) => x - y);
  if (newlyOut.length > 0) {
    const why = [...new Set(newlyOut.map((r) => exB.get(r)))];
    out.push({
      code: "exclusions-added",
      weight: "notable",
      sentence: `${cell}: ${rowsInWords(newlyOut)} now excluded (${why.join("; ")}).`,
      numbers: { rows: newlyOut, why: newlyOut.map((r) => exB.get(r)) },
    });
  }
  if (backIn.length > 0) {
    out.push({
      code: "exclusions-removed",
      weight: "notable",
      sentence: `${cell}: ${rowsInWords(backIn)} no longer excluded.`,
      numbers: { rows: backIn },
    });
  }
  return out;
}

function columnChanges(cell: string, a: Partial<TableKept>, b: Partial<TableKept>): Change[] {
  if (!Array.isArray(a.columns) || !Array.isArray(b.columns)) return [];
  const out: Change[] = [];
  const cA = columnsOf(a), cB = columnsOf(b);
  const added = [...cB.keys()].filter((c) => !cA.has(c));
  const gone = [...cA.keys()].filter((c) => !cB.has(c));
  if (added.length + gone.length > 0) {
    const parts = [
      ...(added.length ? [`new column${added.length > 1 ? "s" : ""} ${added.join(", ")}`] : []),
      ...(gone.length ? [`column${gone.length > 1 ? "s" : ""} ${gone.join(", ")} gone`] : []),
    ];
    out.push({
      code: "columns-changed",
      weight: "minor",
      sentence: `${cell}: ${parts.join("; ")}.`,
      numbers: { added, removed: gone },
    });
  }
  for (const [name, c] of cB) {
    const was = cA.get(name);
    if (!was || !("unit" in was) || !("unit" in c) || (was.unit ?? null) === (c.unit ?? null)) {
      continue;
    }
    out.push({
      code: "unit-changed",
      weight: "notable",
      sentence: `${cell}: the unit of ${name} is now ${c.unit ?? "none"} (was ${
        was.unit ?? "none"
      }).`,
      numbers: { column: name, before: was.unit ?? null, after: c.unit ?? null },
    });
  }
  return out;
}

/**
 * What changed in a table between two records. Fields an older record lacks
 * leave their comparison out; nothing here throws on them.
 *
 * @param a The earlier kept value.
 * @param b The newer kept value.
 * @param ctx The cell.
 * @returns Sentences with their numbers; `rows-*` changes carry their row changes.
 */
function changes(a: TableKept, b: TableKept, ctx: ChangeContext): Change[] {
  if (!isObject(a) || !isObject(b)) return [];
  const cell = ctx.cell;
  const out: Change[] = [];
  if (typeof a.source === "string" && typeof b.source === "string" && a.source !== b.source) {
    out.push({
      code: "source-changed",
      weight: "notable",
      sentence: `${cell} now reads ${b.source} (was ${a.source}).`,
      numbers: { before: a.source, after: b.source },
    });
  }
  const known = Array.isArray(a.excluded) && Array.isArray(b.excluded);
  const exA = exclusions(a), exB = exclusions(b);
  const newlyOut = new Set(known ? [...exB.keys()].filter((r) => !exA.has(r)) : []);
  out.push(...rowChanges(cell, a, b, newlyOut));
  if (known) out.push(...exclusionChanges(cell, exA, exB));
  out.push(...columnChanges(cell, a, b));
  return out;
}

/** The table's history face. */
export const tableHistory: HistoryFace<TableSpec, TableOutput, TableResult, TableKept> = {
  keep,
  changes,
};
