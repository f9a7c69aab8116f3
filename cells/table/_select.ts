/**
 * Row selection: checking exclusions against the data, and gathering the
 * kept rows of every column.
 *
 * @module
 */
import { gather as gatherValues } from "../../kernel/arrays.ts";
import { CellError } from "../../kernel/errors.ts";
import type { DelimitedColumn } from "../../kernel/csv/mod.ts";
import type { Column } from "../../kernel/contract/mod.ts";
import type { TableSpec } from "./spec.ts";

/**
 * The 0-based indexes of the rows left after exclusions.
 *
 * @param spec The spec (its exclusions).
 * @param rowsRead Number of data rows read.
 * @returns Kept row indexes, ascending; null when nothing is excluded (every row is kept).
 * @throws {CellError} On ["exclude", i, "rows", j] for a row beyond the data.
 */
export function keptAfterExclusions(spec: TableSpec, rowsRead: number): Int32Array | null {
  if (spec.exclude.length === 0) return null;
  const out = new Uint8Array(rowsRead).fill(1);
  spec.exclude.forEach((entry, i) => {
    entry.rows.forEach((r, j) => {
      if (r > rowsRead) {
        throw new CellError(
          `Row ${r} cannot be excluded: the table has ${rowsRead} row${rowsRead === 1 ? "" : "s"}`,
          entry.rows.length === 1 ? ["exclude", i, "rows"] : ["exclude", i, "rows", j],
        );
      }
      out[r - 1] = 0;
    });
  });
  return indexesOf(out);
}

/**
 * Indexes of the set flags.
 *
 * @param flags One flag per row.
 * @returns Indexes where the flag is non-zero.
 */
export function indexesOf(flags: Uint8Array): Int32Array {
  let n = 0;
  for (let i = 0; i < flags.length; i++) n += flags[i] ? 1 : 0;
  const idx = new Int32Array(n);
  for (let i = 0, k = 0; i < flags.length; i++) if (flags[i]) idx[k++] = i;
  return idx;
}

/** Stands for every row in {@link gather} (never indexed). */
const EVERY = new Int32Array(0);

function countNaN(v: Float64Array): number {
  let m = 0;
  for (let i = 0; i < v.length; i++) if (v[i] !== v[i]) m++;
  return m;
}

/**
 * A column restricted to the rows `idx` (no copy when every row is kept),
 * its missing count taken over those rows.
 *
 * @param c The column as read (or as built).
 * @param idx Row indexes to keep; null for all of them.
 * @param total Number of rows `c` has.
 * @param unit The column's unit, or null.
 * @returns The column over the kept rows.
 */
export function gather(
  c: DelimitedColumn | Column,
  idx: Int32Array | null,
  total: number,
  unit: string | null,
): Column {
  if (idx === null) idx = EVERY;
  const all = idx === EVERY || idx.length === total;
  if (c.type === "number") {
    const values = all ? c.values : gatherValues(c.values, idx);
    const lo = c.lo === null ? null : all ? c.lo : gatherValues(c.lo, idx);
    const flags = "below" in c ? c.below : undefined;
    return {
      name: c.name,
      type: "number",
      unit,
      values,
      lo,
      missing: all ? c.missing : countNaN(values),
      ...(flags === undefined
        ? {}
        : { below: all ? flags : Uint8Array.from(idx, (i) => flags[i]) }),
    };
  }
  const values = all ? c.values : Array.from(idx, (i) => c.values[i]);
  const missing = all ? c.missing : values.reduce((m, v) => m + (v === null ? 1 : 0), 0);
  return { name: c.name, type: "text", unit, values, missing };
}

/** Missing count of a number array (NaN entries). */
export { countNaN };
