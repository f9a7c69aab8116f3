import { equal, ok } from "node:assert/strict";
import { checkQuery } from "./guard.ts";

Deno.test("checkQuery() lets one read-only SELECT through, whatever its strings and comments say", () => {
  const pass = [
    "SELECT cycle, capacity FROM cells WHERE cell_id = 7",
    "select * from t;",
    "SELECT 1; -- DELETE FROM t",
    "SELECT 1 /* ; DROP TABLE t; */",
    "WITH a AS (SELECT x FROM t) SELECT avg(x) FROM a",
    "VALUES (1, 2), (3, 4)",
    "SELECT 'it''s; DELETE FROM t' AS note",
    'SELECT "update", "into" FROM "my table"',
    "SELECT $$; DROP TABLE t;$$ AS body, $q$x$q$ AS y",
    "SELECT load, comment, copy FROM tests /* nested /* comment */ still */",
    "SELECT E'a\\'; DELETE' AS s",
  ];
  for (const q of pass) equal(checkQuery(q), null, q);
});

Deno.test("checkQuery() refuses writes, definitions, second statements, locks and file readers at their place", () => {
  const refused: [string, string][] = [
    ["SELECT 1; DELETE FROM t", ";"],
    ["DELETE FROM t", "DELETE"],
    ["INSERT INTO t VALUES (1)", "INSERT"],
    ["WITH gone AS (DELETE FROM t RETURNING *) SELECT * FROM gone", "DELETE"],
    ["SELECT * INTO copy_of_t FROM t", "INTO"],
    ["SELECT * FROM t FOR UPDATE", "FOR"],
    ["SELECT * FROM t FOR SHARE", "FOR"],
    ["SELECT * FROM read_csv('/etc/hostname')", "read_csv"],
    ["SELECT * FROM '/etc/hostname'", "'/etc/hostname'"],
    ["SELECT pg_read_file('/etc/hostname')", "pg_read_file"],
    ["SELECT setval('s', 1)", "setval"],
    ["SELECT set_config('default_transaction_read_only', 'off', false)", "set_config"],
    ["CREATE TABLE t (x int)", "CREATE"],
    ["SET x = 1", "SET"],
    ["ATTACH 'other.duckdb'", "ATTACH"],
    ["SELECT 1;;", ";"],
    ["SELECT 'open", "'open"],
    ["SELECT 1 /* open", "/* open"],
    ["   ", ""],
  ];
  for (const [q, at] of refused) {
    const r = checkQuery(q);
    ok(r !== null, q);
    ok(r.message.startsWith("A query must be one SELECT that only reads: "), r.message);
    if (at !== "") equal(q.slice(r.offset, r.offset + at.length), at, `${q}: ${r.message}`);
  }
});
