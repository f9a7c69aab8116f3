/**
 * HTTP/1.1 on one accepted connection: the request heads and bodies read by
 * hand, each request handed to the server's handler as a web `Request`, its
 * `Response` written back; keep-alive between requests; a request upgraded
 * to a WebSocket hands the connection over (web_socket.ts).
 *
 * ```
 *  wait head (deadline: headMs for the first, idleMs between requests)
 *     ├─ > MAX_HEAD_BYTES ─▶ 431, close      ├─ malformed ─▶ 400, close
 *     ▼
 *  Request (body streamed from the connection: Content-Length or chunked)
 *     ▼ handler
 *  upgraded? ─▶ 101, the WebSocket owns the connection
 *  else write the response (deadline: writeMs); body left unread ─▶ close
 * ```
 *
 * Why not `Deno.serve`: in Deno 2.9.6 it has no idle, header or write
 * timeout and no connection cap, and its accept loop ends the server on the
 * first EMFILE (measured: 219 idle connections under `ulimit -n 256`). No
 * public API serves HTTP on a connection we accepted ourselves, so the
 * listener (listener.ts) and this small HTTP/1.1 layer are ours.
 *
 * @module
 */
import { ConnReader, HeadTooLarge } from "./_conn_reader.ts";
import { statusLine, writeAll } from "./_http_write.ts";
import { takeUpgrade } from "./web_socket.ts";

/** Largest request head (request line and headers). */
export const MAX_HEAD_BYTES = 32 * 1024;

/** How one connection is watched by the listener. */
export interface Watch {
  /** Closes the connection unless it progresses within `ms` (null: no deadline). */
  deadline(ms: number | null): void;
  /** The connection is waiting for a request head (it may be closed to make room). */
  waiting(yes: boolean): void;
  /** The connection became a WebSocket. */
  upgraded(): void;
}

/** Timeouts of a connection, in ms. */
export interface HttpTimeouts {
  headMs: number;
  idleMs: number;
  writeMs: number;
}

/** Answers a request. */
export type Handler = (req: Request) => Response | Promise<Response>;

interface Head {
  method: string;
  target: string;
  http10: boolean;
  headers: Headers;
}

/**
 * Serves HTTP/1.1 requests on a connection until it closes.
 *
 * @param conn The accepted connection.
 * @param handler Answers each request.
 * @param watch The listener's deadlines and states for this connection.
 * @param t The timeouts.
 * @returns When the connection is done (closed or handed to a WebSocket).
 */
export async function serveConnection(
  conn: Deno.Conn,
  handler: Handler,
  watch: Watch,
  t: HttpTimeouts,
): Promise<void> {
  const reader = new ConnReader(conn);
  for (let first = true;; first = false) {
    watch.waiting(true);
    watch.deadline(first ? t.headMs : t.idleMs);
    let bytes: Uint8Array | null;
    try {
      bytes = await reader.head(MAX_HEAD_BYTES);
    } catch (err) {
      if (err instanceof HeadTooLarge) await refuse(conn, 431, "The request head is too large");
      return;
    }
    if (bytes === null) return;
    watch.waiting(false);
    watch.deadline(t.headMs); // the rest of the head's bytes and the body must keep coming
    const head = parseHead(new TextDecoder().decode(bytes));
    if (typeof head === "string") return await refuse(conn, 400, head);
    const body = requestBody(head, reader, () => watch.deadline(t.headMs));
    if (typeof body === "string") return await refuse(conn, 400, body);
    const local = conn.localAddr as Deno.NetAddr;
    const url = `http://${head.headers.get("host") || `${local.hostname}:${local.port}`}`;
    const req = new Request(new URL(head.target, url), {
      method: head.method,
      headers: head.headers,
      body: body.stream,
    });
    watch.deadline(null); // the handler may take long (a save); the write has its own deadline
    const res = await answer(handler, req);
    const up = takeUpgrade(req, res);
    if (up) {
      watch.upgraded();
      return await up.accept(conn, reader);
    }
    const keep = !head.http10 && body.done() &&
      head.headers.get("connection")?.toLowerCase() !== "close";
    watch.deadline(t.writeMs);
    if (!(await writeResponse(conn, req.method, res, keep))) return;
    if (!keep) return;
  }
}

async function answer(handler: Handler, req: Request): Promise<Response> {
  try {
    return await handler(req);
  } catch (err) {
    const why = err instanceof Error ? err.message : String(err);
    return new Response(`Cannot answer ${req.method} "${new URL(req.url).pathname}": ${why}\n`, {
      status: 500,
      headers: { "content-type": "text/plain; charset=utf-8" },
    });
  }
}

/** Parses a request head; a string says what is wrong with it. */
export function parseHead(text: string): Head | string {
  const lines = text.split("\r\n");
  const m = /^([A-Z]+) (\S+) HTTP\/1\.([01])$/.exec(lines[0]);
  if (!m) return `Malformed request line "${lines[0].slice(0, 80)}"`;
  const headers = new Headers();
  for (const line of lines.slice(1)) {
    const colon = line.indexOf(":");
    if (colon <= 0) return `Malformed header line "${line.slice(0, 80)}"`;
    try {
      headers.append(line.slice(0, colon).trim(), line.slice(colon + 1).trim());
    } catch {
      return `Malformed header "${line.slice(0, colon).slice(0, 80)}"`;
    }
  }
  if (!m[2].startsWith("/")) return `Malformed request target "${m[2].slice(0, 80)}"`;
  return { method: m[1], target: m[2], http10: m[3] === "0", headers };
}

/** The request's body as a stream read from the connection, and whether it was read to its end. */
function requestBody(
  head: Head,
  reader: ConnReader,
  progress: () => void,
): { stream: ReadableStream<Uint8Array> | null; done: () => boolean } | string {
  const chunked = head.headers.get("transfer-encoding")?.toLowerCase() === "chunked";
  const lengthText = head.headers.get("content-length");
  if (!chunked && lengthText === null) return { stream: null, done: () => true };
  let left = chunked ? -1 : Number(lengthText);
  if (!chunked && (!/^\d+$/.test(lengthText!) || !Number.isSafeInteger(left))) {
    return `Malformed Content-Length "${lengthText}"`;
  }
  if (head.method === "GET" || head.method === "HEAD" || left === 0) {
    return left === 0 ? { stream: null, done: () => true } : "A GET or HEAD may not have a body";
  }
  let ended = false;
  const stream = new ReadableStream<Uint8Array>({
    async pull(ctl) {
      const bytes = chunked ? await nextChunk(reader) : await reader.some(Math.min(left, 65536));
      if (bytes === null) return ctl.error(new Error("The request body ended early"));
      progress();
      if (!chunked) left -= bytes.length;
      if (bytes.length > 0) ctl.enqueue(bytes);
      if ((chunked && bytes.length === 0) || left === 0) {
        ended = true;
        ctl.close();
      }
    },
  });
  return { stream, done: () => ended };
}

/** One chunk of a chunked body (empty at its end), or null when malformed or cut off. */
async function nextChunk(reader: ConnReader): Promise<Uint8Array | null> {
  const size = await reader.line(1024);
  if (size === null || !/^[0-9a-fA-F]{1,8}(;.*)?$/.test(size)) return null;
  const n = parseInt(size, 16);
  if (n === 0) {
    for (;;) { // trailers, up to the blank line
      const line = await reader.line(8192);
      if (line === null) return null;
      if (line === "") return new Uint8Array(0);
    }
  }
  const bytes = await reader.exactly(n);
  return bytes !== null && (await reader.line(2)) === "" ? bytes : null;
}

/** Writes a response; false when the connection failed. */
async function writeResponse(
  conn: Deno.Conn,
  method: string,
  res: Response,
  keep: boolean,
): Promise<boolean> {
  let body: Uint8Array;
  try {
    body = new Uint8Array(await res.arrayBuffer());
  } catch {
    body = new TextEncoder().encode("The answer could not be read in full\n");
    res = new Response(null, { status: 500 });
  }
  const lines = [statusLine(res.status)];
  for (const [k, v] of res.headers) {
    if (k !== "content-length" && k !== "connection" && k !== "transfer-encoding") {
      lines.push(`${k}: ${v}`);
    }
  }
  lines.push(`content-length: ${body.length}`, `connection: ${keep ? "keep-alive" : "close"}`);
  const headBytes = new TextEncoder().encode(lines.join("\r\n") + "\r\n\r\n");
  const noBody = method === "HEAD" || res.status === 204 || res.status === 304;
  return await writeAll(conn, noBody ? [headBytes] : [headBytes, body]);
}

/** Answers with a status and a sentence, then the caller closes. */
async function refuse(conn: Deno.Conn, status: number, message: string): Promise<void> {
  const res = new Response(`${message}\n`, {
    status,
    headers: { "content-type": "text/plain; charset=utf-8" },
  });
  await writeResponse(conn, "GET", res, false);
}
