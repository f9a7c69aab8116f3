/**
 * The table's face in the run history: what a record keeps of a table and
 * which rows changed between two records, by row content, not only counts.
 *
 * ```
 *  keep:    each used row ─FNV-1a over its values' bits─▶ 8 hex digits   (≤ 20,000 rows)
 *           blocks of 1,000 rows ─▶ one hash each                         (more rows)
 *  changes: multiset of old hashes − multiset of new ─▶ removed / added
 *           a removed and an added row at the same source row number ─▶ changed
 * ```
 *
 * A 32-bit hash a row: a changed row passes for unchanged only when its new
 * content hashes like its old (odds 2⁻³² a row).
 *
 * @module
 */
import type { Change, HistoryFace, RowChanges } from "../../kernel/contract/mod.ts";
import type { TableOutput } from "./run.ts";
import type { TableSpec } from "./spec.ts";
import type { TableResult } from "./summary.ts";
import { fromRuns, rowsInWords, toRuns } from "../shared/row_list.ts";

/** Tables up to this many used rows keep a hash of every row. */
export const ROW_HASHES_UP_TO = 20_000;
/** Larger tables keep a hash of each block of this many rows. */
export const BLOCK_ROWS = 1_000;

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
  /** 8 hex digits a used row, in order (up to {@link ROW_HASHES_UP_TO} rows), else null. */
  row_hashes: string | null;
  /** 8 hex digits a block of {@link BLOCK_ROWS} used rows (larger tables), else null. */
  block_hashes: string | null;
}

const f64 = new Float64Array(1);
const u32 = new Uint32Array(f64.buffer);

function mix(h: number, x: number): number {
  return Math.imul(h ^ x, 0x01000193) >>> 0;
}

/** One hash per used row, over every column's value (FNV-1a, 32 bits). */
function rowHashes(out: TableOutput): Uint32Array {
  const n = out.rows.length;
  const h = new Uint32Array(n).fill(0x811c9dc5);
  for (const c of out.columns) {
    if (c.type === "number") {
      const v = c.values;
      for (let i = 0; i < n; i++) {
        f64[0] = v[i];
        h[i] = mix(mix(h[i], u32[0]), u32[1]);
      }
    } else {
      for (let i = 0; i < n; i++) {
        const s = c.values[i];
        let x = s === null ? 0xfffffffe : mix(h[i], 0x1f);
        if (s !== null) { for (let k = 0; k < s.length; k++) x = mix(x, s.charCodeAt(k)); }
        h[i] = mix(x, 0x1e);
      }
    }
  }
  return h;
}

const hex8 = (x: number) => x.toString(16).padStart(8, "0");

function blockHashes(h: Uint32Array): string {
  let out = "";
  for (let b = 0; b < h.length; b += BLOCK_ROWS) {
    let x = 0x811c9dc5;
    for (let i = b; i < Math.min(h.length, b + BLOCK_ROWS); i++) x = mix(x, h[i]);
    out += hex8(x);
  }
  return out;
}

function splitHex(s: string | null | undefined): string[] | null {
  if (typeof s !== "string") return null;
  const out: string[] = [];
  for (let i = 0; i + 8 <= s.length; i += 8) out.push(s.slice(i, i + 8));
  return out;
}

/**
 * What a record keeps of a table.
 *
 * @param out The table.
 * @param _spec Its spec.
 * @param result Its RUN-JSON result.
 * @returns The kept value.
 */
function keep(out: TableOutput, _spec: TableSpec, result: TableResult): TableKept {
  const h = rowHashes(out);
  const small = h.length <= ROW_HASHES_UP_TO;
  let rows = "";
  if (small) { for (let i = 0; i < h.length; i++) rows += hex8(h[i]); }
  return {
    source: out.source,
    sha256: out.sha256,
    rows_read: out.rowsRead,
    rows_used: out.rows.length,
    excluded: out.excluded.map((e) => ({ row: e.row, why: e.why })),
    columns: result.columns.map((c) => ({ name: c.name, type: c.type, unit: c.unit })),
    row_runs: toRuns(out.rows),
    row_hashes: small ? rows : null,
    block_hashes: small ? null : blockHashes(h),
  };
}

function change(
  code: string,
  weight: Change["weight"],
  sentence: string,
  numbers: Record<string, unknown>,
  rows?: RowChanges,
): Change {
  return { code, weight, sentence, numbers, ...(rows ? { rows } : {}) };
}

/** Added, removed and changed rows by content (both records keep row hashes). */
function byRows(cell: string, a: TableKept, b: TableKept): Change[] {
  const oldH = splitHex(a.row_hashes)!, newH = splitHex(b.row_hashes)!;
  const oldRows = fromRuns(a.row_runs), newRows = fromRuns(b.row_runs);
  if (oldH.length !== oldRows.length || newH.length !== newRows.length) return [];
  const pool = new Map<string, number[]>();
  oldH.forEach((h, i) => {
    const list = pool.get(h);
    if (list) list.push(oldRows[i]);
    else pool.set(h, [oldRows[i]]);
  });
  const fresh: number[] = [];
  newH.forEach((h, i) => {
    const list = pool.get(h);
    if (list && list.length > 0) list.shift();
    else fresh.push(newRows[i]);
  });
  const gone = [...pool.values()].flat().sort((x, y) => x - y);
  const goneSet = new Set(gone);
  const changed = fresh.filter((r) => goneSet.has(r));
  const changedSet = new Set(changed);
  const added = fresh.filter((r) => !changedSet.has(r));
  const removed = gone.filter((r) => !changedSet.has(r));
  const rows = { added: added.length, removed: removed.length, changed: changed.length };
  const listed = (list: number[]) => ({ count: list.length, rows: list.slice(0, 50) });
  const out: Change[] = [];
  if (added.length > 0) {
    out.push(change(
      "rows-added",
      "notable",
      `${cell}: ${added.length} ${added.length === 1 ? "row" : "rows"} added (${
        rowsInWords(added)
      }).`,
      listed(added),
      rows,
    ));
  }
  if (removed.length > 0) {
    out.push(change(
      "rows-removed",
      "notable",
      `${cell}: ${removed.length} ${
        removed.length === 1 ? "row" : "rows"
      } gone since the earlier run (${rowsInWords(removed)} of the earlier table).`,
      listed(removed),
      added.length > 0 ? undefined : rows,
    ));
  }
  if (changed.length > 0) {
    out.push(change(
      "rows-changed",
      "notable",
      `${cell}: ${changed.length} ${changed.length === 1 ? "row" : "rows"} changed in place (${
        rowsInWords(changed)
      }).`,
      listed(changed),
      added.length + removed.length > 0 ? undefined : rows,
    ));
  }
  return out;
}

/** Rows compared by blocks (a large table on either side). */
function byBlocks(cell: string, a: TableKept, b: TableKept): Change[] {
  const oldB = splitHex(a.block_hashes), newB = splitHex(b.block_hashes);
  const na = a.rows_used, nb = b.rows_used;
  let same = 0;
  if (oldB && newB) {
    while (same < oldB.length && same < newB.length && oldB[same] === newB[same]) same++;
  }
  const fullOld = Math.floor(na / BLOCK_ROWS);
  const unchangedUpTo = Math.min(same * BLOCK_ROWS, na, nb);
  const note = `compared by blocks of ${BLOCK_ROWS.toLocaleString("en")} rows`;
  if (same >= fullOld && nb >= na) {
    if (nb === na && a.sha256 === b.sha256) return [];
    const added = nb - na;
    if (added === 0) return [];
    return [change(
      "rows-added",
      "notable",
      `${cell}: ${added.toLocaleString("en")} rows added after the first ${
        na.toLocaleString("en")
      } (${note}).`,
      { count: added, after: na, compared: "blocks" },
      { added, removed: 0, changed: 0 },
    )];
  }
  const changed = Math.max(0, Math.min(na, nb) - unchangedUpTo);
  const rows = { added: Math.max(0, nb - na), removed: Math.max(0, na - nb), changed };
  return [change(
    "rows-changed",
    "notable",
    `${cell}: the content differs from used row ${
      (unchangedUpTo + 1).toLocaleString("en")
    } on (${note}); ${na.toLocaleString("en")} → ${nb.toLocaleString("en")} rows.`,
    { from_row: unchangedUpTo + 1, rows_before: na, rows_after: nb, compared: "blocks" },
    rows,
  )];
}

/**
 * What changed in a table between two records.
 *
 * @param a The earlier kept value.
 * @param b The newer kept value.
 * @param ctx The cell.
 * @returns Sentences with their numbers; row changes carry `rows`.
 */
function changes(a: TableKept, b: TableKept, ctx: { cell: string }): Change[] {
  const cell = ctx.cell;
  const out: Change[] = [];
  if (typeof a?.rows_used !== "number" || typeof b?.rows_used !== "number") return out;
  if (a.source !== b.source && a.source && b.source) {
    out.push(
      change("source-changed", "notable", `${cell} now reads ${b.source} (was ${a.source}).`, {
        before: a.source,
        after: b.source,
      }),
    );
  }
  if (typeof a.row_hashes === "string" && typeof b.row_hashes === "string") {
    out.push(...byRows(cell, a, b));
  } else if (a.row_hashes !== undefined && b.row_hashes !== undefined) {
    out.push(...byBlocks(cell, a, b));
  }
  const ex = (k: TableKept) => new Map((k.excluded ?? []).map((e) => [e.row, e.why]));
  const exA = ex(a), exB = ex(b);
  const newlyOut = [...exB.keys()].filter((r) => !exA.has(r));
  const backIn = [...exA.keys()].filter((r) => !exB.has(r));
  if (newlyOut.length > 0) {
    out.push(change(
      "exclusions-added",
      "notable",
      `${cell}: ${rowsInWords(newlyOut)} now excluded (${
        newlyOut.map((r) => exB.get(r)).join("; ")
      }).`,
      { rows: newlyOut },
    ));
  }
  if (backIn.length > 0) {
    out.push(
      change(
        "exclusions-removed",
        "notable",
        `${cell}: ${rowsInWords(backIn)} no longer excluded.`,
        {
          rows: backIn,
        },
      ),
    );
  }
  const cols = (k: TableKept) => new Map((k.columns ?? []).map((c) => [c.name, c]));
  const cA = cols(a), cB = cols(b);
  const addedCols = [...cB.keys()].filter((c) => !cA.has(c));
  const goneCols = [...cA.keys()].filter((c) => !cB.has(c));
  if (addedCols.length + goneCols.length > 0) {
    const parts = [
      ...(addedCols.length
        ? [`new column${addedCols.length > 1 ? "s" : ""} ${addedCols.join(", ")}`]
        : []),
      ...(goneCols.length
        ? [`column${goneCols.length > 1 ? "s" : ""} ${goneCols.join(", ")} gone`]
        : []),
    ];
    out.push(change("columns-changed", "minor", `${cell}: ${parts.join("; ")}.`, {
      added: addedCols,
      removed: goneCols,
    }));
  }
  for (const [name, c] of cB) {
    const was = cA.get(name);
    if (was && (was.unit ?? null) !== (c.unit ?? null)) {
      out.push(change(
        "unit-changed",
        "notable",
        `${cell}: the unit of ${name} is now ${c.unit ?? "none"} (was ${was.unit ?? "none"}).`,
        { column: name, before: was.unit ?? null, after: c.unit ?? null },
      ));
    }
  }
  return out;
}

/** The table's history face. */
export const tableHistory: HistoryFace<TableSpec, TableOutput, TableResult, TableKept> = {
  keep,
  changes,
};
