/**
 * A table read by a query: its rows come back typed (numbers as numbers,
 * everything else as text), or, past {@link LOAD_ROWS}, stay in the engine
 * with their names, types, units and missing counts.
 *
 * ```
 *  plan (main thread): stamp = columns (LIMIT 0) + fingerprint (count, hash of the values)
 *     └─▶ in the cell's cache key: a changed answer reruns the table and what reads it
 *  run (worker): stamp ─▶ n ≤ LOAD_ROWS ─▶ rows(query) ─▶ typed columns
 *                     └▶ n > LOAD_ROWS ─▶ columns' counts in the engine (kept)
 * ```
 *
 * @module
 */
import { CellError, type OptionPath } from "../../kernel/errors.ts";
import { ownValue } from "../../kernel/own.ts";
import type { Column, RunContext, StampContext } from "../../kernel/contract/mod.ts";
import type {
  DatabaseRef,
  EngineAccess,
  EngineAnswer,
  EngineColumn,
} from "../../kernel/engine/types.ts";
import { checkUnits } from "./_derive.ts";
import type { TableOutput } from "./run.ts";
import type { TableSpec } from "./spec.ts";

/** The most rows a table holds in memory; a larger result stays in its engine. */
export const LOAD_ROWS = 1_000_000;

/** An identifier quoted for SQL (both dialects: double quotes, doubled inside). */
export function quoteName(name: string): string {
  return `"${name.replaceAll('"', '""')}"`;
}

/**
 * The SQL giving a query's row count and an order-free hash of its rows
 * (a sum of row hashes, exact in both engines' wide integers). With a
 * partition column, per partition (one row each, added up by
 * {@link combineFingerprint}), from per-column hashes PostgreSQL can compute
 * on each shard (a row's text is not: its form depends on session settings).
 *
 * @param engine The dialect.
 * @param query The user's query (already checked).
 * @param columns The query's columns (names and types), for the per-column form.
 * @param partitionBy The partition column, or null.
 * @returns Rows of n (number) and h (text).
 */
export function fingerprintSql(
  engine: DatabaseRef["engine"],
  query: string,
  columns: readonly { name: string; type: "number" | "text" }[],
  partitionBy: string | null,
): string {
  let hash: string;
  if (engine === "duckdb") hash = "CAST(sum(CAST(hash(plumb_q) AS HUGEINT)) AS VARCHAR)";
  else if (partitionBy === null || columns.length === 0) {
    hash = "CAST(sum(hashtextextended(CAST(plumb_q AS text), 0)) AS text)";
  } else {
    // CASE, not coalesce: postgres_fdw (15) sends no COALESCE to a shard, and the rows travel.
    const one = columns.map((c, j) => {
      const hash = c.type === "number"
        ? `hashfloat8extended(CAST(${quoteName(c.name)} AS float8), ${j})`
        : `hashtextextended(CAST(${quoteName(c.name)} AS text), ${j})`;
      return `CASE WHEN ${quoteName(c.name)} IS NULL THEN 0 ELSE ${hash} END`;
    }).join(" # ");
    hash = `CAST(sum(${one}) AS text)`;
  }
  const group = partitionBy === null ? "" : ` GROUP BY ${quoteName(partitionBy)}`;
  return `SELECT count(*) AS n, ${hash} AS h FROM (${query}) AS plumb_q${group}`;
}

/** The row count and hash of a fingerprint's rows (one, or one per partition). */
export function combineFingerprint(columns: EngineColumn[]): { n: number; hash: string } {
  const n = columns.find((c) => c.name === "n");
  const h = columns.find((c) => c.name === "h");
  let rows = 0;
  let hash = 0n;
  const count = n?.values.length ?? 0;
  for (let i = 0; i < count; i++) {
    rows += Number(n!.values[i]);
    const v = h?.values[i];
    if (v !== null && v !== undefined && !(typeof v === "number" && Number.isNaN(v))) {
      hash += BigInt(String(v).replace(/\.0*$/, ""));
    }
  }
  return { n: rows, hash: count === 0 ? "empty" : String(hash) };
}

/** Where an engine's refusal belongs: the connection on `database`, the statement on `query`. */
function placeOf(why: string): OptionPath {
  return why === "refused" || why === "query" ? ["query"] : ["database"];
}

/**
 * An engine's answer, or the cell's error in the engine's plain words.
 *
 * @param a The answer.
 * @param ctx For a cancelled run (answered as cancelled through `progress`).
 * @returns The value.
 * @throws {CellError} On the option the failure concerns.
 */
export function engineValue<T>(a: EngineAnswer<T>, ctx: RunContext): T {
  return answer(a, () => ctx.progress(1));
}

function answer<T>(a: EngineAnswer<T>, cancelled: () => void): T {
  if (a.ok) return a.value;
  if (a.why === "cancelled") cancelled();
  throw new CellError(a.message, placeOf(a.why));
}

/** What the table's stamp holds: the query's columns and the fingerprint of its answer. */
interface Stamp {
  columns: { name: string; type: "number" | "text" }[];
  n: number;
  hash: string;
}

/**
 * The table's stamp (`CellKind.stamp`), asked on the main thread when the
 * document is planned: the query's columns (a LIMIT 0 statement) and the
 * fingerprint of its answer, so a changed database reruns the table and what
 * reads it; the run reads it back instead of asking again.
 *
 * @param spec The table's spec.
 * @param ctx Database access.
 * @returns The stamp as JSON text, or null for a table read from a file.
 * @throws {CellError} As {@link readDatabaseTable}: the engine's words on `database` or `query`,
 *   a `partition_by` that names no column.
 */
export function databaseStamp(spec: TableSpec, ctx: StampContext): Promise<string> | null {
  if (spec.source === null) return null;
  return askStamp(spec, ctx.engine, () => {}).then((s) => JSON.stringify(s));
}

async function askStamp(
  spec: TableSpec,
  engine: EngineAccess,
  cancelled: () => void,
): Promise<Stamp> {
  const src = spec.source!;
  const head = answer(
    await engine.rows(src.database, `SELECT * FROM (${src.query}) AS plumb_q LIMIT 0`, 0),
    cancelled,
  );
  for (const [key, column] of [["partition_by", src.partitionBy], ["order_by", src.orderBy]]) {
    if (column !== null && !head.columns.some((c) => c.name === column)) {
      throw new CellError(
        `${key} names "${column}", which is not a column of the query (${
          head.columns.map((c) => c.name).join(", ")
        })`,
        [key!],
      );
    }
  }
  const print = answer(
    await engine.rows(
      src.database,
      fingerprintSql(src.database.engine, src.query, head.columns, src.partitionBy),
      100_000,
    ),
    cancelled,
  );
  const columns = head.columns.map(({ name, type }) => ({ name, type }));
  return { columns, ...combineFingerprint(print.columns) };
}

/** The stamp the run was given, when it is one of this table's. */
function givenStamp(ctx: RunContext): Stamp | null {
  if (ctx.stamp === undefined) return null;
  try {
    const s = JSON.parse(ctx.stamp) as Stamp;
    return Array.isArray(s.columns) && typeof s.n === "number" ? s : null;
  } catch {
    return null;
  }
}

/**
 * Reads a database table.
 *
 * @param spec The table's spec (with `source`).
 * @param ctx The run context; needs `engine`. Its `stamp`, when given, is
 *   the fingerprint asked at planning ({@link databaseStamp}), not asked again.
 * @returns The table, its rows in memory or kept in the engine.
 * @throws {CellError} When no engine can be reached, the engine refuses or
 *   fails (in its words, on `database` or `query`), a unit names no column,
 *   or a column forced to numbers holds text.
 */
export async function readDatabaseTable(spec: TableSpec, ctx: RunContext): Promise<TableOutput> {
  const src = spec.source!;
  const engine = ctx.engine;
  if (engine === undefined) {
    throw new CellError("This table queries a database, which cannot be reached from here", [
      "database",
    ]);
  }
  const { columns: head, n, hash } = givenStamp(ctx) ??
    await askStamp(spec, engine, () => ctx.progress(1));
  const fingerprint = `${n}:${hash}`;
  const kept = src.keep === "database" || (src.keep === "auto" && n > LOAD_ROWS);
  const columns = kept
    ? await keptColumns(engine, spec, head, ctx)
    : typedColumns(engineValue(await engine.rows(src.database, inOrder(src), n), ctx), spec);
  checkUnits(spec.units, columns.map((c) => c.name));
  const rows = new Int32Array(kept ? 0 : n);
  for (let i = 0; i < rows.length; i++) rows[i] = i + 1;
  ctx.progress(1);
  return {
    type: "Table",
    columns,
    rows,
    rowsRead: n,
    excluded: [],
    sha256: null,
    source: null,
    rowsFiltered: 0,
    ...(kept ? { keptIn: `its ${n.toLocaleString("en-US")} rows stay in the database` } : {}),
    database: {
      ref: src.database,
      query: src.query,
      partitionBy: src.partitionBy,
      orderBy: src.orderBy,
      fingerprint,
      kept,
      rowsInEngine: n,
    },
  };
}

/** The query's rows in `order_by`'s order (ties in the engine's order), or as the query gives them. */
function inOrder(src: NonNullable<TableSpec["source"]>): string {
  if (src.orderBy === null) return src.query;
  return `SELECT * FROM (${src.query}) AS plumb_q ORDER BY ${quoteName(src.orderBy)}`;
}

/** A column's sum over the answer's rows (one, or one per partition). */
function numberAt(columns: EngineColumn[], name: string): number {
  const c = columns.find((c) => c.name === name);
  let s = 0;
  for (const v of c?.values ?? []) s += Number(v ?? 0);
  return s;
}

/** The engine's columns as the table's, with units and forced types. */
function typedColumns(got: { columns: EngineColumn[] }, spec: TableSpec): Column[] {
  return got.columns.map((c): Column => {
    const unit = ownValue(spec.units, c.name) ?? null;
    const forced = ownValue(spec.types, c.name);
    if (c.type === "number") {
      if (forced === "text") {
        const values = Array.from(c.values, (v) => (Number.isNaN(v) ? null : String(v)));
        return { name: c.name, type: "text", unit, values, missing: countNull(values) };
      }
      let missing = 0;
      for (let i = 0; i < c.values.length; i++) if (Number.isNaN(c.values[i])) missing++;
      return { name: c.name, type: "number", unit, values: c.values, lo: null, missing };
    }
    if (forced === "number") {
      const bad = c.values.findIndex((v) => v !== null && !Number.isFinite(Number(v)));
      if (bad >= 0) {
        throw new CellError(
          `Column "${c.name}" holds text where numbers are needed (row ${bad + 1}: ${
            JSON.stringify(String(c.values[bad]).slice(0, 40))
          }): convert it in the query, e.g. CAST(${quoteName(c.name)} AS DOUBLE PRECISION)`,
          ["types", c.name],
        );
      }
      const values = Float64Array.from(c.values, (v) => (v === null ? NaN : Number(v)));
      let missing = 0;
      for (let i = 0; i < values.length; i++) if (Number.isNaN(values[i])) missing++;
      return { name: c.name, type: "number", unit, values, lo: null, missing };
    }
    return { name: c.name, type: "text", unit, values: c.values, missing: countNull(c.values) };
  });
}

function countNull(values: (string | null)[]): number {
  let n = 0;
  for (const v of values) if (v === null) n++;
  return n;
}

/** Names, types, units and missing counts of a table kept in its engine (no values). */
async function keptColumns(
  engine: EngineAccess,
  spec: TableSpec,
  head: readonly { name: string; type: "number" | "text" }[],
  ctx: RunContext,
): Promise<Column[]> {
  const src = spec.source!;
  const counts = head.map((c, i) => `count(${quoteName(c.name)}) AS c${i}`);
  // Per partition where there is one, so each shard counts its own rows.
  const group = src.partitionBy === null ? "" : ` GROUP BY ${quoteName(src.partitionBy)}`;
  const got = counts.length === 0 ? null : engineValue(
    await engine.rows(
      src.database,
      `SELECT count(*) AS n, ${counts.join(", ")} FROM (${src.query}) AS plumb_q${group}`,
      100_000,
    ),
    ctx,
  );
  const n = got === null ? 0 : numberAt(got.columns, "n");
  return head.map((c, i): Column => {
    const unit = ownValue(spec.units, c.name) ?? null;
    const missing = got === null ? 0 : n - numberAt(got.columns, `c${i}`);
    const forced = ownValue(spec.types, c.name);
    return (forced ?? c.type) === "number"
      ? { name: c.name, type: "number", unit, values: new Float64Array(0), lo: null, missing }
      : { name: c.name, type: "text", unit, values: [], missing };
  });
}
