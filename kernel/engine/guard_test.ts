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
    "WITH RECURSIVE n(i) AS (VALUES (1) UNION ALL SELECT i + 1 FROM n WHERE i < 9) SELECT * FROM n",
    "SELECT x FROM t WHERE note <> 'SET x = 1' -- FOR UPDATE",
    'SELECT "set", "for" FROM "create"',
    "SELECT $tag$ $$ ; DELETE $$ $tag$ AS body",
    "SELECT pg_sleep(0.1)",
    "SELECT x FROM t ORDER BY x FOR /* a comment */ x",
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
    ["-- only a comment", ""],
    ["SELECT 1; /* fine */ SELECT 2", ";"],
    ["WITH u AS (UPDATE t SET x = 1 RETURNING x) SELECT * FROM u", "UPDATE"],
    ["WITH m AS (MERGE INTO t USING s ON true WHEN MATCHED THEN DELETE) SELECT 1", "MERGE"],
    ["SELECT * FROM t FOR NO KEY UPDATE", "FOR"],
    ["COPY t TO '/tmp/out.csv'", "COPY"],
    ["EXPLAIN ANALYZE SELECT 1", "EXPLAIN"],
    ["BEGIN", "BEGIN"],
    ["PRAGMA version", "PRAGMA"],
    ["INSTALL httpfs", "INSTALL"],
    ["LOAD httpfs", "LOAD"],
    ["CALL pg_sleep(1)", "CALL"],
    ["RESET ALL", "RESET"],
    ["SELECT * FROM \"read_csv\"('/etc/hostname')", '"read_csv"'],
    ['SELECT "pg_catalog"."pg_read_file"(\'/etc/passwd\')', '"pg_read_file"'],
    ["SELECT pg_catalog.pg_read_file('/etc/passwd')", "pg_read_file"],
    ["SELECT U&\"\\0070g_read_file\"('/etc/passwd')", "U&"],
    ["SELECT * FROM READ_PARQUET('x.parquet')", "READ_PARQUET"],
    ["SELECT * FROM glob('*')", "glob"],
    ["SELECT nextval('s')", "nextval"],
    ["SELECT pg_terminate_backend(1)", "pg_terminate_backend"],
    ["SELECT lo_export(1, '/tmp/x')", "lo_export"],
    ["SELECT * FROM dblink('host=x', 'SELECT 1') AS d(x int)", "dblink"],
    ["SELECT $$ open", "$$ open"],
    ['SELECT "open', '"open'],
    ["SELECT 1 /* nested /* still open */", "/* nested"],
  ];
  for (const [q, at] of refused) {
    const r = checkQuery(q);
    ok(r !== null, q);
    ok(r.message.startsWith("A query must be one SELECT that only reads: "), r.message);
    if (at !== "") equal(q.slice(r.offset, r.offset + at.length), at, `${q}: ${r.message}`);
  }
});
