/**
 * Running a `table` cell: read → exclude → derive → filter.
 *
 * ```
 *  bytes / inline rows ──readDelimited──▶ typed columns (rows_read)
 *        ──exclude (rows + why)──▶ kept rows ──derive──▶ + derived columns
 *        ──where──▶ rows used (Table.rows: source row numbers)
 * ```
 *
 * Row numbers are source data rows (1-based, before exclusions); missing
 * counts are over the rows used.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { ownValue } from "../../kernel/own.ts";
import { ExprError } from "../../kernel/expr/mod.ts";
import type { Column, NumberColumn, RunContext, Table } from "../../kernel/contract/mod.ts";
import { addDerived, checkUnits } from "./_derive.ts";
import { readSource } from "./_read_source.ts";
import { readDatabaseTable } from "./_read_database.ts";
import { withBelowLimit } from "./_below_limit.ts";
import { gatherInt } from "../../kernel/arrays.ts";
import { gather, indexesOf, keptAfterExclusions } from "./_select.ts";
import { evaluateWhere } from "./_where.ts";
import type { TableSpec } from "./spec.ts";

/** A Table plus what the record needs beyond the shared type. */
export interface TableOutput extends Table {
  /** Rows dropped by `where` (not exclusions). */
  rowsFiltered: number;
}

/** Indexes of the rows the filter keeps; null without a filter (every row). */
function applyWhere(spec: TableSpec, columns: Column[], rows: Int32Array): Int32Array | null {
  if (spec.where === null) return null;
  const numeric = columns.filter((c): c is NumberColumn => c.type === "number");
  const text = columns.filter((c) => c.type === "text").map((c) => c.name);
  try {
    const keep = evaluateWhere(
      spec.where,
      numeric.map((c) => c.name),
      numeric.map((c) => c.values),
      rows.length,
      text,
    );
    return indexesOf(keep);
  } catch (e) {
    if (e instanceof ExprError) throw new CellError(e.message, ["where"], e.offset);
    throw e;
  }
}

/**
 * Reads the table and applies exclusions, derived columns and the filter.
 *
 * @param spec The normalised options.
 * @param ctx Files, settings, warnings and progress.
 * @returns The table.
 * @throws {CellError} For unreadable data (placed on `from`, `rows` or
 *   `types`), an excluded row beyond the data, a unit of an unknown column,
 *   a bad derived column or filter.
 */
export function runTable(spec: TableSpec, ctx: RunContext): TableOutput | Promise<TableOutput> {
  if (spec.source !== null) return readDatabaseTable(spec, ctx);
  const read = readSource(spec, ctx);
  const data = spec.belowLimit === undefined ? read : {
    ...read,
    columns: withBelowLimit(read.columns, spec.belowLimit, (i) => i + 1),
  };
  const kept = keptAfterExclusions(spec, data.rowCount);
  const names = [...data.columns.map((c) => c.name), ...spec.derive.map((d) => d.name)];
  checkUnits(spec.units, names);
  const columns = data.columns.map((c) =>
    gather(c, kept, data.rowCount, ownValue(spec.units, c.name) ?? null)
  );
  const source = new Int32Array(kept === null ? data.rowCount : kept.length);
  if (kept === null) { for (let k = 0; k < source.length; k++) source[k] = k + 1; }
  else for (let k = 0; k < source.length; k++) source[k] = kept[k] + 1;
  addDerived(spec.derive, columns, source, spec.units, ctx.warn);
  const pass = applyWhere(spec, columns, source);
  const all = pass === null || pass.length === source.length;
  const final = all ? columns : columns.map((c) => gather(c, pass, source.length, c.unit));
  const rows = all ? source : gatherInt(source, pass);
  if (spec.where !== null && rows.length === 0 && source.length > 0) {
    ctx.warn(`Filter "${spec.where}" keeps no rows`);
  }
  ctx.progress(1);
  const excluded = spec.exclude
    .flatMap((e) => e.rows.map((row) => ({ row, why: e.why })))
    .sort((a, b) => a.row - b.row);
  return {
    type: "Table",
    columns: final,
    rows,
    rowsRead: data.rowCount,
    excluded,
    sha256: spec.from !== null ? ctx.files[spec.from].sha256 : null,
    source: spec.from,
    rowsFiltered: source.length - rows.length,
  };
}
