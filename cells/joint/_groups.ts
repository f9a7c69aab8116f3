/**
 * From the tables of a joint fit to its groups: the model parsed against
 * their columns, and for each group the rows it fits as the numerical core
 * reads them (kernel/optim `ModelData`: the model's columns, the response as
 * written, the decimal corrections for double-double residuals).
 *
 * ```
 *  tables: [a, b, c]  ─▶ one group per table, in the order listed
 *  on: t, by: batch   ─▶ one group per distinct value of batch, in order of first appearance
 * ```
 *
 * The model is parsed against every column name of every table, so a
 * column one table lacks is reported at that table (a name that is a column
 * nowhere is a parameter, as in a fit). Rows with a missing value in a
 * column the model uses (or in the grouping column) are left out with a
 * warning that names their group; a group left with no rows is an error.
 *
 * @module
 */
import { gather, gatherInt } from "../../kernel/arrays.ts";
import { compile, ExprError, type Model, parseModel } from "../../kernel/expr/mod.ts";
import { CellError } from "../../kernel/errors.ts";
import { didYouMean } from "../../kernel/suggest.ts";
import type { ModelData } from "../../kernel/optim/mod.ts";
import type {
  Column,
  NumberColumn,
  OptionPath,
  RunContext,
  Table,
} from "../../kernel/contract/mod.ts";
import { rowList } from "../shared/rows.ts";
import type { JointSpec } from "./spec.ts";

/** One group of rows, fitted with its own copies of the parameters that are not shared. */
export interface Group {
  /** The group's name: the table cell's name, or the grouping column's value as text. */
  label: string;
  /** The table cell its rows come from. */
  table: string;
  /** Source row numbers of the rows used, in order. */
  rows: Int32Array;
  /** What the numerical core reads. */
  data: ModelData;
}

/** The model and its groups. */
export interface Grouped {
  model: Model;
  groups: Group[];
  /** The unit of each column the model uses, from the first table that gives one. */
  units: Map<string, string | null>;
}

/** `n rows` / `1 row`. */
export const countRows = (n: number) => `${n} ${n === 1 ? "row" : "rows"}`;

/**
 * Splits the joint fit's tables into groups.
 *
 * @param spec The normalised options.
 * @param ctx The run context (inputs by name, warnings).
 * @returns The parsed model and the groups, in order.
 * @throws {CellError} For an input that is not a table, a model error, a
 *   table lacking a column the model names (naming the table and the
 *   column), a text column in the model, a missing `by` column, fewer than two
 *   groups, a group with no rows, a response not finite after its transform.
 */
export function groupRows(spec: JointSpec, ctx: RunContext): Grouped {
  const sources = spec.on === undefined
    ? spec.tables.map((t, i) => ({
      name: t,
      table: tableInput(ctx, t, ["tables", i]),
      path: ["tables", i] as OptionPath,
    }))
    : [{ name: spec.on, table: tableInput(ctx, spec.on, ["on"]), path: ["on"] as OptionPath }];
  const names = [...new Set(sources.flatMap((s) => s.table.columns.map((c) => c.name)))];
  const model = parseAgainst(spec.model, names);
  const needed = [model.responseColumn, ...model.columns];
  const groups: Group[] = [];
  for (const s of sources) {
    const used = needed.map((c) => numericColumn(ctx.name, s.table, s.name, c, s.path, model));
    if (spec.by === undefined) {
      const all = allRows(s.table.rows.length);
      groups.push(makeGroup(ctx, model, s.name, s.name, s.table, used, all, s.path));
      continue;
    }
    for (const [label, idx] of splitBy(ctx, s.table, s.name, spec.by)) {
      groups.push(makeGroup(ctx, model, label, s.name, s.table, used, idx, ["by"]));
    }
  }
  if (groups.length < 2) {
    throw new CellError(
      `Joint fit "${ctx.name}": column "${spec.by}" of table "${spec.on}" holds one value (${
        groups[0]?.label ?? "none"
      }): a joint fit needs two or more groups`,
      ["by"],
    );
  }
  const units = new Map(needed.map((c) => {
    const unit = sources.map((s) => s.table.columns.find((x) => x.name === c)?.unit ?? null)
      .find((u) => u !== null);
    return [c, unit ?? null] as const;
  }));
  return { model, groups, units };
}

function tableInput(ctx: RunContext, name: string, path: OptionPath): Table {
  const t = ctx.inputs[name];
  if (t === undefined || t.type !== "Table") {
    throw new CellError(`Cannot fit "${ctx.name}": cell "${name}" gives no table`, path);
  }
  return t as Table;
}

function parseAgainst(text: string, columns: string[]): Model {
  try {
    return parseModel(text, columns);
  } catch (e) {
    if (e instanceof ExprError) throw new CellError(e.message, ["model"], e.offset);
    throw e;
  }
}

/** The column `col` of a table, numeric, or an error naming the table and the column. */
function numericColumn(
  cell: string,
  table: Table,
  tableName: string,
  col: string,
  path: OptionPath,
  model: Model,
): NumberColumn {
  const c = table.columns.find((x) => x.name === col);
  const role = col === model.responseColumn ? "the response" : "a column the model names";
  if (c === undefined) {
    throw new CellError(
      `Cannot fit "${cell}": table "${tableName}" has no column "${col}" (${role})${
        didYouMean(col, table.columns.map((x) => x.name)) ||
        `: its columns are ${table.columns.map((x) => `"${x.name}"`).join(", ")}`
      }`,
      path,
    );
  }
  if (c.type !== "number") {
    throw new CellError(
      `Cannot fit "${cell}": column "${col}" of table "${tableName}" holds text, not numbers: a model uses numeric columns`,
      path,
    );
  }
  return c;
}

function allRows(n: number): Int32Array {
  return Int32Array.from({ length: n }, (_, i) => i);
}

/** Row indexes by the value of the grouping column, in order of first appearance. */
function splitBy(
  ctx: RunContext,
  table: Table,
  tableName: string,
  by: string,
): Map<string, Int32Array> {
  const col: Column | undefined = table.columns.find((c) => c.name === by);
  if (col === undefined) {
    throw new CellError(
      `Cannot fit "${ctx.name}": table "${tableName}" has no column "${by}" to group by${
        didYouMean(by, table.columns.map((c) => c.name)) ||
        `: its columns are ${table.columns.map((c) => `"${c.name}"`).join(", ")}`
      }`,
      ["by"],
    );
  }
  const out = new Map<string, number[]>();
  const missing: number[] = [];
  for (let i = 0; i < table.rows.length; i++) {
    const v = col.values[i];
    const label = v === null || (typeof v === "number" && Number.isNaN(v)) ? null : String(v);
    if (label === null) {
      missing.push(table.rows[i]);
      continue;
    }
    const list = out.get(label);
    if (list === undefined) out.set(label, [i]);
    else list.push(i);
  }
  if (missing.length > 0) {
    ctx.warn(
      `Joint fit "${ctx.name}": ${
        countRows(missing.length)
      } of table "${tableName}" left out for a missing "${by}": ${rowList(missing)}`,
    );
  }
  return new Map([...out].map(([k, v]) => [k, Int32Array.from(v)]));
}

/** One group's rows: missing values left out (warned), the response evaluated as written. */
function makeGroup(
  ctx: RunContext,
  model: Model,
  label: string,
  tableName: string,
  table: Table,
  used: NumberColumn[],
  candidates: Int32Array,
  path: OptionPath,
): Group {
  const keep: number[] = [], left: number[] = [];
  for (const i of candidates) {
    if (used.every((c) => !Number.isNaN(c.values[i]))) keep.push(i);
    else left.push(table.rows[i]);
  }
  const where = label === tableName ? `table "${tableName}"` : `group "${label}"`;
  if (left.length > 0) {
    ctx.warn(
      `Joint fit "${ctx.name}": ${
        countRows(left.length)
      } of ${where} left out for missing values: ${rowList(left)}`,
    );
  }
  if (keep.length === 0) {
    throw new CellError(
      `Cannot fit "${ctx.name}": ${where} has no rows${
        left.length > 0
          ? ` with every column the model uses (${
            countRows(left.length)
          } left out for missing values)`
          : ""
      }`,
      path,
    );
  }
  const n = keep.length;
  const pick = (v: Float64Array) => gather(v, keep);
  const rows = gatherInt(table.rows, keep);
  const raw = pick(used[0].values);
  const y = model.response.op === "id"
    ? raw
    : compile(model.response, [model.responseColumn], [])([raw], [], n);
  const bad: number[] = [];
  for (let i = 0; i < n; i++) if (!Number.isFinite(y[i])) bad.push(rows[i]);
  if (bad.length > 0) {
    const written = model.text.slice(model.response.start, model.response.end);
    throw new CellError(
      `Cannot fit "${ctx.name}": response "${written}" is not finite in ${
        countRows(bad.length)
      } of ${where}: ${rowList(bad)}`,
      ["model"],
      model.response.start,
    );
  }
  const pickLo = (c: NumberColumn) => (c.lo === null ? null : pick(c.lo));
  return {
    label,
    table: tableName,
    rows,
    data: {
      model,
      n,
      columns: used.slice(1).map((c) => pick(c.values)),
      y,
      lo: { columns: used.slice(1).map(pickLo), response: { hi: raw, lo: pickLo(used[0]) } },
    },
  };
}
