/**
 * The load suite's clients: live pages (WebSockets that read), pages that
 * never read, idle connections kept open, and a prober timing a normal
 * request. Loopback only.
 *
 * @module
 */

/** What one live page has seen. */
export interface Page {
  ws: WebSocket;
  /** The highest edit number seen in a document's text, and when each was first seen. */
  edit: number;
  /** The most data rows seen. */
  rows: number;
  seen: Map<string, number>;
  closed: boolean;
}

/**
 * Opens a page on /live (asking for the document text only when it changed).
 *
 * @param port The server's port.
 * @param token The token.
 * @returns The page, once open.
 */
export async function openPage(port: number, token: string): Promise<Page> {
  // Deno's WebSocket client takes handshake headers (non-standard; the DOM typings lack them).
  const options = {
    headers: { cookie: `plumb_token=${token}`, origin: `http://127.0.0.1:${port}` },
  } as unknown as string[];
  const ws = new WebSocket(`ws://127.0.0.1:${port}/live?text=changed`, options);
  const page: Page = { ws, edit: -1, rows: -1, seen: new Map(), closed: false };
  ws.onmessage = (e) => {
    const now = performance.now();
    const data = JSON.parse(String(e.data));
    for (const m of Array.isArray(data) ? data : [data]) {
      if (m.type !== "document") continue;
      const edit = typeof m.source === "string" ? Number(/edit (\d+)/.exec(m.source)?.[1]) : NaN;
      if (edit > page.edit) {
        for (let k = page.edit + 1; k <= edit; k++) page.seen.set(`e${k}`, now);
        page.edit = edit;
      }
      const rows = m.data?.[0]?.rows ?? -1;
      if (rows > page.rows) {
        for (let k = page.rows + 1; k <= rows; k++) page.seen.set(`r${k}`, now);
        page.rows = rows;
      }
    }
  };
  ws.onclose = () => page.closed = true;
  await new Promise<void>((ok, fail) => {
    ws.onopen = () => ok();
    ws.onerror = () => fail(new Error("A page could not open /live"));
  });
  return page;
}

/**
 * Opens /live by hand and never reads again.
 *
 * @param port The server's port.
 * @param token The token.
 * @returns The connection.
 */
export async function deafPage(port: number, token: string): Promise<Deno.Conn> {
  const conn = await Deno.connect({ hostname: "127.0.0.1", port });
  const head = [
    "GET /live HTTP/1.1",
    `Host: 127.0.0.1:${port}`,
    `Origin: http://127.0.0.1:${port}`,
    `Cookie: plumb_token=${token}`,
    "Upgrade: websocket",
    "Connection: Upgrade",
    "Sec-WebSocket-Key: dGhlIHNhbXBsZSBub25jZQ==",
    "Sec-WebSocket-Version: 13",
  ];
  await conn.write(new TextEncoder().encode(head.join("\r\n") + "\r\n\r\n"));
  return conn;
}

/** Idle connections kept at a count: one closed by the server is counted and opened again. */
export class IdlePool {
  closedByServer = 0;
  #conns = new Set<Deno.Conn>();
  #stopped = false;

  constructor(readonly port: number, readonly count: number) {}

  /** Tops the pool up (at most `burst` new connections a call). */
  async topUp(burst = 100): Promise<void> {
    for (let i = 0; i < burst && this.#conns.size < this.count && !this.#stopped; i++) {
      let conn: Deno.Conn;
      try {
        conn = await Deno.connect({ hostname: "127.0.0.1", port: this.port });
      } catch {
        return;
      }
      this.#conns.add(conn);
      void conn.read(new Uint8Array(256)).then(() => {}, () => {}).finally(() => {
        if (this.#stopped) return;
        this.#conns.delete(conn);
        this.closedByServer++;
        try {
          conn.close();
        } catch { /* closed */ }
      });
    }
  }

  /** Closes every connection. */
  stop(): void {
    this.#stopped = true;
    for (const c of this.#conns) {
      try {
        c.close();
      } catch { /* closed */ }
    }
  }
}

/**
 * Times GET / on a fresh connection.
 *
 * @param port The server's port.
 * @param token The token.
 * @returns Milliseconds, or null when it failed or took over 5 s.
 */
export async function probe(port: number, token: string): Promise<number | null> {
  const t0 = performance.now();
  let conn: Deno.Conn | null = null;
  const timer = setTimeout(() => conn?.close(), 5000);
  try {
    conn = await Deno.connect({ hostname: "127.0.0.1", port });
    await conn.write(new TextEncoder().encode(
      `GET / HTTP/1.1\r\nHost: 127.0.0.1:${port}\r\nCookie: plumb_token=${token}\r\n` +
        "Connection: close\r\n\r\n",
    ));
    const buf = new Uint8Array(32);
    const n = await conn.read(buf);
    const ok = /^HTTP\/1\.1 200/.test(new TextDecoder().decode(buf.subarray(0, n ?? 0)));
    return ok ? performance.now() - t0 : null;
  } catch {
    return null;
  } finally {
    clearTimeout(timer);
    try {
      conn?.close();
    } catch { /* closed by the timer */ }
  }
}

/**
 * The first line a started server prints (its port, token and pid as JSON),
 * leaving the rest of its output unread.
 *
 * @param child The server's process (stdout piped).
 * @returns The line.
 * @throws {Error} When the server ends before printing a line.
 */
export async function firstLine(child: Deno.ChildProcess): Promise<string> {
  const reader = child.stdout.pipeThrough(new TextDecoderStream()).getReader();
  let out = "";
  while (!out.includes("\n")) {
    const { value, done } = await reader.read();
    if (done) throw new Error(`The server did not start: ${out}`);
    out += value;
  }
  reader.releaseLock();
  return out.split("\n")[0];
}
