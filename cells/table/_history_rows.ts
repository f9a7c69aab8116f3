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
 * Fingerprints: MurmurHash3, x86 32-bit variant (A. Appleby, SMHasher, public
 * domain), fed one 32-bit word at a time: its body step per word and its
 * finaliser `fmix32` with the byte length. One hash a used row, over the
 * values of the columns read from the source (not the derived ones, so a new
 * `derive` changes no row); blocks of rows and the whole content are hashed
 * again from the row hashes. Words of a row, column by column:
 *
 * ```
 *  number  ─▶ low word, high word of the IEEE double (every NaN as one NaN)
 *  text    ─▶ length + 1, then UTF-16 code units two to a word
 *  missing ─▶ 0 (a text column's null; a missing number is NaN)
 * ```
 *
 * Unlike FNV over whole words, each word's high bits reach the hash's low
 * bits (the rotations), so changes that touch only a double's upper word
 * (integers, halves) mix as well as any.
 *
 * @module
 */
import type { Change, Column, RowChanges } from "../../kernel/contract/mod.ts";
import { fromRuns, rowsInWords } from "../shared/row_list.ts";
import { fmix32, murmurStep } from "../../kernel/murmur3.ts";

/** The name of this fingerprint, kept with it: records of another kind compare by count only. */
export const ROW_HASH = "murmur3-32";

const f64 = new Float64Array(1);
const u32 = new Uint32Array(f64.buffer);
const NAN_LOW = 0, NAN_HIGH = 0x7ff80000;

/** MurmurHash3's finaliser (`fmix32`) after the byte count. */
function finish(h: number, bytes: number): number {
  return fmix32(h ^ bytes);
}

/**
 * One hash a row over `columns` (all of the same length).
 *
 * @param columns The columns to cover, in order.
 * @param n The number of rows.
 * @returns The hashes, row by row.
 * @example
 * ```ts
 * import { rowHashes } from "./_history_rows.ts";
 * const x = { name: "x", type: "number" as const, unit: null, values: Float64Array.of(1, 2, 1), lo: null, missing: 0 };
 * const h = rowHashes([x], 3);
 * if (h[0] !== h[2] || h[0] === h[1]) throw new Error("equal rows hash alike, others not");
 * ```
 */
export function rowHashes(columns: readonly Column[], n: number): Uint32Array {
  const h = new Int32Array(n);
  const words = new Uint32Array(n);
  for (const c of columns) {
    if (c.type === "number") {
      const v = c.values;
      for (let i = 0; i < n; i++) {
        f64[0] = v[i];
        const nan = v[i] !== v[i];
        h[i] = murmurStep(murmurStep(h[i], nan ? NAN_LOW : u32[0]), nan ? NAN_HIGH : u32[1]);
      }
      for (let i = 0; i < n; i++) words[i] += 2;
    } else {
      for (let i = 0; i < n; i++) {
        const s = c.values[i];
        let x = murmurStep(h[i], s === null ? 0 : s.length + 1);
        let w = 1;
        if (s !== null) {
          for (let k = 0; k < s.length; k += 2, w++) {
            x = murmurStep(
              x,
              s.charCodeAt(k) | ((k + 1 < s.length ? s.charCodeAt(k + 1) : 0) << 16),
            );
          }
        }
        h[i] = x;
        words[i] += w;
      }
    }
  }
  const out = new Uint32Array(n);
  for (let i = 0; i < n; i++) out[i] = finish(h[i], 4 * words[i]);
  return out;
}

/**
 * One hash over row hashes `from` to `to` (exclusive), in order.
 *
 * @param h Row hashes.
 * @param from First row (0-based).
 * @param to One past the last.
 * @returns The hash.
 */
export function hashOfRows(h: ArrayLike<number>, from: number, to: number): number {
  let x = 0;
  for (let i = from; i < to; i++) x = murmurStep(x, h[i]);
  return finish(x, 4 * (to - from));
}

/**
 * A hash a block of `size` rows (the last may be shorter), as one string of
 * 8 hex digits a block.
 *
 * @param h Row hashes.
 * @param size Rows a block.
 * @returns The concatenated block hashes.
 */
export function blockHashes(h: ArrayLike<number>, size: number): string {
  let out = "";
  for (let b = 0; b < h.length; b += size) {
    out += hex8(hashOfRows(h, b, Math.min(h.length, b + size)));
  }
  return out;
}

/** A 32-bit number as 8 hex digits. */
export const hex8 = (x: number): string => (x >>> 0).toString(16).padStart(8, "0");

/**
 * A string of 8-digit hashes cut into its hashes; null when it is not one
 * (a record of an older or damaged kind). The pieces are compared as text.
 *
 * @param s The concatenated hashes.
 * @returns The hashes, or null.
 */
export function splitHashes(s: unknown): string[] | null {
  if (typeof s !== "string" || s.length % 8 !== 0) return null;
  const out: string[] = new Array(s.length / 8);
  for (let i = 0; i < out.length; i++) out[i] = s.slice(8 * i, 8 * i + 8);
  return out;
}

/**
 * Hex hashes back to numbers (to hash them again by blocks); null when one is not hex.
 *
 * @param hashes 8 hex digits each.
 * @returns The numbers, or null.
 */
export function hexValues(hashes: readonly string[]): Uint32Array | null {
  const out = new Uint32Array(hashes.length);
  for (let i = 0; i < hashes.length; i++) {
    if (!/^[0-9a-f]{8}$/.test(hashes[i])) return null;
    out[i] = parseInt(hashes[i], 16);
  }
  return out;
}

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
