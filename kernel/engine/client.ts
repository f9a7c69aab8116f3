/**
 * The main thread's side of database access: one engine process per
 * database (kernel/engine/_engine_child.ts), started on first use with the
 * least it needs, kept while Plumb runs, asked one statement at a time.
 *
 * ```
 *  EngineClient.rows / rfactor (db, sql, signal)
 *     └─▶ engine for db: DuckDB file → deno run --allow-ffi _engine_child.ts duckdb <path>
 *                        PostgreSQL  → probe (--allow-env=VAR) → host:port
 *                                      → deno run --allow-env=VAR --allow-net=host:port … postgres VAR
 *  a request's signal aborted → {"op": "cancel"} → the engine cancels the statement
 *  a request's time limit (default QUERY_TIME_LIMIT_DEFAULT s) → the engine stops the statement
 *  a request's progress callback ← {"id", "progress": {fraction?, rows?}} lines before its answer
 * ```
 *
 * @module
 */
import { isAbsolute, relative, resolve } from "node:path";
import { cannotStart, spawnDeno } from "../sandbox/_spawn.ts";
import { checkQuery } from "./guard.ts";
import {
  type DatabaseRef,
  type EngineAnswer,
  type EngineAskOptions,
  type EngineColumn,
  type EngineProgress,
  type EngineRFactor,
  type EngineRows,
  type EngineStop,
  QUERY_TIME_LIMIT_DEFAULT,
} from "./types.ts";

const CHILD = new URL("./_engine_child.ts", import.meta.url);
const CONFIG = new URL("../../deno.json", import.meta.url);

const path = (u: URL) => decodeURIComponent(u.pathname);

type Reply = { ok: true; value: unknown } | { ok: false; why: EngineStop; message: string };

/** The most a time limit may be (ms): what a timer and PostgreSQL's statement_timeout hold. */
const MOST_LIMIT_MS = 2 ** 31 - 1;

/**
 * A request's options from the last argument of {@link EngineClient.rows} or
 * {@link EngineClient.rfactor}: an AbortSignal alone (the older form) or the options.
 */
function optionsOf(last: AbortSignal | EngineAskOptions | undefined): EngineAskOptions {
  if (last === undefined) return {};
  return last instanceof AbortSignal ? { signal: last } : last;
}

/** A time limit in seconds (0 for none) as the engine's milliseconds (0 for none). */
function limitMs(seconds: number | undefined): number {
  const s = seconds ?? QUERY_TIME_LIMIT_DEFAULT;
  if (!(s > 0)) return 0;
  return Math.min(MOST_LIMIT_MS, Math.max(1, Math.round(s * 1000)));
}

/** One engine process and its requests in flight. */
class Engine {
  #child: Deno.ChildProcess;
  #writer: WritableStreamDefaultWriter<Uint8Array>;
  #waiting = new Map<number, (r: Reply) => void>();
  /** Progress callbacks of requests in flight that asked for them. */
  #progress = new Map<number, (p: EngineProgress) => void>();
  #next = 1;
  #dead: string | null = null;

  constructor(child: Deno.ChildProcess) {
    this.#child = child;
    this.#writer = child.stdin.getWriter();
    this.#read();
    // Read and dropped, so a process that writes warnings never waits on a full pipe.
    child.stderr.pipeTo(new WritableStream()).catch(() => {});
    child.status.then((s) => {
      this.#dead = s.success ? "The database process ended" : "The database process stopped";
      for (const done of this.#waiting.values()) {
        done({ ok: false, why: "connect", message: this.#dead });
      }
      this.#waiting.clear();
    });
  }

  get alive(): boolean {
    return this.#dead === null;
  }

  async #read(): Promise<void> {
    let pending = "";
    try {
      for await (const piece of this.#child.stdout.pipeThrough(new TextDecoderStream())) {
        pending += piece;
        let nl;
        while ((nl = pending.indexOf("\n")) >= 0) {
          const line = pending.slice(0, nl);
          pending = pending.slice(nl + 1);
          let msg: { id: number; progress?: EngineProgress } & Reply;
          try {
            msg = JSON.parse(line);
          } catch {
            continue;
          }
          if (msg.progress !== undefined) {
            this.#progress.get(msg.id)?.(msg.progress);
            continue;
          }
          const done = this.#waiting.get(msg.id);
          this.#waiting.delete(msg.id);
          const { id: _id, ...reply } = msg;
          done?.(reply as Reply);
        }
      }
    } catch { /* the process ended: its status answers what is waiting */ }
  }

  ask(
    op: "rows" | "rfactor",
    sql: string,
    maxRows: number,
    options: EngineAskOptions,
  ): Promise<Reply> {
    if (this.#dead !== null) {
      return Promise.resolve({ ok: false, why: "connect", message: this.#dead });
    }
    const { signal, progress, expectRows } = options;
    const id = this.#next++;
    return new Promise<Reply>((resolveReply) => {
      let cancelled = false;
      const onAbort = () => {
        cancelled = true;
        this.#send({ id, op: "cancel" });
      };
      signal?.addEventListener("abort", onAbort, { once: true });
      // Awaited requests keep Plumb alive; an idle engine does not.
      this.#child.ref();
      if (progress) this.#progress.set(id, progress);
      this.#waiting.set(id, (r) => {
        signal?.removeEventListener("abort", onAbort);
        this.#progress.delete(id);
        if (this.#waiting.size === 0) this.#child.unref();
        resolveReply(
          cancelled && !r.ok
            ? { ok: false, why: "cancelled", message: "The statement was cancelled" }
            : r,
        );
      });
      this.#send({
        id,
        op,
        sql,
        maxRows,
        limitMs: limitMs(options.timeLimit),
        ...(progress ? { progress: true } : {}),
        ...(expectRows !== undefined && expectRows > 0 ? { expectRows } : {}),
      });
      if (signal?.aborted) onAbort();
    });
  }

  #send(m: unknown): void {
    this.#writer.write(new TextEncoder().encode(JSON.stringify(m) + "\n")).catch(() => {});
  }

  kill(): void {
    try {
      this.#child.kill("SIGKILL");
    } catch { /* gone */ }
  }
}

/** Database access for one document folder; never throws from its requests. */
export class EngineClient {
  readonly #folder: string;
  readonly #engines = new Map<string, Promise<Engine | Reply>>();

  /** @param folder The document's folder (DuckDB files are relative to it). */
  constructor(folder: string) {
    this.#folder = resolve(folder);
  }

  /**
   * Runs one read-only SELECT; at most `maxRows` rows come back.
   *
   * @param db The database.
   * @param sql The statement (checked again here).
   * @param maxRows The most rows.
   * @param options The progress callback, the time limit in seconds (default
   *   {@link QUERY_TIME_LIMIT_DEFAULT}, 0 for none), the rows expected, and a signal whose
   *   abort cancels the statement; or that signal alone.
   */
  async rows(
    db: DatabaseRef,
    sql: string,
    maxRows: number,
    options?: AbortSignal | EngineAskOptions,
  ): Promise<EngineAnswer<EngineRows>> {
    const t0 = performance.now();
    const r = await this.#ask(db, "rows", sql, maxRows, optionsOf(options));
    const ms = performance.now() - t0;
    if (!r.ok) return { ...r, ms };
    const v = r.value as {
      rows: number;
      more: boolean;
      columns: { name: string; type: "number" | "text"; values: string | (string | null)[] }[];
    };
    const columns = v.columns.map((c): EngineColumn =>
      c.type === "number"
        ? { name: c.name, type: "number", values: fromBase64(c.values as string) }
        : { name: c.name, type: "text", values: c.values as (string | null)[] }
    );
    return { ok: true, value: { columns, rows: v.rows, more: v.more }, ms };
  }

  /**
   * Streams a numeric SELECT through blocked QR in the engine's process.
   *
   * @param db The database.
   * @param sql The statement.
   * @param options As for {@link EngineClient.rows}.
   */
  async rfactor(
    db: DatabaseRef,
    sql: string,
    options?: AbortSignal | EngineAskOptions,
  ): Promise<EngineAnswer<EngineRFactor>> {
    const t0 = performance.now();
    const r = await this.#ask(db, "rfactor", sql, 0, optionsOf(options));
    const ms = performance.now() - t0;
    if (!r.ok) return { ...r, ms };
    const v = r.value as { r: string; k: number; rows: number; skipped: number };
    return {
      ok: true,
      value: {
        r: v.r === "" ? new Float64Array(0) : fromBase64(v.r),
        k: v.k,
        rows: v.rows,
        skipped: v.skipped,
      },
      ms,
    };
  }

  async #ask(
    db: DatabaseRef,
    op: "rows" | "rfactor",
    sql: string,
    maxRows: number,
    options: EngineAskOptions,
  ): Promise<Reply> {
    const refused = checkQuery(sql);
    if (refused) return { ok: false, why: "refused", message: refused.message };
    const engine = await this.#engine(db);
    if (!(engine instanceof Engine)) return engine;
    return engine.ask(op, sql, maxRows, options);
  }

  #engine(db: DatabaseRef): Promise<Engine | Reply> {
    const key = db.engine === "duckdb"
      ? `duckdb:${resolve(this.#folder, db.file)}`
      : `pg:${db.urlFrom}`;
    const known = this.#engines.get(key);
    if (known) {
      return known.then((e) => {
        if (e instanceof Engine && !e.alive) {
          this.#engines.delete(key);
          return this.#engine(db);
        }
        return e;
      });
    }
    const started = this.#start(db);
    this.#engines.set(key, started);
    // A failure to start is not kept: the next request tries again (a variable set, a server up).
    started.then((e) => {
      if (!(e instanceof Engine)) this.#engines.delete(key);
    });
    return started;
  }

  async #start(db: DatabaseRef): Promise<Engine | Reply> {
    const common = [
      "run",
      "--config",
      path(CONFIG),
      "--no-prompt",
      "--quiet",
      "--no-check",
      "--cached-only",
    ];
    try {
      if (db.engine === "duckdb") {
        const file = resolve(this.#folder, db.file);
        const rel = relative(this.#folder, file);
        if (rel.startsWith("..") || isAbsolute(rel)) {
          return {
            ok: false,
            why: "connect",
            message: `The DuckDB file "${db.file}" is outside the document's folder`,
          };
        }
        return new Engine(spawnDeno([...common, "--allow-ffi", path(CHILD), "duckdb", file]));
      }
      const probe = spawnDeno(
        [...common, `--allow-env=${db.urlFrom}`, path(CHILD), "probe", db.urlFrom],
        true,
      );
      probe.stdin.close().catch(() => {});
      // Awaited: it keeps Plumb alive until it has said where the server is.
      probe.ref();
      const out = await probe.output();
      let said: { ok: boolean; host?: string; port?: number; why?: EngineStop; message?: string };
      try {
        said = JSON.parse(new TextDecoder().decode(out.stdout));
      } catch {
        return { ok: false, why: "cannot-start", message: "The database process could not start" };
      }
      if (!said.ok) return { ok: false, why: said.why ?? "variable", message: said.message ?? "" };
      const host = said.host!.includes(":") ? `[${said.host}]` : said.host!;
      return new Engine(spawnDeno(
        [
          ...common,
          `--allow-env=${db.urlFrom}`,
          `--allow-net=${host}:${said.port}`,
          path(CHILD),
          "postgres",
          db.urlFrom,
        ],
        true,
      ));
    } catch (err) {
      return {
        ok: false,
        why: "cannot-start",
        message: cannotStart(err, "a database process", "database tables"),
      };
    }
  }

  /** Ends every engine process. */
  close(): void {
    for (const e of this.#engines.values()) {
      e.then((x) => x instanceof Engine && x.kill());
    }
    this.#engines.clear();
  }
}

/**
 * The buffers of an answer's numbers (numeric columns, R), each its own, for
 * `postMessage`'s transfer list.
 *
 * @param answer An answer of {@link EngineClient}.
 * @returns The buffers.
 * @example
 * ```ts
 * import { answerBuffers } from "./client.ts";
 * const x = new Float64Array([1, 2]);
 * const moved = answerBuffers({
 *   ok: true,
 *   ms: 1,
 *   value: { rows: 2, more: false, columns: [{ name: "x", type: "number", values: x }] },
 * });
 * if (moved.length !== 1 || moved[0] !== x.buffer) throw new Error("the column's buffer");
 * ```
 */
export function answerBuffers(
  answer: EngineAnswer<EngineRows> | EngineAnswer<EngineRFactor>,
): ArrayBuffer[] {
  if (!answer.ok) return [];
  const v = answer.value;
  if ("r" in v) return v.r.byteLength > 0 ? [v.r.buffer as ArrayBuffer] : [];
  return v.columns.flatMap((c) => c.type === "number" ? [c.values.buffer as ArrayBuffer] : []);
}

function fromBase64(s: string): Float64Array {
  const bin = atob(s);
  const bytes = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) bytes[i] = bin.charCodeAt(i);
  return new Float64Array(bytes.buffer);
}
