/**
 * Which rows of a table were added, removed or changed between two records
 * of the run history, by content: row by row where both records keep a hash
 * of each row, by blocks of rows where one is too large for that, and by
 * count alone where the two fingerprints cannot be compared (an older
 * record, other columns read).
 *
 * ```
 *  row by row: pair (row number, hash) equal in both         ─▶ unchanged
 *              then the rest as multisets of hashes          ─▶ moved (unchanged)
 *              new hashes left over ─▶ added;  old ones ─▶ removed
 *              an added and a removed row at one row number  ─▶ changed
 *  by blocks:  leading blocks equal, table longer            ─▶ rows added after them
 *              else                                          ─▶ content differs from block k on
 * ```
 *
 * Each `rows-*` change carries its own part of the row changes
 * ({@link RowChanges}); the kernel sums them for the cells that read the table.
 *
 * @module
 */
import type { Change, RowChanges } from "../../kernel/contract/mod.ts";
import { fromRuns, rowsInWords } from "../shared/row_list.ts";
import { blockHashes, hexValues, ROW_HASH, splitHashes } from "./_row_hash.ts";

/** Tables up to this many used rows keep a hash of every row. */
export const ROW_HASHES_UP_TO = 20_000;
/** Larger tables keep a hash of each block of this many rows. */
export const BLOCK_ROWS = 1_000;
/** Row numbers listed in a change's numbers at most (`more` counts the rest). */
export const LISTED_ROWS = 50;

/** The fields of a table's kept value that the row comparison reads (any may be missing). */
export interface RowsKept {
  sha256?: string | null;
  rows_used?: number;
  columns?: { name: string }[];
  row_runs?: [number, number][];
  hash?: string;
  hashed?: string[];
  content?: string;
  row_hashes?: string | null;
  block_hashes?: string | null;
}

const whole = (x: unknown): x is number => Number.isInteger(x) && (x as number) >= 0;
const plural = (n: number, one: string, many = `${one}s`) =>
  `${n.toLocaleString("en")} ${n === 1 ? one : many}`;

/** The row changes of one `rows-*` change. */
const part = (added: number, removed: number, changed: number): RowChanges => ({
  added,
  removed,
  changed,
});

function listed(rows: readonly number[]) {
  return {
    count: rows.length,
    rows: rows.slice(0, LISTED_ROWS),
    more: Math.max(0, rows.length - LISTED_ROWS),
  };
}

/** The fingerprint's kind and the columns it covers; records without them are of the first version. */
function fingerprint(k: RowsKept): string | null {
  const hashed = Array.isArray(k.hashed)
    ? k.hashed
    : Array.isArray(k.columns)
    ? k.columns.map((c) => c?.name)
    : null;
  return hashed ? `${k.hash ?? "fnv1a-32-words"}\u0000${hashed.join("\u0000")}` : null;
}

/**
 * The row changes between two kept tables, as sentences.
 *
 * @param cell The table's name.
 * @param a The earlier kept value.
 * @param b The newer.
 * @param newlyExcluded Rows excluded in `b` and not in `a` (named in the removal's sentence).
 * @returns `rows-added`, `rows-removed`, `rows-changed` or `rows-not-compared` changes.
 */
export function rowChanges(
  cell: string,
  a: RowsKept,
  b: RowsKept,
  newlyExcluded: ReadonlySet<number>,
): Change[] {
  const na = a.rows_used, nb = b.rows_used;
  if (!whole(na) || !whole(nb)) return [];
  if (typeof a.content === "string" && a.content === b.content && na === nb) return [];
  const fa = fingerprint(a), fb = fingerprint(b);
  if (fa === null || fb === null || fa !== fb) {
    const why = fa === null || fb === null
      ? "the earlier record keeps no row fingerprints"
      : (a.hash ?? null) !== (b.hash ?? null)
      ? "the earlier record fingerprinted rows another way"
      : "the columns read from the source changed";
    return byCount(cell, a, b, why);
  }
  const ha = rowHashesOf(a), hb = rowHashesOf(b);
  if (ha && hb) return byRows(cell, ha, hb, newlyExcluded);
  const ba = blocksOf(a, ha), bb = blocksOf(b, hb);
  if (ba && bb) return byBlocks(cell, na, nb, ba, bb);
  return byCount(cell, a, b, "the earlier record's row fingerprints are incomplete");
}

/** Row hashes with their source row numbers, when the record keeps them whole. */
function rowHashesOf(k: RowsKept): { hashes: string[]; rows: number[] } | null {
  const hashes = splitHashes(k.row_hashes);
  if (!hashes || !Array.isArray(k.row_runs)) return null;
  const runs = k.row_runs.filter((r) => Array.isArray(r) && whole(r[0]) && whole(r[1]));
  // Count before expanding: a damaged run must not make a huge array.
  const count = runs.reduce((n, [from, to]) => n + Math.max(0, to - from + 1), 0);
  if (count !== hashes.length || count !== k.rows_used) return null;
  return { hashes, rows: fromRuns(runs) };
}

/** Block hashes, kept or made from the row hashes (only for this version's fingerprint). */
function blocksOf(k: RowsKept, rows: { hashes: string[] } | null): string[] | null {
  if (rows) {
    const values = k.hash === ROW_HASH ? hexValues(rows.hashes) : null;
    return values ? splitHashes(blockHashes(values, BLOCK_ROWS)) : null;
  }
  const blocks = splitHashes(k.block_hashes);
  return blocks && blocks.length === Math.ceil(k.rows_used! / BLOCK_ROWS) ? blocks : null;
}

function byRows(
  cell: string,
  a: { hashes: string[]; rows: number[] },
  b: { hashes: string[]; rows: number[] },
  newlyExcluded: ReadonlySet<number>,
): Change[] {
  // 1. Rows at the same source row number with the same content.
  const oldAt = new Map<number, number>();
  a.rows.forEach((r, i) => oldAt.set(r, i));
  const oldMatched = new Uint8Array(a.rows.length);
  const pending: number[] = [];
  b.rows.forEach((r, j) => {
    const i = oldAt.get(r);
    if (i !== undefined && a.hashes[i] === b.hashes[j]) oldMatched[i] = 1;
    else pending.push(j);
  });
  // 2. The rest as multisets of content (rows that moved: an insertion above them).
  const pool = new Map<string, { rows: number[]; next: number }>();
  a.rows.forEach((r, i) => {
    if (oldMatched[i]) return;
    const entry = pool.get(a.hashes[i]);
    if (entry) entry.rows.push(r);
    else pool.set(a.hashes[i], { rows: [r], next: 0 });
  });
  const fresh: number[] = [];
  for (const j of pending) {
    const entry = pool.get(b.hashes[j]);
    if (entry && entry.next < entry.rows.length) entry.next++;
    else fresh.push(b.rows[j]);
  }
  const gone: number[] = [];
  for (const { rows, next } of pool.values()) gone.push(...rows.slice(next));
  gone.sort((x, y) => x - y);
  // 3. Removed and added at one row number: changed in place.
  const goneSet = new Set(gone);
  const changed = fresh.filter((r) => goneSet.has(r));
  const changedSet = new Set(changed);
  const added = fresh.filter((r) => !changedSet.has(r));
  const removed = gone.filter((r) => !changedSet.has(r));
  const out: Change[] = [];
  if (added.length > 0) {
    out.push({
      code: "rows-added",
      weight: "notable",
      sentence: `${cell}: ${plural(added.length, "row")} added (${rowsInWords(added)}).`,
      numbers: listed(added),
      rows: part(added.length, 0, 0),
    });
  }
  if (removed.length > 0) {
    const excluded = removed.filter((r) => newlyExcluded.has(r));
    const note = excluded.length === 0
      ? ""
      : excluded.length === removed.length
      ? `, now excluded`
      : `; ${rowsInWords(excluded)} now excluded`;
    out.push({
      code: "rows-removed",
      weight: "notable",
      sentence: `${cell}: ${plural(removed.length, "row")} removed (${
        rowsInWords(removed)
      } of the earlier table${note}).`,
      numbers: listed(removed),
      rows: part(0, removed.length, 0),
    });
  }
  if (changed.length > 0) {
    out.push({
      code: "rows-changed",
      weight: "notable",
      sentence: `${cell}: ${plural(changed.length, "row")} changed in place (${
        rowsInWords(changed)
      }).`,
      numbers: listed(changed),
      rows: part(0, 0, changed.length),
    });
  }
  return out;
}

function byBlocks(cell: string, na: number, nb: number, a: string[], b: string[]): Change[] {
  const B = BLOCK_ROWS.toLocaleString("en");
  let same = 0;
  while (same < a.length && same < b.length && a[same] === b[same]) same++;
  if (same === a.length && same === b.length) return [];
  const full = Math.floor(na / BLOCK_ROWS);
  if (same >= full && nb > na) {
    // Every whole block of the earlier table is unchanged; its last, partial
    // block was hashed over fewer rows than the newer one holds there.
    const unverified = na - full * BLOCK_ROWS;
    const added = nb - na;
    return [{
      code: "rows-added",
      weight: "notable",
      sentence: `${cell}: ${plural(added, "row")} added after the first ${
        na.toLocaleString("en")
      } (content compared by blocks of ${B} rows, not row by row${
        unverified > 0
          ? `; the last ${plural(unverified, "earlier row")} could not be compared`
          : ""
      }).`,
      numbers: { count: added, after: na, compared: "blocks", unverified },
      rows: part(added, 0, 0),
    }];
  }
  // Rows in blocks that differ, within the rows both tables have (an upper bound).
  const common = Math.min(na, nb);
  let changed = 0, differ = 0;
  for (let k = same; k * BLOCK_ROWS < common; k++) {
    if (a[k] === b[k] && (k + 1) * BLOCK_ROWS <= common) continue;
    differ++;
    changed += Math.min(common, (k + 1) * BLOCK_ROWS) - k * BLOCK_ROWS;
  }
  const from = same * BLOCK_ROWS + 1;
  return [{
    code: "rows-changed",
    weight: "notable",
    sentence: `${cell}: the content differs from used row ${from.toLocaleString("en")} on, ${
      na.toLocaleString("en")
    } → ${plural(nb, "row")} (content compared by blocks of ${B} rows, not row by row: ${
      plural(differ, "block")
    } of the rows both have differ).`,
    numbers: {
      from_row: from,
      rows_before: na,
      rows_after: nb,
      blocks_differing: differ,
      compared: "blocks",
    },
    rows: part(Math.max(0, nb - na), Math.max(0, na - nb), changed),
  }];
}

function byCount(cell: string, a: RowsKept, b: RowsKept, why: string): Change[] {
  const na = a.rows_used!, nb = b.rows_used!;
  const numbers = { count: Math.abs(nb - na), before: na, after: nb, compared: "count", why };
  const counts = `${na.toLocaleString("en")} → ${nb.toLocaleString("en")}`;
  if (nb > na) {
    return [{
      code: "rows-added",
      weight: "notable",
      sentence: `${cell}: ${plural(nb - na, "more row")} than in the earlier run (${counts}; ` +
        `compared by count only: ${why}).`,
      numbers,
      rows: part(nb - na, 0, 0),
    }];
  }
  if (nb < na) {
    return [{
      code: "rows-removed",
      weight: "notable",
      sentence: `${cell}: ${plural(na - nb, "row")} fewer than in the earlier run (${counts}; ` +
        `compared by count only: ${why}).`,
      numbers,
      rows: part(0, na - nb, 0),
    }];
  }
  if (typeof a.sha256 === "string" && typeof b.sha256 === "string" && a.sha256 !== b.sha256) {
    return [{
      code: "rows-not-compared",
      weight: "minor",
      sentence: `${cell}: the source changed but its rows could not be compared by content ` +
        `(${why}); ${plural(nb, "row")} used, as before.`,
      numbers,
    }];
  }
  return [];
}
