/**
 * The browsers' side of the live channel: every open WebSocket, and what each
 * has already been sent, so that a result reused from the cache is not sent
 * again.
 *
 * ```
 *  LiveWorkspace ─ServerMessage─▶ broadcast ─┬─ socket saw this result object? ─▶ light text
 *                                            │   (the message without result)
 *                                            └─ otherwise ─────────────────────▶ full text
 * ```
 *
 * A cell's result object is the one the session cached under the cell's key,
 * so the same object means the same key and the same result. Each socket
 * remembers the last result object sent per cell; a `document` message that
 * drops a cell or changes its kind makes the socket forget it (the page
 * forgets it too). Each text is written once per message, whatever the
 * number of sockets.
 *
 * @module
 */
import type { CellMessage, ServerMessage } from "./protocol.ts";

/**
 * Writes a message as JSON. Results must be plain data (no typed arrays):
 * the compute worker makes page copies so (`plainDeep`, kernel/arrays.ts).
 *
 * @param msg The message.
 * @returns The JSON text.
 * @example
 * ```ts
 * import { encodeMessage } from "./live_channel.ts";
 * const t = encodeMessage({ type: "run", version: "v", run: 1, ran: [], ms: 1, errors: [] });
 * if (JSON.parse(t).run !== 1) throw new Error(t);
 * ```
 */
export function encodeMessage(msg: ServerMessage): string {
  // No replacer: results arrive plain (the compute worker's `plainDeep`), and a
  // replacer called for every value took about 4 ms a live update (measured).
  return JSON.stringify(msg);
}

/** The cell message without its result: the page keeps the result it has. */
function light(msg: CellMessage): CellMessage {
  const { result: _r, omitted: _o, ...rest } = msg;
  return rest;
}

/** The open sockets of one server and the results each has been sent. */
export class LiveChannel {
  #sent = new Map<WebSocket, Map<string, { kind: string; result: unknown }>>();

  /** How many sockets are open. */
  get size(): number {
    return this.#sent.size;
  }

  /**
   * Adds a socket and sends it the messages that bring it up to date.
   *
   * @param ws An open socket.
   * @param welcome The document message and the latest message of every cell.
   */
  open(ws: WebSocket, welcome: ServerMessage[]): void {
    this.#sent.set(ws, new Map());
    for (const msg of welcome) this.#sendTo(ws, msg, encodeMessage(msg));
  }

  /**
   * Forgets a socket.
   *
   * @param ws The socket.
   */
  close(ws: WebSocket): void {
    this.#sent.delete(ws);
  }

  /**
   * Sends a message to every open socket, a cached result only to those that have not seen it.
   *
   * @param msg The message (a cell message carries its page result, see live_result.ts).
   */
  broadcast(msg: ServerMessage): void {
    const full = encodeMessage(msg);
    let lightText: string | null = null;
    for (const ws of this.#sent.keys()) {
      if (ws.readyState !== WebSocket.OPEN) continue;
      if (this.#seen(ws, msg)) ws.send(lightText ??= encodeMessage(light(msg as CellMessage)));
      else this.#sendTo(ws, msg, full);
    }
  }

  /**
   * Sends messages to every open socket in one frame (a JSON array, in
   * order), each cached result only to the sockets that have not seen it:
   * the page reads a run's burst in one go and redraws once.
   *
   * @param msgs The messages, in order.
   */
  broadcastMany(msgs: readonly ServerMessage[]): void {
    if (msgs.length === 0) return;
    const full = msgs.map((m) => encodeMessage(m));
    for (const ws of this.#sent.keys()) {
      if (ws.readyState !== WebSocket.OPEN) continue;
      const texts = msgs.map((msg, i) => {
        if (this.#seen(ws, msg)) return encodeMessage(light(msg as CellMessage));
        this.#remember(ws, msg);
        return full[i];
      });
      ws.send(`[${texts.join(",")}]`);
    }
  }

  /** Whether a cell message's result is the one this socket was last sent for that cell. */
  #seen(ws: WebSocket, msg: ServerMessage): boolean {
    return msg.type === "cell" && msg.result !== undefined &&
      this.#sent.get(ws)?.get(msg.name)?.result === msg.result;
  }

  #sendTo(ws: WebSocket, msg: ServerMessage, text: string): void {
    if (ws.readyState !== WebSocket.OPEN || !this.#sent.has(ws)) return;
    this.#remember(ws, msg);
    ws.send(text);
  }

  /** Notes what a socket is being sent: the results it holds, the cells a document keeps. */
  #remember(ws: WebSocket, msg: ServerMessage): void {
    const sent = this.#sent.get(ws);
    if (sent === undefined) return;
    if (msg.type === "document") {
      const kinds = new Map<string, string>();
      for (const b of msg.blocks) if (b.type === "cell") kinds.set(b.name, b.kind);
      for (const [name, s] of sent) if (kinds.get(name) !== s.kind) sent.delete(name);
    } else if (msg.type === "cell" && msg.result !== undefined) {
      sent.set(msg.name, { kind: msg.kind, result: msg.result });
    }
  }

  /** Closes every socket. */
  closeAll(): void {
    for (const ws of this.#sent.keys()) ws.close();
    this.#sent.clear();
  }
}
