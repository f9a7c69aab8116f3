/**
 * The table block of a database table (cells/table/view.tsx): the engine,
 * the file or the variable's name (never a URL), the query as written and
 * the fingerprint, which the record keeps since a database has no file to
 * hash. The result is written by hand in the shape of `TableResult`.
 */
import { doesNotMatch, match } from "node:assert/strict";
import { renderToString } from "preact-render-to-string";
import { h } from "preact";
import { TableView } from "../../cells/table/view.tsx";
import type { TableResult } from "../../cells/table/summary.ts";

function result(database: TableResult["database"]): TableResult {
  return {
    rows_read: 3,
    rows_used: 3,
    excluded: [],
    columns: [{ name: "x", type: "number", unit: null, missing: 0 }],
    sha256: null,
    source: null,
    rows_filtered: 0,
    rows_missing: [],
    database,
  };
}

Deno.test("a database table shows its engine, its query and its fingerprint; a PostgreSQL one names only the variable", () => {
  const duck = renderToString(h(TableView, {
    name: "t",
    result: result({
      engine: "duckdb",
      file: "plant.duckdb",
      url_from: null,
      query: "SELECT x FROM readings WHERE x < 3",
      partition_by: null,
      order_by: null,
      fingerprint: "3:918273645",
      kept: false,
    }),
  }));
  match(duck, /DuckDB file <code>plant\.duckdb<\/code>/);
  match(duck, /SELECT x FROM readings WHERE x &lt; 3/);
  match(duck, /fingerprint 3:918273645/);
  doesNotMatch(duck, /kept in the database/);
  const pg = renderToString(h(TableView, {
    name: "t",
    result: result({
      engine: "postgres",
      file: null,
      url_from: "PLANT_DB",
      query: "SELECT x FROM readings",
      partition_by: "part",
      order_by: null,
      fingerprint: "10000000:12345678901234567890123456789",
      kept: true,
    }),
  }));
  match(pg, /PostgreSQL at the URL in <code>PLANT_DB<\/code>/);
  match(pg, /rows kept in the database/);
  match(pg, /fingerprint 10000000:123456789012345(<!-- -->)?…/);
  doesNotMatch(pg, /postgresql:\/\//);
});
