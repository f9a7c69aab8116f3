import assert from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { tableKind } from "./mod.ts";
import { parseCtx } from "./_testing.ts";

function refused(options: Record<string, unknown>): CellError {
  try {
    tableKind.parse(parseCtx(options));
  } catch (e) {
    assert.ok(e instanceof CellError, `expected CellError, got ${e}`);
    return e;
  }
  throw new Error("expected a refusal");
}

Deno.test("a database table: a DuckDB file beside the document or a PostgreSQL URL named by its variable", () => {
  const duck = tableKind.parse(parseCtx({
    database: "plant.duckdb",
    query: "  SELECT cycle, capacity FROM cells ",
    units: { capacity: "mAh" },
  }));
  assert.deepEqual(duck.source, {
    database: { engine: "duckdb", file: "plant.duckdb" },
    query: "SELECT cycle, capacity FROM cells",
    partitionBy: null,
    orderBy: null,
    keep: "auto",
  });
  assert.deepEqual(duck.units, { capacity: "mAh" });
  const pg = tableKind.parse(parseCtx({
    database: { url_from: "PLANT_DB" },
    query: "SELECT part, x, y FROM readings",
    partition_by: "part",
    order_by: " cycle ",
  }));
  assert.deepEqual(pg.source?.database, { engine: "postgres", urlFrom: "PLANT_DB" });
  assert.equal(pg.source?.partitionBy, "part");
  assert.equal(pg.source?.orderBy, "cycle");
  assert.equal(tableKind.files!(pg).length, 0, "a query reads no file");
});

Deno.test("a database table refuses what belongs in its query, a file at the same time, and a bad variable", () => {
  const q = "SELECT x, y FROM t";
  assert.deepEqual(refused({ database: "a.duckdb", query: q, where: "x > 1" }).path, ["where"]);
  assert.match(
    refused({ database: "a.duckdb", query: q, exclude: [{ rows: [1], why: "w" }] }).message,
    /WHERE clause/,
  );
  assert.deepEqual(refused({ database: "a.duckdb", query: q, from: "d.csv" }).path, ["from"]);
  assert.deepEqual(refused({ database: "a.duckdb", query: q, order_by: 3 }).path, ["order_by"]);
  assert.deepEqual(refused({ from: "d.csv", order_by: "t" }).path, ["order_by"]);
  assert.deepEqual(refused({ database: "a.duckdb", query: q, delimiter: ";" }).path, ["delimiter"]);
  assert.deepEqual(refused({ database: "../elsewhere.duckdb", query: q }).path, ["database"]);
  assert.deepEqual(refused({ database: { url_from: "1BAD" }, query: q }).path, [
    "database",
    "url_from",
  ]);
  assert.deepEqual(refused({ database: { url: "postgres://u:p@h/db" }, query: q }).path, [
    "database",
    "url",
  ]);
  assert.match(refused({ database: "a.duckdb" }).message, /needs a query/);
  assert.deepEqual(refused({ from: "d.csv", query: q }).path, ["query"]);
});

Deno.test("a query that is not one read-only SELECT is refused at its place, before any engine sees it", () => {
  const e = refused({ database: "a.duckdb", query: "SELECT 1; DELETE FROM t" });
  assert.deepEqual(e.path, ["query"]);
  assert.match(e.message, /one SELECT/);
  assert.ok(e.offset !== undefined && e.offset >= 8, `offset ${e.offset}`);
  const w = refused({ database: "a.duckdb", query: "INSERT INTO t VALUES (1)" });
  assert.deepEqual(w.path, ["query"]);
});
