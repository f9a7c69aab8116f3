/**
 * The check a query passes before it reaches an engine: one read-only
 * SELECT. The text is split into tokens (strings, quoted names, comments
 * and dollar-quoted bodies are skipped whole), then refused at the first
 * word that writes, defines, changes the session or reaches outside the
 * database, or at a second statement. The engines refuse writes again
 * (read-only connections and transactions): this check gives the sentence
 * and the place.
 *
 * @module
 */

/** A refusal: a sentence and the character offset in the query. */
export interface QueryRefusal {
  message: string;
  offset: number;
}

interface Word {
  text: string;
  at: number;
  /** Written in double quotes (a name, never a keyword). */
  quoted?: boolean;
}

/** Where a quoted text starts right after FROM or JOIN (DuckDB reads a file named so). */
interface FileScan {
  at: number;
}

/**
 * Words that make a query write or define, refused wherever they stand as
 * words: a data-changing statement inside a WITH (PostgreSQL runs those),
 * SELECT … INTO (creates a table), and statements DuckDB accepts in odd
 * places. Other statements cannot stand inside one SELECT; a second
 * statement is refused on its own. A column of such a name can be quoted.
 */
const WRITES = new Set([
  "insert",
  "update",
  "delete",
  "merge",
  "upsert",
  "into",
  "truncate",
  "create",
  "drop",
  "alter",
  "grant",
  "revoke",
  "attach",
  "detach",
  "install",
  "pragma",
  "vacuum",
  "checkpoint",
]);

/** Functions that read files, reach other servers or act on the server. */
const FUNCTIONS = new Set([
  // DuckDB: files and other databases
  "read_csv",
  "read_csv_auto",
  "read_parquet",
  "parquet_scan",
  "read_json",
  "read_json_auto",
  "read_json_objects",
  "read_ndjson",
  "read_ndjson_auto",
  "read_ndjson_objects",
  "read_text",
  "read_blob",
  "glob",
  "sniff_csv",
  "parquet_metadata",
  "parquet_schema",
  "iceberg_scan",
  "delta_scan",
  "sqlite_scan",
  "postgres_scan",
  "mysql_scan",
  "query_table",
  "getenv",
  "duckdb_secrets",
  "which_secret",
  "read_xlsx",
  "st_read",
  "load_aws_credentials",
  // PostgreSQL: files, other servers, the server's state
  "pg_read_file",
  "pg_read_binary_file",
  "pg_ls_dir",
  "pg_stat_file",
  "pg_ls_logdir",
  "pg_ls_waldir",
  "pg_ls_tmpdir",
  "pg_ls_archive_statusdir",
  "pg_file_write",
  "pg_notify",
  "pg_logical_emit_message",
  "pg_create_restore_point",
  "pg_promote",
  "pg_stat_reset",
  "pg_try_advisory_lock",
  "pg_advisory_lock_shared",
  "lo_import",
  "lo_export",
  "lo_from_bytea",
  "lo_put",
  "lo_create",
  "lo_unlink",
  "dblink",
  "dblink_exec",
  "dblink_connect",
  "setval",
  "nextval",
  "set_config",
  "pg_terminate_backend",
  "pg_cancel_backend",
  "pg_reload_conf",
  "pg_rotate_logfile",
  "pg_switch_wal",
  "pg_advisory_lock",
  "pg_advisory_xact_lock",
  "txid_current",
  "pg_current_xact_id",
  "query_to_xml",
  "table_to_xml",
  "cursor_to_xml",
]);

const refuse = (message: string, offset: number): QueryRefusal => ({
  message: `A query must be one SELECT that only reads: ${message}`,
  offset,
});

/**
 * The query's words (outside strings, quoted names and comments) and its
 * top-level statement ends (`;`); null with a refusal for text that does
 * not close (a string or comment left open).
 */
function tokens(sql: string): { words: Word[]; semis: number[]; files: FileScan[] } | QueryRefusal {
  const words: Word[] = [];
  const semis: number[] = [];
  const files: FileScan[] = [];
  let lastWasSource = false;
  let i = 0;
  const n = sql.length;
  while (i < n) {
    const c = sql[i];
    if (c === "-" && sql[i + 1] === "-") {
      const nl = sql.indexOf("\n", i);
      i = nl < 0 ? n : nl + 1;
    } else if (c === "/" && sql[i + 1] === "*") {
      // Nested comments (PostgreSQL nests them; reading them nested is the safe side).
      let depth = 1;
      let j = i + 2;
      while (j < n && depth > 0) {
        if (sql[j] === "/" && sql[j + 1] === "*") (depth++, j += 2);
        else if (sql[j] === "*" && sql[j + 1] === "/") (depth--, j += 2);
        else j++;
      }
      if (depth > 0) return refuse("a comment is not closed", i);
      i = j;
    } else if (c === "'" || c === '"' || c === "`") {
      if (c === '"' && sql[i - 1] === "&" && /[uU]/.test(sql[i - 2] ?? "")) {
        // U&"…": a name spelled with escapes could hide a function's name.
        return refuse('a name written as U&"…" is not allowed: write it plainly', i - 2);
      }
      if (c === "'" && lastWasSource) files.push({ at: i });
      lastWasSource = false;
      const escapes = c === "'" && /[eE]/.test(sql[i - 1] ?? "") && !/\w/.test(sql[i - 2] ?? "");
      let j = i + 1;
      for (;;) {
        if (j >= n) {
          return refuse(
            c === "'" ? "a text in quotes is not closed" : "a quoted name is not closed",
            i,
          );
        }
        if (escapes && sql[j] === "\\") j += 2;
        else if (sql[j] === c && sql[j + 1] === c) j += 2;
        else if (sql[j] === c) break;
        else j++;
      }
      if (c !== "'") {
        words.push({
          text: sql.slice(i + 1, j).replaceAll(c + c, c).toLowerCase(),
          at: i,
          quoted: true,
        });
      }
      i = j + 1;
    } else if (c === "$" && !/[\w$]/.test(sql[i - 1] ?? "")) {
      const tag = /^\$([A-Za-z_][A-Za-z0-9_]*)?\$/.exec(sql.slice(i, i + 66));
      if (tag) {
        const close = sql.indexOf(tag[0], i + tag[0].length);
        if (close < 0) return refuse("a dollar-quoted text is not closed", i);
        i = close + tag[0].length;
      } else i++;
    } else if (/[A-Za-z_]/.test(c)) {
      let j = i + 1;
      while (j < n && /[\w$]/.test(sql[j])) j++;
      const text = sql.slice(i, j).toLowerCase();
      words.push({ text, at: i });
      lastWasSource = text === "from" || text === "join";
      i = j;
    } else {
      if (c === ";") semis.push(i);
      if (!/\s/.test(c)) lastWasSource = false;
      i++;
    }
  }
  return { words, semis, files };
}

/**
 * Checks that a query is one read-only SELECT.
 *
 * @param sql The query as written.
 * @returns null when it passes, else the refusal and its offset.
 * @example
 * ```ts
 * import { checkQuery } from "./guard.ts";
 * if (checkQuery("SELECT x, y FROM t WHERE note = 'drop table'") !== null) throw new Error("a string");
 * const r = checkQuery("SELECT 1; DELETE FROM t");
 * if (r === null || r.offset !== 8) throw new Error("a second statement");
 * ```
 */
export function checkQuery(sql: string): QueryRefusal | null {
  const t = tokens(sql);
  if ("message" in t) return t;
  const { words, semis, files } = t;
  if (words.length === 0) return refuse("this text holds no statement", 0);
  const first = words[0];
  if (first.quoted || first.text !== "select" && first.text !== "with" && first.text !== "values") {
    return refuse(
      first.quoted ? "it starts with a quoted name" : `it starts with ${first.text.toUpperCase()}`,
      first.at,
    );
  }
  // A statement end is allowed last, with nothing but spaces and comments after it.
  for (const s of semis) {
    if (words.some((w) => w.at > s) || semis.some((o) => o > s)) {
      return refuse("a second statement follows the first", s);
    }
  }
  if (files.length > 0) return refuse("a quoted text after FROM names a file", files[0].at);
  for (let k = 0; k < words.length; k++) {
    const w = words[k];
    if (w.quoted) {
      // A quoted name may be a column called "update"; a function's name quoted is still the function.
      if (FUNCTIONS.has(w.text)) {
        return refuse(`${w.text} reaches outside the query's tables`, w.at);
      }
      continue;
    }
    if (WRITES.has(w.text)) {
      return refuse(`${w.text.toUpperCase()} is not allowed in a query`, w.at);
    }
    if (w.text === "for" && /^(update|share|no|key)$/.test(words[k + 1]?.text ?? "")) {
      return refuse("row locks (FOR UPDATE, FOR SHARE) are not allowed", w.at);
    }
    if (FUNCTIONS.has(w.text)) {
      return refuse(`${w.text} reaches outside the query's tables`, w.at);
    }
  }
  return null;
}
