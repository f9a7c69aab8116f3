import assert from "node:assert/strict";
import { DuckDBInstance } from "@duckdb/node-api";
import { compile } from "./compile.ts";
import type { Expr } from "./expr.ts";
import { parseExpression } from "./parse_expression.ts";
import {
  EXP_MAX,
  EXP_ZERO,
  MAX_SQL_LENGTH,
  SQL_FUNCTIONS,
  type SqlColumns,
  sqlName,
  sqlNumber,
  toSql,
} from "./to_sql.ts";
import { postgresInstalled, startCluster } from "../../test/engine/_cluster.ts";

const XY: SqlColumns = new Map([["x", "number"], ["y", "number"]]);

/**
 * x and y over a grid with the domain edges of every function (0, ±, tiny, huge); `moderate`
 * leaves out the tiny values, whose products PostgreSQL refuses ("value out of range:
 * underflow", to_sql.ts's module notes).
 */
function grid(moderate = false): { x: number[]; y: number[] } {
  const values = [
    0,
    -0,
    1,
    -1,
    0.5,
    -0.5,
    2,
    -2.5,
    3,
    0.1,
    1 / 3,
    7.25,
    -8,
    1e-300,
    -1e-310,
    12.5,
    100,
    1e10,
    -1e10,
    700,
    710,
    -746,
    -745,
  ];
  const x: number[] = [], y: number[] = [];
  for (const a of values.filter((v) => !moderate || v === 0 || Math.abs(v) > 1e-100)) {
    for (const b of [0, 1, -1, 2, 0.5, -2, 3, 1 / 3, 10]) x.push(a), y.push(b);
  }
  return { x, y };
}

/** Each expression's SQL evaluated by DuckDB over the grid (NULL as NaN), row by row. */
async function duckValues(sqls: string[], x: number[], y: number[]): Promise<number[][]> {
  const db = await DuckDBInstance.create(":memory:");
  const con = await db.connect();
  try {
    await con.run("CREATE TABLE g (i INTEGER, x DOUBLE, y DOUBLE)");
    const app = await con.createAppender("g");
    x.forEach((v, i) => {
      app.appendInteger(i);
      app.appendDouble(v);
      app.appendDouble(y[i]);
      app.endRow();
    });
    app.closeSync();
    const out: number[][] = [];
    for (const sql of sqls) {
      const r = await con.runAndReadAll(`SELECT ${sql} FROM g ORDER BY i`);
      out.push(r.getRows().map((row) => (row[0] === null ? NaN : Number(row[0]))));
    }
    return out;
  } finally {
    con.closeSync();
    db.closeSync();
  }
}

/** The expressions checked: every function of SQL_FUNCTIONS and every operator. */
const CASES: { text: string; exact: boolean }[] = [
  // Correctly rounded in IEEE arithmetic (IEEE 754 §5.4: +, −, ×, ÷, sqrt), or exact.
  { text: "x + y", exact: true },
  { text: "x - y", exact: true },
  { text: "x * y", exact: true },
  { text: "x / y", exact: true },
  { text: "-x", exact: true },
  { text: "sqrt(x)", exact: true },
  { text: "abs(x)", exact: true },
  { text: "min(x, y)", exact: true },
  { text: "max(x, y)", exact: true },
  { text: "min(log(x), y)", exact: false },
  { text: "max(y, sqrt(x))", exact: true },
  // Library functions (V8's against the C library's): 1e-15 relative.
  { text: "exp(x)", exact: false },
  { text: "log(x)", exact: false },
  { text: "log10(x)", exact: false },
  { text: "sin(x)", exact: false },
  { text: "cos(x)", exact: false },
  { text: "tan(x)", exact: false },
  { text: "atan(x)", exact: false },
  { text: "tanh(x)", exact: false },
  { text: "pow(x, y)", exact: false },
  { text: "x^y", exact: false },
  { text: "x^2 - 3*x/y", exact: false },
  { text: "exp(-x^2/2)/sqrt(2*pi)", exact: false },
];

Deno.test("toSql() gives in DuckDB what Plumb's evaluator gives, and no finite value where it has none", async () => {
  const { x, y } = grid();
  const exprs = CASES.map((c) => parseExpression(c.text));
  const sqls = exprs.map((e) => {
    const s = toSql(e, XY, "duckdb");
    assert.ok(s.sql !== null, `${format(e)}: ${s.sql === null ? s.why : ""}`);
    return s.sql;
  });
  const got = await duckValues(sqls, x, y);
  CASES.forEach((c, k) => {
    const want = compile(exprs[k], ["x", "y"], [])(
      [Float64Array.from(x), Float64Array.from(y)],
      [],
      x.length,
    );
    want.forEach((w, i) => {
      const g = got[k][i], at = `${c.text} at x = ${x[i]}, y = ${y[i]}`;
      if (!Number.isFinite(w)) assert.ok(!Number.isFinite(g), `${at}: Plumb ${w}, SQL ${g}`);
      else if (c.exact || w === 0) assert.ok(Object.is(g, w) || g === w, `${at}: ${g} vs ${w}`);
      // Source: common practice, no source (two libraries' functions within a few ulps).
      else assert.ok(Math.abs(g - w) <= 1e-15 * Math.abs(w), `${at}: ${g} vs ${w}`);
    });
  });
  // Every function written in SQL is among the cases.
  for (const fn of SQL_FUNCTIONS.filter((f) => f !== "sign")) {
    assert.ok(CASES.some((c) => c.text.includes(`${fn}(`)), fn);
  }
});

function format(e: Expr): string {
  return JSON.stringify(e).slice(0, 60);
}

Deno.test("sqlNumber() reads back as the same double in DuckDB", async () => {
  const values = [
    0.1,
    1 / 3,
    0.30000000000000004,
    5e-324,
    2.2250738585072014e-308,
    1.7976931348623157e308,
    123456789012345680000,
    -2.5e-7,
    Math.PI,
    EXP_MAX,
    EXP_ZERO,
  ];
  const [got] = await duckValues([`CAST(${sqlNumber(0)} AS DOUBLE)`], [0], [0]);
  assert.equal(got[0], 0);
  const db = await DuckDBInstance.create(":memory:");
  const con = await db.connect();
  try {
    for (const v of values) {
      const r = await con.runAndReadAll(`SELECT ${sqlNumber(v)}`);
      assert.equal(r.getRows()[0][0], v, String(v)); // exact: correctly rounded parse
    }
  } finally {
    con.closeSync();
    db.closeSync();
  }
  assert.equal(sqlNumber(-0), "CAST('-0' AS DOUBLE PRECISION)");
  assert.throws(() => sqlNumber(NaN), RangeError);
  // The limits of exp in doubles (IEEE 754 binary64, round to nearest; V8's Math.exp here).
  assert.ok(Number.isFinite(Math.exp(EXP_MAX)) && !Number.isFinite(Math.exp(EXP_MAX + 2e-13)));
  assert.ok(Math.exp(EXP_ZERO) === 0 && Math.exp(EXP_ZERO + 2e-13) > 0);
});

Deno.test("toSql() casts integer columns, keeps e for Euler's number and quotes names", async () => {
  const db = await DuckDBInstance.create(":memory:");
  const con = await db.connect();
  try {
    await con.run(`CREATE TABLE t (n INTEGER, d INTEGER, e INTEGER, "odd""name" INTEGER)`);
    await con.run(`INSERT INTO t VALUES (7, 2, 5, 3)`);
    const cols: SqlColumns = new Map([["n", "number"], ["d", "number"], ["e", "number"], [
      'odd"name',
      "number",
    ]]);
    const ask = async (e: Expr) => {
      const s = toSql(e, cols, "duckdb");
      assert.ok(s.sql !== null);
      return (await con.runAndReadAll(`SELECT ${s.sql} FROM t`)).getRows()[0][0];
    };
    assert.equal(await ask(parseExpression("n/d")), 3.5); // exact arithmetic: 7/2
    assert.equal(await ask(parseExpression("e")), Math.E); // the constant, not column e
    const odd: Expr = { op: "id", name: 'odd"name', start: 0, end: 1 };
    assert.equal(await ask(odd), 3);
    assert.equal(sqlName('odd"name'), '"odd""name"');
  } finally {
    con.closeSync();
    db.closeSync();
  }
});

Deno.test("toSql() writes log as ln in both dialects and says why it cannot write the rest", () => {
  const cols: SqlColumns = new Map([["x", "number"], ["label", "text"]]);
  for (const dialect of ["duckdb", "postgres"] as const) {
    const s = toSql(parseExpression("log(x) + log10(x)"), cols, dialect);
    assert.ok(s.sql !== null);
    // PostgreSQL's log(x) is base 10 (PostgreSQL 15 manual, §9.3, Table 9.5): never written.
    assert.ok(!/\blog\(/.test(s.sql), s.sql);
    assert.match(s.sql, /\bln\(/);
    assert.match(s.sql, /\blog10\(/);
    assert.deepEqual(s.columns, ["x"]);
  }
  assert.deepEqual(toSql(parseExpression("2*label"), cols, "postgres"), {
    sql: null,
    why: 'column "label" holds text',
  });
  assert.deepEqual(toSql(parseExpression("z + 1"), cols, "duckdb"), {
    sql: null,
    why: '"z" is not a column of the query',
  });
  const internal: Expr = {
    op: "call",
    fn: "zmul",
    args: [parseExpression("x"), parseExpression("x")],
    start: 0,
    end: 1,
  };
  assert.deepEqual(toSql(internal, cols, "duckdb"), {
    sql: null,
    why: "the function zmul has no SQL form that means the same in both engines",
  });
  let deep = "x";
  for (let i = 0; i < 20; i++) deep = `log(${deep})`;
  const long = toSql(parseExpression(deep), cols, "duckdb");
  assert.deepEqual(long, {
    sql: null,
    why: `its SQL would be longer than ${MAX_SQL_LENGTH} characters`,
  });
});

Deno.test({
  name: "toSql() gives in PostgreSQL 15 what it gives in DuckDB",
  ignore: !postgresInstalled(),
  sanitizeResources: false,
  sanitizeOps: false,
  fn: async () => {
    const { x, y } = grid(true);
    const exprs = CASES.map((c) => parseExpression(c.text));
    const sqls = exprs.map((e) => toSql(e, XY, "postgres")).map((s) => s.sql!);
    const duck = await duckValues(sqls, x, y);
    const cluster = await startCluster(0);
    try {
      const rows = x.map((v, i) => `(${i}, ${sqlNumber(v)}, ${sqlNumber(y[i])})`).join(", ");
      const out = await cluster.psql(
        `SELECT ${
          sqls.map((s) => `(${s})::text`).join(", ")
        } FROM (VALUES ${rows}) AS g(i, x, y) ORDER BY i`,
      );
      const lines = out.trimEnd().split("\n").map((l) => l.split("|"));
      assert.equal(lines.length, x.length);
      CASES.forEach((c, k) => {
        lines.forEach((cells, i) => {
          const pg = cells[k] === "" ? NaN : Number(cells[k]);
          const d = duck[k][i], at = `${c.text} at x = ${x[i]}, y = ${y[i]}`;
          if (!Number.isFinite(d)) assert.ok(!Number.isFinite(pg), `${at}: PostgreSQL ${pg}`);
          // Source: common practice, no source (the same C library under both engines).
          else assert.ok(Math.abs(pg - d) <= 1e-15 * Math.abs(d), `${at}: ${pg} vs ${d}`);
        });
      });
    } finally {
      await cluster.stop();
    }
  },
});
