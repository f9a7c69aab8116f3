/**
 * An expression of the language as SQL text that DuckDB and PostgreSQL
 * evaluate as Plumb does, so a database can compute a model's terms where
 * the rows live.
 *
 * ```
 *  log(y)          ─▶ CASE WHEN (Y) > 0 THEN ln(Y) END           Y = CAST("y" AS DOUBLE PRECISION)
 *  b*x^2 (term x^2) ─▶ CASE WHEN … THEN NULL ELSE power(X, CAST('2' AS DOUBLE PRECISION)) END
 *  a/x             ─▶ (A / CASE WHEN X <> CAST('0' AS DOUBLE PRECISION) THEN X END)
 * ```
 *
 * The rules, each checked against both engines (kernel/expr/to_sql_test.ts
 * runs the text through DuckDB against Plumb's evaluator, and through
 * PostgreSQL 15 against DuckDB where PostgreSQL is installed):
 *
 * - Every column is cast to DOUBLE PRECISION (an integer column never
 *   divides as integers) and named in double quotes, a quote inside doubled.
 * - A number is the cast of its shortest round-trip text (`'0.1'`): both
 *   engines read a string as the correctly rounded double (DuckDB through
 *   fast_float, PostgreSQL through strtod), where a bare `0.1` is a DECIMAL
 *   in DuckDB and NUMERIC in PostgreSQL first.
 * - `log` is the natural logarithm: SQL's `ln`. PostgreSQL's `log(x)` is
 *   base 10 (and DuckDB's too), so the word `log(` never appears in the SQL;
 *   `log10` is `log10` in both.
 * - `^` and `pow` are `power(a, b)`: `^` means power in PostgreSQL and in
 *   DuckDB, but not in every engine that speaks PostgreSQL's dialect.
 * - Where Plumb gives a value that is not finite (log of 0 or of a negative
 *   number, sqrt of a negative number, division by 0, 0 to a negative power,
 *   a negative number to a fractional power, exp past 709.78) the SQL gives
 *   NULL, and the caller counts the row as not finite. Both engines raise an
 *   error there instead (PostgreSQL: "cannot take logarithm of zero"; DuckDB:
 *   "Out of Range Error: cannot take logarithm of zero"), which would stop
 *   the whole statement. exp below −745.133 is 0, as in Plumb (PostgreSQL
 *   raises "value out of range: underflow" there).
 * - `min` and `max` are CASE comparisons, and so is the division's guard:
 *   `least`, `greatest` and `NULLIF` would do, but postgres_fdw (PostgreSQL
 *   15) sends no expression holding them to a shard, so a sharded engine
 *   would aggregate on the coordinator (measured). Where an argument can be
 *   NULL (it holds one of the guarded functions) the call is NULL when
 *   either is, as Plumb's NaN would spread.
 * - Not covered: overflow and underflow of products, quotients and powers.
 *   Plumb gives ∞ or 0, DuckDB too, PostgreSQL raises an error ("value out
 *   of range: underflow" for `1e-300 * 1e-300`), so there such a statement
 *   fails with the engine's words. An ∞ is not finite to the caller, as
 *   NULL is.
 *
 * An expression that has no faithful SQL (an internal function of
 * derivatives, a text column, a name that is not a column) gives null and
 * the reason, so the caller can compute in memory instead.
 *
 * @module
 */
import type { Expr } from "./expr.ts";
import { CONSTANTS } from "./functions.ts";

/** The SQL dialects written for. */
export type SqlDialect = "duckdb" | "postgres";

/** A column of the query an expression reads: its name and whether it holds numbers. */
export type SqlColumns = ReadonlyMap<string, "number" | "text">;

/** An expression's SQL, or why there is none. */
export type SqlText =
  | {
    sql: string;
    /** Columns the expression reads, in first-appearance order. */
    columns: string[];
    /** True when the SQL can be NULL on a row whose columns are all present. */
    nullable: boolean;
  }
  | { sql: null; why: string };

/** Longest SQL text of one expression (guards repeat their argument, so nesting doubles it). */
export const MAX_SQL_LENGTH = 200_000;

const D = "DOUBLE PRECISION";

/** exp(x) is finite up to here and Infinity past it (IEEE double; checked in the test). */
export const EXP_MAX = 709.782712893384;
/** exp(x) is 0 at and below here (IEEE double, round to nearest; checked in the test). */
export const EXP_ZERO = -745.1332191019412;

/**
 * The language's functions that have a faithful SQL form, with their form.
 * Each is given the SQL of its arguments and whether they can be NULL.
 */
const FORMS: Record<string, (a: string[], nullable: boolean) => string> = {
  exp: ([x]) =>
    `CASE WHEN ${x} > ${sqlNumber(EXP_MAX)} THEN NULL WHEN ${x} <= ${sqlNumber(EXP_ZERO)} THEN ${
      sqlNumber(0)
    } ELSE exp(${x}) END`,
  log: ([x]) => `CASE WHEN ${x} > ${sqlNumber(0)} THEN ln(${x}) END`,
  log10: ([x]) => `CASE WHEN ${x} > ${sqlNumber(0)} THEN log10(${x}) END`,
  sqrt: ([x]) => `CASE WHEN ${x} >= ${sqlNumber(0)} THEN sqrt(${x}) END`,
  abs: ([x]) => `abs(${x})`,
  sin: ([x]) => `sin(${x})`,
  cos: ([x]) => `cos(${x})`,
  tan: ([x]) => `tan(${x})`,
  atan: ([x]) => `atan(${x})`,
  tanh: ([x]) => `tanh(${x})`,
  pow: ([a, b]) => power(a, b),
  min: ([a, b], nullable) => pick(a, b, "<=", nullable),
  max: ([a, b], nullable) => pick(a, b, ">=", nullable),
  // DuckDB's sign gives TINYINT, PostgreSQL's a double: cast alike.
  sign: ([x]) => `CAST(sign(${x}) AS ${D})`,
};

/** Functions of the language written in SQL, in the order of kernel/expr/functions.ts. */
export const SQL_FUNCTIONS: readonly string[] = Object.keys(FORMS);

/** Functions whose SQL can be NULL where every argument is present. */
const GUARDED = new Set(["exp", "log", "log10", "sqrt", "pow"]);

function power(a: string, b: string): string {
  // NaN in Plumb (negative base, fractional exponent) and ∞ (0 to a negative power): NULL.
  return `CASE WHEN (${a} < ${sqlNumber(0)} AND ${b} <> floor(${b})) OR (${a} = ${
    sqlNumber(0)
  } AND ${b} < ${sqlNumber(0)}) THEN NULL ELSE power(${a}, ${b}) END`;
}

/** min (`<=`) or max (`>=`) of two values; NULL when either is, where either can be. */
function pick(a: string, b: string, op: "<=" | ">=", nullable: boolean): string {
  const absent = nullable ? `WHEN ${a} IS NULL OR ${b} IS NULL THEN NULL ` : "";
  return `CASE ${absent}WHEN ${a} ${op} ${b} THEN ${a} ELSE ${b} END`;
}

/**
 * A quoted SQL name: double quotes, a quote inside doubled.
 *
 * @param name The name.
 * @returns The quoted name.
 * @example
 * ```ts
 * import { sqlName } from "./to_sql.ts";
 * if (sqlName('a"b') !== '"a""b"') throw new Error(sqlName('a"b'));
 * ```
 */
export function sqlName(name: string): string {
  return `"${name.replaceAll('"', '""')}"`;
}

/**
 * A finite double as SQL both engines read back to the same double: the
 * cast of its shortest round-trip text.
 *
 * @param v The number.
 * @returns The SQL.
 * @throws {RangeError} For NaN or an infinity (which no model needs as a literal).
 * @example
 * ```ts
 * import { sqlNumber } from "./to_sql.ts";
 * if (sqlNumber(0.1) !== "CAST('0.1' AS DOUBLE PRECISION)") throw new Error(sqlNumber(0.1));
 * ```
 */
export function sqlNumber(v: number): string {
  if (!Number.isFinite(v)) throw new RangeError(`${v} has no SQL literal`);
  return `CAST('${Object.is(v, -0) ? "-0" : String(v)}' AS ${D})`;
}

/**
 * The SQL of an expression over a query's columns.
 *
 * @param e The expression (parameters must already be gone: a linear model's terms).
 * @param columns The query's columns and their types.
 * @param dialect The engine's dialect (both give the same text today; kept so that a
 *   difference found later has its place).
 * @returns The SQL text, the columns it reads and whether it can be NULL; or null and why.
 * @example
 * ```ts
 * import { toSql } from "./to_sql.ts";
 * import { parseExpression } from "./mod.ts";
 * const s = toSql(parseExpression("log(x)"), new Map([["x", "number"]]), "postgres");
 * if (s.sql === null || !s.sql.includes("ln(") || s.sql.includes("log(")) throw new Error("log is ln");
 * ```
 */
export function toSql(e: Expr, columns: SqlColumns, dialect: SqlDialect): SqlText {
  const used: string[] = [];
  try {
    const w = walk(e, columns, used, dialect);
    return { sql: w.sql, columns: used, nullable: w.nullable };
  } catch (err) {
    if (err instanceof NoSql) return { sql: null, why: err.message };
    throw err;
  }
}

class NoSql extends Error {}

interface Walked {
  sql: string;
  nullable: boolean;
}

function walk(e: Expr, columns: SqlColumns, used: string[], dialect: SqlDialect): Walked {
  const out = node(e, columns, used, dialect);
  if (out.sql.length > MAX_SQL_LENGTH) {
    throw new NoSql(`its SQL would be longer than ${MAX_SQL_LENGTH} characters`);
  }
  return out;
}

function node(e: Expr, columns: SqlColumns, used: string[], dialect: SqlDialect): Walked {
  const sub = (x: Expr) => walk(x, columns, used, dialect);
  switch (e.op) {
    case "num":
      return { sql: sqlNumber(e.value), nullable: false };
    case "id": {
      // Constant names are reserved (functions.ts): `e` is Euler's number even beside a column e.
      const c = CONSTANTS.get(e.name);
      if (c !== undefined) return { sql: sqlNumber(c), nullable: false };
      const type = columns.get(e.name);
      if (type === undefined) throw new NoSql(`"${e.name}" is not a column of the query`);
      if (type === "text") throw new NoSql(`column "${e.name}" holds text`);
      if (!used.includes(e.name)) used.push(e.name);
      return { sql: `CAST(${sqlName(e.name)} AS ${D})`, nullable: false };
    }
    case "neg": {
      const a = sub(e.arg);
      return { sql: `(-${a.sql})`, nullable: a.nullable };
    }
    case "+":
    case "-":
    case "*": {
      const a = sub(e.left), b = sub(e.right);
      return { sql: `(${a.sql} ${e.op} ${b.sql})`, nullable: a.nullable || b.nullable };
    }
    case "/": {
      const a = sub(e.left), b = sub(e.right);
      // x/0 is ±∞ or NaN in Plumb: NULL here (PostgreSQL raises "division by zero").
      return {
        sql: `(${a.sql} / CASE WHEN ${b.sql} <> ${sqlNumber(0)} THEN ${b.sql} END)`,
        nullable: true,
      };
    }
    case "^": {
      const a = sub(e.left), b = sub(e.right);
      return { sql: power(a.sql, b.sql), nullable: true };
    }
    case "call": {
      const form = FORMS[e.fn];
      if (form === undefined) {
        throw new NoSql(`the function ${e.fn} has no SQL form that means the same in both engines`);
      }
      const args = e.args.map(sub);
      const nullable = args.some((a) => a.nullable);
      return {
        sql: form(args.map((a) => a.sql), nullable),
        nullable: nullable || GUARDED.has(e.fn),
      };
    }
  }
}
