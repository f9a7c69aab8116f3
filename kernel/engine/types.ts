/**
 * What a cell asks of a database engine and what comes back: the contract
 * between a kind's compute face (through `RunContext.engine`) and
 * kernel/engine, which runs every statement in a child process of its own.
 *
 * ```
 *  kind.run ─▶ ctx.engine.rows(db, sql, maxRows)   ─┐  worker ─ engine message ─▶ main thread
 *           ─▶ ctx.engine.rfactor(db, sql)          ─┘  ─▶ engine child (one per database) ─▶ DuckDB | PostgreSQL
 * ```
 *
 * While a statement runs the engine may report its progress (DuckDB: the
 * share of the work done; PostgreSQL: rows fetched through the cursor, a
 * share only against a count the caller knows), and a statement that runs
 * past its time limit is stopped in the engine and answered with a
 * sentence naming the limit (the document's `query_time_limit`).
 *
 * Every statement is one read-only SELECT: the user's query is checked
 * before it reaches the engine (kernel/engine/guard.ts) and the connection
 * is read-only as well. SQL that kinds build wraps the user's query as a
 * subquery (`SELECT … FROM (<query>) AS plumb_q`).
 *
 * @module
 */

/** Seconds a statement may run when nothing says otherwise (the `query_time_limit` default). */
export const QUERY_TIME_LIMIT_DEFAULT = 1800;

/**
 * A database a table reads: an embedded DuckDB file beside the document
 * (`file` as written, relative to the document's folder), or a PostgreSQL
 * server whose connection URL is held in an environment variable (`urlFrom`
 * names the variable; the URL never appears in a document, a record or a
 * message).
 */
export type DatabaseRef =
  | { engine: "duckdb"; file: string }
  | { engine: "postgres"; urlFrom: string };

/** One column of a query's answer: numbers (a null is NaN) or text (a null is null). */
export type EngineColumn =
  | { name: string; type: "number"; values: Float64Array }
  | { name: string; type: "text"; values: (string | null)[] };

/** Why a request gave no answer. */
export type EngineStop =
  /** The connection variable is missing or empty, or its URL is not a PostgreSQL URL. */
  | "variable"
  /** The database file is missing, or the server could not be reached or refused the login. */
  | "connect"
  /** The statement is not one read-only SELECT (said before it reached the engine, or by it). */
  | "refused"
  /**
   * The engine reported an error running the statement, or the statement ran
   * past its time limit and was stopped (the message names the limit and the
   * setting).
   */
  | "query"
  /** The run that asked was stopped (its inputs changed); the statement was cancelled. */
  | "cancelled"
  /** No engine process could be started (permissions, the platform). */
  | "cannot-start";

/** An engine's answer: the value, or why there is none in plain words (never a secret). */
export type EngineAnswer<T> =
  | { ok: true; value: T; ms: number }
  | { ok: false; why: EngineStop; message: string; ms: number };

/** Rows of a query, at most `maxRows` of them. */
export interface EngineRows {
  columns: EngineColumn[];
  /** Rows returned (each column's length). */
  rows: number;
  /** True when the query had more rows than `maxRows` (only the first `maxRows` came back). */
  more: boolean;
}

/**
 * The R factor of a query's numeric columns (k of them), from Householder QR
 * of the rows streamed in blocks (tall-skinny QR: block R factors stacked
 * and factored again), so no more than one block is held at a time.
 */
export interface EngineRFactor {
  /** k×k upper triangle, row-major (zeros below the diagonal). */
  r: Float64Array;
  k: number;
  /** Rows factored. */
  rows: number;
  /** Rows skipped for a null or non-finite value in some column. */
  skipped: number;
}

/**
 * How far a running statement has come, as the engine reports it: a share
 * of the work (DuckDB's progress; or rows read against `expectRows`), the
 * rows read so far (streamed statements), or both. Neither is guessed.
 */
export interface EngineProgress {
  /** Share done, in [0, 1], never less than the last one reported. */
  fraction?: number;
  /** Rows read from the statement so far. */
  rows?: number;
}

/** What may go with a request besides its statement. */
export interface EngineAskOptions {
  /**
   * Called while the statement runs, at most a few times a second and only
   * once it has run a quarter of a second, where the engine reports progress.
   */
  progress?: (p: EngineProgress) => void;
  /**
   * Seconds the statement may run before the engine stops it; 0 for none.
   * Default {@link QUERY_TIME_LIMIT_DEFAULT} (the document setting's default).
   */
  timeLimit?: number;
  /** The rows the statement will give, when the caller knows (a share of them is then reported). */
  expectRows?: number;
  /** Aborting it cancels the statement. */
  signal?: AbortSignal;
}

/** `RunContext.engine`: database access for a run; never throws. */
export interface EngineAccess {
  /**
   * Runs one read-only SELECT and returns at most `maxRows` rows, typed.
   *
   * @param db The database.
   * @param sql The statement.
   * @param maxRows The most rows to return.
   * @param options Progress, time limit, expected rows (a run's are set by the kernel from the
   *   document's settings and its progress report).
   */
  rows(
    db: DatabaseRef,
    sql: string,
    maxRows: number,
    options?: EngineAskOptions,
  ): Promise<EngineAnswer<EngineRows>>;
  /**
   * Streams a read-only SELECT whose columns are all numeric through
   * blocked Householder QR in the engine's process and returns R.
   *
   * @param db The database.
   * @param sql The statement.
   * @param options As for {@link EngineAccess.rows}.
   */
  rfactor(
    db: DatabaseRef,
    sql: string,
    options?: EngineAskOptions,
  ): Promise<EngineAnswer<EngineRFactor>>;
}
