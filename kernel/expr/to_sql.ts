/**
 * An expression of the language as SQL that DuckDB and PostgreSQL evaluate
 * the same way: numbers as double precision literals (shortest round-trip
 * text, read back to the same double by both), columns as quoted names cast
 * to double precision, the functions both engines have with the meaning
 * Plumb gives them (`log` is the natural logarithm: SQL's `ln`). An
 * expression with no faithful SQL gives null and the reason.
 *
 * @module
 */
import type { Expr } from "./expr.ts";

/** SQL function for each language function that both engines have alike. */
const SQL_FUNCTIONS: Record<string, string> = {
  exp: "exp",
  log: "ln",
  log10: "log10",
  sqrt: "sqrt",
  abs: "abs",
  sin: "sin",
  cos: "cos",
  tan: "tan",
  atan: "atan",
  pow: "power",
  min: "least",
  max: "greatest",
  sign: "sign",
};

/** A quoted SQL name (double quotes, doubled inside): both engines read it so. */
export function sqlName(name: string): string {
  return `"${name.replaceAll('"', '""')}"`;
}

/** A double as SQL text both engines read back exactly. */
export function sqlNumber(v: number): string {
  if (!Number.isFinite(v)) throw new Error(`${v} has no SQL literal`);
  return `CAST(${String(v)} AS DOUBLE PRECISION)`;
}

/**
 * The SQL of an expression over columns.
 *
 * @param e The expression.
 * @param columns The names that are columns (others: the constants pi and e).
 * @returns The SQL text, or the reason there is none.
 * @example
 * ```ts
 * import { toSql } from "./to_sql.ts";
 * import { parseExpression } from "./mod.ts";
 * const s = toSql(parseExpression("log(x)^2"), new Set(["x"]));
 * if (!("sql" in s) || !s.sql.includes("ln(")) throw new Error("log is ln in SQL");
 * ```
 */
export function toSql(e: Expr, columns: ReadonlySet<string>): { sql: string } | { why: string } {
  try {
    return { sql: walk(e, columns) };
  } catch (err) {
    return { why: (err as Error).message };
  }
}

function walk(e: Expr, columns: ReadonlySet<string>): string {
  switch (e.op) {
    case "num":
      return sqlNumber(e.value);
    case "id":
      if (columns.has(e.name)) return `CAST(${sqlName(e.name)} AS DOUBLE PRECISION)`;
      if (e.name === "pi") return sqlNumber(Math.PI);
      if (e.name === "e") return sqlNumber(Math.E);
      throw new Error(`"${e.name}" is neither a column nor a constant`);
    case "neg":
      return `(-${walk(e.arg, columns)})`;
    case "+":
    case "-":
    case "*":
    case "/":
      return `(${walk(e.left, columns)} ${e.op} ${walk(e.right, columns)})`;
    case "^":
      return `power(${walk(e.left, columns)}, ${walk(e.right, columns)})`;
    case "call": {
      const fn = SQL_FUNCTIONS[e.fn];
      if (fn === undefined) throw new Error(`the function ${e.fn} has no SQL counterpart here`);
      return `${fn}(${e.args.map((a) => walk(a, columns)).join(", ")})`;
    }
    default:
      throw new Error("an expression node SQL does not know");
  }
}
