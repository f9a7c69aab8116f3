/**
 * Test doubles of `EngineAccess` (kernel/engine/types.ts) for the in-engine
 * fit's tests and bench. `DuckDbTestEngine`, over an in-memory DuckDB:
 * `rows` runs the SQL in DuckDB and types the answer as kernel/engine's
 * DuckDB process does (numbers as Float64Array, a NULL as NaN), `rfactor`
 * streams the answer's chunks through the same tall-skinny QR
 * (kernel/linalg/stacked_r.ts), skipping rows with a value that is not
 * finite, as that process does. `PgTestEngine` does the same over a
 * PostgreSQL URL with node-postgres (all rows at once: small test data). No
 * child process, no read-only session: the tests load their own invented
 * rows.
 *
 * @module
 */
import { DuckDBInstance } from "@duckdb/node-api";
import pg from "pg";
import type { DuckDBConnection } from "@duckdb/node-api";
import { StackedR } from "../../kernel/linalg/stacked_r.ts";
import type {
  DatabaseRef,
  EngineAccess,
  EngineAnswer,
  EngineColumn,
  EngineRFactor,
  EngineRows,
} from "../../kernel/engine/types.ts";

/** The database reference the double answers for (it ignores which). */
export const TEST_DB: DatabaseRef = { engine: "duckdb", file: ":memory:" };

/** One value of DuckDB's answer as a number (NaN for NULL), or null when it is not numeric. */
function asNumber(v: unknown): number | null {
  if (v === null) return NaN;
  if (typeof v === "number") return v;
  if (typeof v === "bigint") return Number(v);
  if (typeof v === "object" && v !== null && "toDouble" in v) {
    return (v as { toDouble(): number }).toDouble();
  }
  return null;
}

/** An in-memory DuckDB behind the engine contract, for tests only. */
export class DuckDbTestEngine implements EngineAccess {
  readonly #instance: DuckDBInstance;
  readonly #con: DuckDBConnection;
  /** Statements asked, in order (rows and rfactor). */
  readonly asked: string[] = [];

  private constructor(instance: DuckDBInstance, con: DuckDBConnection) {
    this.#instance = instance;
    this.#con = con;
  }

  /** Opens an in-memory database. */
  static async open(): Promise<DuckDbTestEngine> {
    const instance = await DuckDBInstance.create(":memory:");
    return new DuckDbTestEngine(instance, await instance.connect());
  }

  /** Runs setup SQL (any statement). */
  async run(sql: string): Promise<void> {
    await this.#con.run(sql);
  }

  /**
   * Creates `name` with DOUBLE columns and appends the rows (NaN as NULL).
   *
   * @param name The table.
   * @param columns Column name → values, all of one length.
   */
  async load(name: string, columns: Record<string, ArrayLike<number>>): Promise<void> {
    const names = Object.keys(columns);
    const defs = names.map((c) => `"${c}" DOUBLE`).join(", ");
    await this.#con.run(`CREATE TABLE "${name}" (${defs})`);
    const appender = await this.#con.createAppender(name);
    const n = columns[names[0]].length;
    for (let i = 0; i < n; i++) {
      for (const c of names) {
        const v = columns[c][i];
        if (Number.isNaN(v)) appender.appendNull();
        else appender.appendDouble(v);
      }
      appender.endRow();
    }
    appender.closeSync();
  }

  async rows(_db: DatabaseRef, sql: string, maxRows: number): Promise<EngineAnswer<EngineRows>> {
    this.asked.push(sql);
    const t0 = performance.now();
    try {
      const reader = await this.#con.runAndReadAll(sql);
      const names = reader.columnNames();
      const all = reader.getRows();
      const take = Math.min(all.length, maxRows);
      const columns: EngineColumn[] = names.map((name, j) => {
        const numbers = all.slice(0, take).map((r) => asNumber(r[j]));
        if (numbers.every((v) => v !== null)) {
          return { name, type: "number", values: Float64Array.from(numbers as number[]) };
        }
        return {
          name,
          type: "text",
          values: all.slice(0, take).map((r) => (r[j] === null ? null : String(r[j]))),
        };
      });
      const ms = performance.now() - t0;
      return { ok: true, value: { columns, rows: take, more: all.length > take }, ms };
    } catch (e) {
      return { ok: false, why: "query", message: `The database said: ${firstLine(e)}`, ms: 0 };
    }
  }

  async rfactor(_db: DatabaseRef, sql: string): Promise<EngineAnswer<EngineRFactor>> {
    this.asked.push(sql);
    const t0 = performance.now();
    try {
      const result = await this.#con.stream(sql);
      const k = result.columnCount;
      const s = new StackedR(k);
      const row = new Float64Array(k);
      let skipped = 0;
      for (;;) {
        const chunk = await result.fetchChunk();
        if (chunk === null || chunk.rowCount === 0) break;
        const cols = Array.from({ length: k }, (_, j) => chunk.getColumnValues(j));
        for (let i = 0; i < chunk.rowCount; i++) {
          let finite = true;
          for (let j = 0; j < k; j++) {
            row[j] = asNumber(cols[j][i]) ?? NaN;
            if (!Number.isFinite(row[j])) finite = false;
          }
          if (finite) s.add(row);
          else skipped++;
        }
      }
      const value = { r: s.finish(), k, rows: s.rows, skipped };
      return { ok: true, value, ms: performance.now() - t0 };
    } catch (e) {
      return { ok: false, why: "query", message: `The database said: ${firstLine(e)}`, ms: 0 };
    }
  }

  /** Closes the database. */
  close(): void {
    this.#con.closeSync();
    this.#instance.closeSync();
  }
}

function firstLine(e: unknown): string {
  return String(e instanceof Error ? e.message : e).split("\n")[0];
}

/** A PostgreSQL database behind the engine contract, for tests only (one connection a call). */
export class PgTestEngine implements EngineAccess {
  readonly #url: string;

  /** @param url A connection URL. */
  constructor(url: string) {
    this.#url = url;
  }

  async #query(sql: string): Promise<{ names: string[]; rows: unknown[][] }> {
    const client = new pg.Client({ connectionString: this.#url });
    await client.connect();
    try {
      const r = await client.query({ text: sql, rowMode: "array" });
      return { names: r.fields.map((f: { name: string }) => f.name), rows: r.rows as unknown[][] };
    } finally {
      await client.end();
    }
  }

  async rows(_db: DatabaseRef, sql: string, maxRows: number): Promise<EngineAnswer<EngineRows>> {
    const t0 = performance.now();
    try {
      const { names, rows } = await this.#query(sql);
      const take = rows.slice(0, maxRows);
      // node-postgres gives float8 as numbers, int8 and numeric as strings.
      const columns: EngineColumn[] = names.map((name, j) => ({
        name,
        type: "number",
        values: Float64Array.from(take, (r) => (r[j] === null ? NaN : Number(r[j]))),
      }));
      const value = { columns, rows: take.length, more: rows.length > take.length };
      return { ok: true, value, ms: performance.now() - t0 };
    } catch (e) {
      return { ok: false, why: "query", message: `The database said: ${firstLine(e)}`, ms: 0 };
    }
  }

  async rfactor(_db: DatabaseRef, sql: string): Promise<EngineAnswer<EngineRFactor>> {
    const t0 = performance.now();
    try {
      const { names, rows } = await this.#query(sql);
      const s = new StackedR(names.length);
      let skipped = 0;
      for (const r of rows) {
        const row = r.map((v) => (v === null ? NaN : Number(v)));
        if (row.every(Number.isFinite)) s.add(row);
        else skipped++;
      }
      const value = { r: s.finish(), k: names.length, rows: s.rows, skipped };
      return { ok: true, value, ms: performance.now() - t0 };
    } catch (e) {
      return { ok: false, why: "query", message: `The database said: ${firstLine(e)}`, ms: 0 };
    }
  }
}
