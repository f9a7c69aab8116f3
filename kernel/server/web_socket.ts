/**
 * The server's side of a WebSocket (RFC 6455) on a connection the listener
 * owns: the upgrade handshake, text frames out through a write queue whose
 * size is `bufferedAmount`, frames in (masked, as the RFC requires of
 * clients), ping and pong, and the closing handshake.
 *
 * ```
 *  send(text) ─▶ queue ─▶ pump: one write at a time ─▶ connection
 *                 │ bufferedAmount = bytes queued and not yet written
 *  close() ─▶ close frame after the queue; the connection is cut after
 *             CLOSE_GRACE_MS when the peer does not read it (a stalled write)
 *  every PING_MS a ping; nothing heard for 3 × PING_MS ─▶ closed
 * ```
 *
 * `upgradeWebSocket` keeps Deno's shape (`{ socket, response }`, the same
 * event properties), so the handler code reads as before; the socket opens
 * when the HTTP layer (http_connection.ts) has written the 101 answer.
 *
 * @module
 */
import type { ConnReader } from "./_conn_reader.ts";
import { writeAll } from "./_http_write.ts";
import { readFrame } from "./_ws_frames.ts";

/** How often a ping goes out; a peer silent for three of these is closed. */
export const PING_MS = 20_000;
/** How long a closing socket's peer has to take the close frame before the connection is cut. */
export const CLOSE_GRACE_MS = 1_000;
/** The largest message accepted from a page (it sends none today). */
const MAX_IN_BYTES = 1 << 20;
const GUID = "258EAFA5-E914-47DA-95CA-C5AB0DC85B11";

/** What the listener does to finish an upgrade. */
interface Pending {
  response: Response;
  accept(conn: Deno.Conn, reader: ConnReader): Promise<void>;
}

const pending = new WeakMap<Request, Pending>();

/** One WebSocket, server side. */
export class LiveSocket {
  readyState: number = WebSocket.CONNECTING;
  onopen: (() => void) | null = null;
  onclose: (() => void) | null = null;
  onerror: (() => void) | null = null;
  onmessage: ((e: { data: string | Uint8Array }) => void) | null = null;
  #conn: Deno.Conn | null = null;
  #queue: Uint8Array[] = [];
  #queued = 0;
  #pumping = false;
  #heard = Date.now();
  #timers: ReturnType<typeof setTimeout>[] = [];

  /** Bytes queued and not yet written to the connection. */
  get bufferedAmount(): number {
    return this.#queued;
  }

  /** @param text A text message (ignored unless open). */
  send(text: string): void {
    if (this.readyState !== WebSocket.OPEN) return;
    this.#enqueue(frame(1, new TextEncoder().encode(text)));
  }

  /**
   * Starts the closing handshake; the connection is cut when the peer does not take it.
   *
   * @param code The close code.
   * @param reason A short reason.
   */
  close(code = 1000, reason = ""): void {
    if (this.readyState >= WebSocket.CLOSING) return;
    if (this.readyState === WebSocket.CONNECTING) return this.#finish();
    this.readyState = WebSocket.CLOSING;
    const r = new TextEncoder().encode(reason).subarray(0, 123);
    const body = new Uint8Array(2 + r.length);
    new DataView(body.buffer).setUint16(0, code);
    body.set(r, 2);
    this.#enqueue(frame(8, body));
    this.#timers.push(setTimeout(() => this.#finish(), CLOSE_GRACE_MS));
  }

  /** Opens the socket on a connection whose 101 answer was written; reads until it closes. */
  async run(conn: Deno.Conn, reader: ConnReader): Promise<void> {
    this.#conn = conn;
    this.readyState = WebSocket.OPEN;
    this.#timers.push(setInterval(() => this.#ping(), PING_MS));
    this.onopen?.();
    try {
      for (;;) {
        const f = await readFrame(reader, MAX_IN_BYTES);
        if (typeof f === "string") {
          this.close(f === "too large" ? 1009 : 1002, `The message was ${f}`);
          break;
        }
        if (f === null) break;
        this.#heard = Date.now();
        if (f.opcode === 8) break;
        if (f.opcode === 9) this.#enqueue(frame(10, f.payload));
        else if (f.opcode === 1) this.onmessage?.({ data: new TextDecoder().decode(f.payload) });
        else if (f.opcode === 2) this.onmessage?.({ data: f.payload });
      }
    } finally {
      this.#finish();
    }
  }

  #ping(): void {
    if (Date.now() - this.#heard > 3 * PING_MS) return this.#finish();
    this.#enqueue(frame(9, new Uint8Array(0)));
  }

  #enqueue(bytes: Uint8Array): void {
    if (this.readyState === WebSocket.CLOSED) return;
    this.#queue.push(bytes);
    this.#queued += bytes.length;
    if (!this.#pumping) void this.#pump();
  }

  async #pump(): Promise<void> {
    this.#pumping = true;
    while (this.#queue.length > 0 && this.#conn) {
      const bytes = this.#queue.shift()!;
      const ok = await writeAll(this.#conn, [bytes]);
      this.#queued -= bytes.length;
      if (!ok) return this.#finish();
      if (bytes[0] === 0x88) return this.#finish(); // the close frame went out
    }
    this.#pumping = false;
  }

  /** Cuts the connection and tells the owner, once. */
  #finish(): void {
    if (this.readyState === WebSocket.CLOSED) return;
    const wasOpen = this.readyState !== WebSocket.CONNECTING;
    this.readyState = WebSocket.CLOSED;
    for (const t of this.#timers) clearTimeout(t);
    this.#queue = [];
    this.#queued = 0;
    try {
      this.#conn?.close();
    } catch { /* closed already */ }
    if (wasOpen) this.onclose?.();
  }
}

/**
 * Prepares a WebSocket upgrade of a request (Deno.upgradeWebSocket's shape).
 * The handler returns `response`; the HTTP layer then writes the 101 answer
 * and the socket opens.
 *
 * @param req A GET with `Upgrade: websocket`.
 * @returns The socket and the response to return (a 400 in words when the request is no upgrade).
 */
export function upgradeWebSocket(req: Request): { socket: LiveSocket; response: Response } {
  const socket = new LiveSocket();
  const key = req.headers.get("sec-websocket-key");
  if (key === null || req.headers.get("sec-websocket-version") !== "13") {
    const response = new Response(
      "A WebSocket upgrade needs Sec-WebSocket-Key and Sec-WebSocket-Version 13\n",
      { status: 400 },
    );
    return { socket, response };
  }
  const response = new Response(null, { status: 200 });
  pending.set(req, {
    response,
    async accept(conn, reader) {
      const digest = await crypto.subtle.digest("SHA-1", new TextEncoder().encode(key + GUID));
      const accept = btoa(String.fromCharCode(...new Uint8Array(digest)));
      const head = "HTTP/1.1 101 Switching Protocols\r\nUpgrade: websocket\r\n" +
        `Connection: Upgrade\r\nSec-WebSocket-Accept: ${accept}\r\n\r\n`;
      if (await writeAll(conn, [new TextEncoder().encode(head)])) await socket.run(conn, reader);
      else socket.close();
    },
  });
  return { socket, response };
}

/**
 * The upgrade a handler prepared for this request, if its answer was the upgrade's response.
 *
 * @param req The request.
 * @param res The handler's answer.
 * @returns The pending upgrade, or null.
 */
export function takeUpgrade(req: Request, res: Response): Pending | null {
  const p = pending.get(req);
  pending.delete(req);
  return p && p.response === res ? p : null;
}

/** A server frame (never masked): FIN, opcode, length, payload. */
function frame(opcode: number, payload: Uint8Array): Uint8Array {
  const n = payload.length;
  const extra = n < 126 ? 0 : n < 65536 ? 2 : 8;
  const out = new Uint8Array(2 + extra + n);
  out[0] = 0x80 | opcode;
  const view = new DataView(out.buffer);
  if (extra === 0) out[1] = n;
  else if (extra === 2) (out[1] = 126, view.setUint16(2, n));
  else (out[1] = 127, view.setBigUint64(2, BigInt(n)));
  out.set(payload, 2 + extra);
  return out;
}
