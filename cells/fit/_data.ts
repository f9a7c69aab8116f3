/**
 * From a table and a model to a {@link FitProblem}: parse the model against
 * the table's columns, check the columns it uses are numeric, leave out rows
 * with missing values (with a warning that counts and names them) and
 * evaluate the response as written (`log(y)` included). The problem also
 * carries the columns' decimal corrections (`lo`), for the double-double
 * solvers. When no row is left out the problem reads the table's own
 * arrays in place: a million-row column copied costs about 25 ms here, most
 * of it touching the new memory, and outputs are never written to.
 *
 * @module
 */
import { gather, gatherInt } from "../../kernel/arrays.ts";
import { compile, ExprError, type Model, parseModel } from "../../kernel/expr/mod.ts";
import { CellError } from "../../kernel/errors.ts";
import { quotedList } from "../../kernel/linalg/mod.ts";
import type { NumberColumn, Table } from "../../kernel/contract/mod.ts";
import type { FitSpec } from "./spec.ts";
import type { FitProblem } from "./problem.ts";
import { countRows, identifierOffset } from "./_offsets.ts";
import { rowList } from "../shared/rows.ts";

/**
 * Builds the problem a solver sees.
 *
 * @throws {CellError} At the model for a syntax error, a text column, or a
 *   response that is not finite after its transform.
 */
export function buildProblem(
  name: string,
  spec: FitSpec,
  table: Table,
  warn: (message: string) => void,
): FitProblem {
  const model = parseAgainst(spec.model, table);
  const used = [model.responseColumn, ...model.columns].map((c) =>
    numericColumn(name, model, table, c)
  );
  const { keep, left } = rowsWithoutMissing(used, table, warn);
  const n = keep === null ? table.rows.length : keep.length;
  // With every row kept, the table's own arrays, read in place (outputs are never written to).
  const pick = (v: Float64Array) => keep === null ? v : gather(v, keep);
  const rows = keep === null ? table.rows : gatherInt(table.rows, keep);
  const raw = pick(used[0].values);
  const y = model.response.op === "id"
    ? raw
    : compile(model.response, [model.responseColumn], [])([raw], [], n);
  const bad = notFinite(y, rows);
  if (bad.length > 0) {
    const written = model.text.slice(model.response.start, model.response.end);
    throw new CellError(
      `Cannot fit "${name}": response "${written}" is not finite in ${countRows(bad.length)}: ${
        rowList(bad)
      }`,
      ["model"],
      model.response.start,
    );
  }
  // Decimal corrections (NumberColumn.lo) on the rows used; null where the table kept none.
  const pickLo = (c: NumberColumn) => (c.lo === null ? null : pick(c.lo));
  return {
    name,
    model,
    n,
    columns: used.slice(1).map((c) => pick(c.values)),
    y,
    rows,
    start: spec.start,
    ...(left.length > 0 ? { rowsMissing: Int32Array.from(left) } : {}),
    lo: {
      columns: used.slice(1).map(pickLo),
      response: { hi: raw, lo: pickLo(used[0]) },
    },
  };
}

function parseAgainst(text: string, table: Table): Model {
  try {
    return parseModel(text, table.columns.map((c) => c.name));
  } catch (e) {
    if (e instanceof ExprError) throw new CellError(e.message, ["model"], e.offset);
    throw e;
  }
}

function numericColumn(name: string, model: Model, table: Table, col: string): NumberColumn {
  const c = table.columns.find((x) => x.name === col);
  const at = col === model.responseColumn
    ? identifierOffset(model.response, col)
    : identifierOffset(model.rhs, col);
  if (c === undefined) {
    // parseModel resolved the name against these columns, so this is a kernel bug.
    throw new CellError(`Cannot fit "${name}": column "${col}" is not in the table`, ["model"], at);
  }
  if (c.type !== "number") {
    throw new CellError(
      `Cannot fit "${name}": column "${col}" holds text, not numbers: a model uses numeric columns`,
      ["model"],
      at,
    );
  }
  return c;
}

/**
 * Indexes of rows with every used column present (`keep`; null: all of them,
 * when no used column has a missing value) and the source row numbers of the
 * others (`left`); warns about those, naming the first five.
 */
function rowsWithoutMissing(
  used: NumberColumn[],
  table: Table,
  warn: (m: string) => void,
): { keep: number[] | null; left: number[] } {
  if (used.every((c) => !hasNaN(c.values))) return { keep: null, left: [] };
  const keep: number[] = [], left: number[] = [];
  const culprits = new Set<string>();
  const m = table.rows.length;
  for (let i = 0; i < m; i++) {
    let ok = true;
    for (const c of used) {
      if (Number.isNaN(c.values[i])) {
        ok = false;
        culprits.add(c.name);
      }
    }
    if (ok) keep.push(i);
    else left.push(table.rows[i]);
  }
  if (left.length > 0) {
    const cols = used.map((c) => c.name).filter((c, k, all) =>
      culprits.has(c) && all.indexOf(c) === k
    );
    warn(
      `${countRows(left.length)} left out for missing values in ${quotedList(cols)}: ${
        rowList(left)
      }`,
    );
  }
  return { keep, left };
}

function hasNaN(v: Float64Array): boolean {
  for (let i = 0; i < v.length; i++) if (v[i] !== v[i]) return true;
  return false;
}

/** Source row numbers where `v` is NaN or infinite. */
export function notFinite(v: Float64Array, rows: Int32Array): number[] {
  const out: number[] = [];
  for (let i = 0; i < v.length; i++) if (!Number.isFinite(v[i])) out.push(rows[i]);
  return out;
}
