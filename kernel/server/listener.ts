/**
 * The live server's listener: accepts loopback connections itself, counts
 * and times them, and hands each to the HTTP/1.1 layer (http_connection.ts).
 *
 * ```
 *  accept ──error (EMFILE, ENFILE…)──▶ the cap drops below what is open now,
 *    │                                 the oldest waiting connection is closed,
 *    │                                 accept again after a pause: never fatal
 *    ▼
 *  at the cap? ─▶ close the oldest connection waiting for a request head
 *    │            (none waiting: answer 503 in words and close)
 *    ▼
 *  serveConnection(conn)   deadlines: head (first request, and a body that
 *                          stops coming), idle (between requests), write
 *                          (a response the peer does not take); WebSockets
 *                          keep their own pings (web_socket.ts)
 * ```
 *
 * Why our own: `Deno.serve` (Deno 2.9.6) offers no connection cap and no
 * head, idle or write timeout, and its accept loop rejects `finished` and
 * stops at the first EMFILE; the `node:http` server keeps running but stops
 * accepting after it (both measured under `ulimit -n 256`).
 *
 * @module
 */
import { type Handler, type HttpTimeouts, serveConnection } from "./http_connection.ts";
import { statusLine, writeAll } from "./_http_write.ts";

/** Limits of the live server's connections. */
export interface ConnectionLimits extends HttpTimeouts {
  /** Most connections open at once (lowered at run time when the process runs out of files). */
  maxConnections: number;
  /** Bytes queued for one page before it is treated as slow (live_channel.ts). */
  slowBytes: number;
  /** How long a slow page may stay behind before it is closed, in ms (live_channel.ts). */
  stallMs: number;
}

/** Defaults: generous for a browser on the same machine, short for anything that stalls. */
export const DEFAULT_LIMITS: ConnectionLimits = {
  maxConnections: 512,
  headMs: 10_000,
  idleMs: 5_000,
  writeMs: 30_000,
  slowBytes: 4 << 20,
  stallMs: 30_000,
};

/** File descriptors kept free for the document, data files and the worker after an EMFILE. */
const FILES_KEPT_FREE = 24;

interface Tracked {
  conn: Deno.Conn;
  waiting: boolean;
  /** Whether a request was answered on it (a browser's keep-alive connection). */
  served: boolean;
  upgraded: boolean;
  timer: ReturnType<typeof setTimeout> | null;
}

/** A running listener. */
export interface ConnectionServer {
  addr: Deno.NetAddr;
  /** Connections open now. */
  readonly open: number;
  /** Stops accepting and closes every connection. */
  shutdown(): Promise<void>;
}

/**
 * Listens on a loopback address and serves HTTP/1.1 and WebSockets within limits.
 *
 * @param opts Address, handler and limits.
 * @returns The running listener.
 * @throws {Deno.errors.AddrInUse} When the port is taken.
 */
export function serveConnections(opts: {
  hostname: string;
  port: number;
  handler: Handler;
  limits?: Partial<ConnectionLimits>;
}): ConnectionServer {
  const limits = { ...DEFAULT_LIMITS, ...opts.limits };
  const listener = Deno.listen({ hostname: opts.hostname, port: opts.port });
  const conns = new Map<Deno.Conn, Tracked>(); // in order of arrival: the first is the oldest
  const state = { cap: limits.maxConnections, closed: false };
  const loop = acceptLoop(listener, conns, state, opts.handler, limits);
  return {
    addr: listener.addr as Deno.NetAddr,
    get open() {
      return conns.size;
    },
    async shutdown() {
      state.closed = true;
      listener.close();
      for (const t of conns.values()) drop(t);
      await loop;
    },
  };
}

async function acceptLoop(
  listener: Deno.Listener,
  conns: Map<Deno.Conn, Tracked>,
  state: { cap: number; closed: boolean },
  handler: Handler,
  limits: ConnectionLimits,
): Promise<void> {
  let pause = 10;
  while (!state.closed) {
    let conn: Deno.Conn;
    try {
      conn = await listener.accept();
      pause = 10;
    } catch (err) {
      if (state.closed) return;
      // Out of files (or any other accept error): make room and try again, never give up.
      if (/os error (23|24)\b|too many open files/i.test(String(err))) {
        state.cap = Math.max(8, Math.min(state.cap, conns.size - FILES_KEPT_FREE));
      }
      closeOldestWaiting(conns);
      await new Promise((r) => setTimeout(r, pause));
      pause = Math.min(1000, pause * 2);
      continue;
    }
    if (conns.size >= state.cap && !closeOldestWaiting(conns)) {
      void refuseFull(conn, conns.size);
      continue;
    }
    const t: Tracked = { conn, waiting: true, served: false, upgraded: false, timer: null };
    conns.set(conn, t);
    void serveConnection(conn, handler, watchOf(t), limits).finally(() => {
      conns.delete(conn);
      if (!t.upgraded) drop(t);
    });
  }
}

function watchOf(t: Tracked) {
  return {
    deadline(ms: number | null) {
      if (t.timer !== null) clearTimeout(t.timer);
      t.timer = ms === null ? null : setTimeout(() => drop(t), ms);
    },
    waiting(yes: boolean) {
      if (!yes) t.served = true;
      t.waiting = yes;
    },
    upgraded() {
      if (t.timer !== null) clearTimeout(t.timer);
      t.timer = null;
      t.waiting = false;
      t.upgraded = true;
    },
  };
}

/** Closes a connection (its pending read or write fails, and its loop ends). */
function drop(t: Tracked): void {
  if (t.timer !== null) clearTimeout(t.timer);
  t.timer = null;
  try {
    t.conn.close();
  } catch { /* closed already */ }
}

/**
 * Closes the connection that has waited longest for a request head, one that
 * never sent a request first (a browser's keep-alive connection last); false
 * when none waits.
 */
function closeOldestWaiting(conns: Map<Deno.Conn, Tracked>): boolean {
  for (const served of [false, true]) {
    for (const t of conns.values()) {
      if (t.waiting && t.served === served) {
        conns.delete(t.conn);
        drop(t);
        return true;
      }
    }
  }
  return false;
}

async function refuseFull(conn: Deno.Conn, open: number): Promise<void> {
  const text = `The server has ${open} connections open, the most it keeps: ` +
    "close a page or try again shortly\n";
  const head = `${statusLine(503)}\r\ncontent-type: text/plain; charset=utf-8\r\n` +
    `content-length: ${new TextEncoder().encode(text).length}\r\nconnection: close\r\n\r\n`;
  const timer = setTimeout(() => conn.close(), 1000);
  await writeAll(conn, [new TextEncoder().encode(head + text)]);
  clearTimeout(timer);
  try {
    conn.close();
  } catch { /* closed by the timer */ }
}
