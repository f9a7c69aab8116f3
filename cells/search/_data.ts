/**
 * From a table and a search spec to the columns a search works on: the
 * response, the columns every subset holds and the candidates, each a number
 * column of the table, on the rows where all of them have a value.
 *
 * Every subset must be judged on the same rows, or their criteria would not
 * compare, so a row missing any one of these columns is left out of every
 * subset (with a warning that counts the rows). A fit made later from one
 * subset reads only its own columns and may then keep some of those rows.
 *
 * @module
 */
import { gather, gatherInt } from "../../kernel/arrays.ts";
import { CellError } from "../../kernel/errors.ts";
import { CONSTANTS } from "../../kernel/expr/mod.ts";
import type { NumberColumn, OptionPath, Table } from "../../kernel/contract/mod.ts";
import { rowList } from "../shared/rows.ts";
import { numberColumnOf } from "../shared/number_column.ts";
import { MAX_CANDIDATES, type SearchSpec } from "./spec.ts";

/** The columns of a search on the rows it uses. */
export interface SearchData {
  /** Rows used (complete in every column below). */
  n: number;
  /** Source row number of each row used. */
  rows: Int32Array;
  response: string;
  /** The response column's unit, or null. */
  unit: string | null;
  y: Float64Array;
  /** Names and values of the columns every subset holds. */
  always: string[];
  forced: Float64Array[];
  /** Names and values of the candidates, in the order searched. */
  candidates: string[];
  columns: Float64Array[];
}

const PLAIN_NAME = /^[A-Za-z_][A-Za-z0-9_]*$/;

/**
 * Resolves the spec's columns against the table and leaves out incomplete rows.
 *
 * @param name The search cell's name, for messages.
 * @param spec The spec.
 * @param table The table searched.
 * @param warn Records a warning on the cell.
 * @returns The columns on the complete rows.
 * @throws {CellError} For an unknown column (with the nearest name), a text
 *   column, no candidates, more than 25 by default, a constant response or
 *   too few complete rows.
 */
export function searchData(
  name: string,
  spec: SearchSpec,
  table: Table,
  warn: (m: string) => void,
): SearchData {
  const find = (column: string, path: OptionPath) => numberColumn(name, spec, table, column, path);
  const y = find(spec.response, ["response"]);
  const forced = spec.always.map((c, i) => find(c, ["always", i]));
  const candidates = spec.candidates === null
    ? otherColumns(name, spec, table)
    : spec.candidates.map((c, i) => find(c, ["candidates", i]));
  const used = [y, ...forced, ...candidates];
  const keep = completeRows(used.map((c) => c.values), table.rows.length);
  const pick = (v: Float64Array) => keep === null ? v : gather(v, keep);
  const rows = keep === null ? table.rows : gatherInt(table.rows, keep);
  if (keep !== null) {
    const kept = new Set(rows);
    const missing = Array.from(table.rows).filter((r) => !kept.has(r));
    const one = missing.length === 1;
    warn(
      `${missing.length} ${one ? "row" : "rows"} of "${spec.on}" with a missing value in the ` +
        `response or a predictor ${one ? "is" : "are"} left out of every subset (${
          rowList(missing)
        }): a fit of one subset may keep some of them`,
    );
  }
  const data: SearchData = {
    n: rows.length,
    rows,
    response: y.name,
    unit: y.unit,
    y: pick(y.values),
    always: forced.map((c) => c.name),
    forced: forced.map((c) => pick(c.values)),
    candidates: candidates.map((c) => c.name),
    columns: candidates.map((c) => pick(c.values)),
  };
  checkRows(name, spec, data);
  return data;
}

function numberColumn(
  name: string,
  spec: SearchSpec,
  table: Table,
  column: string,
  path: OptionPath,
): NumberColumn {
  const needs = "a regression needs numbers";
  return numberColumnOf(table, column, {
    cannot: `Cannot search "${name}"`,
    on: spec.on,
    needs,
    path,
  });
}

/** The default candidates: every other number column a model can write. */
function otherColumns(name: string, spec: SearchSpec, table: Table): NumberColumn[] {
  const taken = new Set([spec.response, ...spec.always]);
  const out = table.columns.filter((c): c is NumberColumn =>
    c.type === "number" && !taken.has(c.name) && PLAIN_NAME.test(c.name) && !CONSTANTS.has(c.name)
  );
  if (out.length === 0) {
    throw new CellError(
      `Cannot search "${name}": table "${spec.on}" has no other number column to try as a ` +
        "predictor; list the candidates",
      [],
    );
  }
  if (out.length > MAX_CANDIDATES) {
    throw new CellError(
      `Cannot search "${name}": table "${spec.on}" has ${out.length} other number columns, and a ` +
        `search takes at most ${MAX_CANDIDATES} candidates: list them in "candidates"`,
      [],
    );
  }
  return out;
}

/** Indexes of the rows finite in every column, or null when every row is. */
function completeRows(columns: Float64Array[], n: number): Int32Array | null {
  const ok = new Uint8Array(n).fill(1);
  let kept = n;
  for (const v of columns) {
    for (let i = 0; i < n; i++) {
      if (ok[i] === 1 && !Number.isFinite(v[i])) {
        ok[i] = 0;
        kept--;
      }
    }
  }
  if (kept === n) return null;
  const keep = new Int32Array(kept);
  for (let i = 0, k = 0; i < n; i++) if (ok[i] === 1) keep[k++] = i;
  return keep;
}

/** Enough rows for the smallest model and more than one response value. */
function checkRows(name: string, spec: SearchSpec, d: SearchData): void {
  const base = (spec.intercept ? 1 : 0) + d.always.length;
  const smallest = Math.max(base, 1);
  if (d.n <= smallest) {
    throw new CellError(
      `Cannot search "${name}": ${d.n} complete ${d.n === 1 ? "row" : "rows"} for a smallest ` +
        `model of ${smallest} ${smallest === 1 ? "parameter" : "parameters"}: a fit needs more ` +
        "rows than parameters",
      [],
    );
  }
  if (d.y.every((v) => v === d.y[0])) {
    throw new CellError(
      `Cannot search "${name}": the response "${d.response}" is ${d.y[0]} on every row used, so ` +
        "no subset explains anything",
      ["response"],
    );
  }
}
