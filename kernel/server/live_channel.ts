/**
 * The browsers' side of the live channel: every open WebSocket, and which
 * result of every cell each has been sent, so that a result reused from the
 * cache is not sent again.
 *
 * ```
 *  LiveWorkspace ─Outgoing─▶ broadcast ─┬─ socket has this cell's result id? ─▶ light text
 *                                       │   (the message without its result)
 *                                       └─ otherwise ───────────────────────▶ full text
 *
 *  full text = light text with  ,"omitted":[…],"result":<the worker's JSON text>  spliced in
 * ```
 *
 * A cell's result travels as the JSON text the compute worker wrote
 * (`PageText`): it is spliced into the message's text, never parsed and
 * written again on this thread. Its `id` is the cell's cache key (followed by
 * the fields kept for inline values, when some are): each socket remembers
 * the id it was last sent per cell, and a current message whose id the socket
 * has goes without the result (the page keeps the one it has). A `document`
 * message that drops a cell or changes its kind makes the socket forget it
 * (the page forgets it too). Each text is written once per message, whatever
 * the number of sockets.
 *
 * @module
 */
import type { PageText } from "../session/session.ts";
import type { CellMessage, DocumentMessage, RunMessage } from "./protocol.ts";

/** A cell message as the server holds it: the result as the worker's JSON text. */
export interface OutgoingCell extends Omit<CellMessage, "result"> {
  /** The page copy of the result (present only with state current). */
  result?: PageText;
}

/** A server → browser message as the server holds it (the page reads it as a `ServerMessage`). */
export type Outgoing = DocumentMessage | OutgoingCell | RunMessage;

/** The message without its result and the names of the fields the result leaves out. */
function withoutResult(msg: Outgoing): Omit<Outgoing, "result" | "omitted"> {
  if (msg.type !== "cell") return msg;
  const { result: _r, omitted: _o, ...rest } = msg;
  return rest;
}

/**
 * Writes a message as JSON, a cell's result spliced in as the worker's text.
 * Results are plain data already (the compute worker's `plainDeep`), so no
 * replacer is needed (one called for every value took about 4 ms a live
 * update, measured).
 *
 * @param msg The message.
 * @returns The JSON text the page reads.
 * @example
 * ```ts
 * import { encodeMessage } from "./live_channel.ts";
 * const t = encodeMessage({
 *   type: "cell", version: "v", name: "f", kind: "fit", state: "current",
 *   result: { json: '{"r2":0.5}', id: "k" }, omitted: ["rows"],
 * });
 * const m = JSON.parse(t);
 * if (m.result.r2 !== 0.5 || m.omitted[0] !== "rows") throw new Error(t);
 * ```
 */
export function encodeMessage(msg: Outgoing): string {
  return new Texts(msg).full;
}

/** A message's two texts, each written at most once whatever the number of sockets. */
class Texts {
  #light: string | null = null;
  #full: string | null = null;

  constructor(readonly msg: Outgoing) {}

  /** The message without its result: what a socket that has the result gets. */
  get light(): string {
    return this.#light ??= JSON.stringify(withoutResult(this.msg));
  }

  /** The whole message. */
  get full(): string {
    const msg = this.msg;
    if (msg.type !== "cell" || msg.result === undefined) return this.light;
    const omitted = msg.omitted === undefined ? "" : `,"omitted":${JSON.stringify(msg.omitted)}`;
    // The light text is an object with at least `type`: close it after the spliced fields.
    return this.#full ??= `${this.light.slice(0, -1)}${omitted},"result":${msg.result.json}}`;
  }
}

/** The open sockets of one server and the results each has been sent. */
export class LiveChannel {
  /** Per socket, per cell: its kind and the id of the result the socket has. */
  #sent = new Map<WebSocket, Map<string, { kind: string; id: string }>>();

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
  open(ws: WebSocket, welcome: Outgoing[]): void {
    this.#sent.set(ws, new Map());
    for (const msg of welcome) {
      if (ws.readyState === WebSocket.OPEN) ws.send(this.#textFor(ws, new Texts(msg)));
    }
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
   * Sends a message to every open socket, a cell's result only to those that do not have it.
   *
   * @param msg The message (a cell message carries its page result as text).
   */
  broadcast(msg: Outgoing): void {
    const texts = new Texts(msg);
    for (const ws of this.#open()) ws.send(this.#textFor(ws, texts));
  }

  /**
   * Sends messages to every open socket in one frame (a JSON array, in
   * order), each cell's result only to the sockets that do not have it: the
   * page reads a run's burst in one go and redraws once.
   *
   * @param msgs The messages, in order.
   */
  broadcastMany(msgs: readonly Outgoing[]): void {
    if (msgs.length === 0) return;
    const texts = msgs.map((m) => new Texts(m));
    for (const ws of this.#open()) {
      ws.send(`[${texts.map((t) => this.#textFor(ws, t)).join(",")}]`);
    }
  }

  #open(): WebSocket[] {
    return [...this.#sent.keys()].filter((ws) => ws.readyState === WebSocket.OPEN);
  }

  /** The text a socket gets: light when it has the result, else whole (and noted). */
  #textFor(ws: WebSocket, texts: Texts): string {
    if (this.#has(ws, texts.msg)) return texts.light;
    this.#remember(ws, texts.msg);
    return texts.full;
  }

  /** Whether a cell message's result is the one this socket was last sent for that cell. */
  #has(ws: WebSocket, msg: Outgoing): boolean {
    return msg.type === "cell" && msg.result !== undefined &&
      this.#sent.get(ws)?.get(msg.name)?.id === msg.result.id;
  }

  /** Notes what a socket is being sent: the results it has, the cells a document keeps. */
  #remember(ws: WebSocket, msg: Outgoing): void {
    const sent = this.#sent.get(ws);
    if (sent === undefined) return;
    if (msg.type === "document") {
      const kinds = new Map<string, string>();
      for (const b of msg.blocks) if (b.type === "cell") kinds.set(b.name, b.kind);
      for (const [name, s] of sent) if (kinds.get(name) !== s.kind) sent.delete(name);
    } else if (msg.type === "cell" && msg.result !== undefined) {
      sent.set(msg.name, { kind: msg.kind, id: msg.result.id });
    }
  }

  /** Closes every socket. */
  closeAll(): void {
    for (const ws of this.#sent.keys()) ws.close();
    this.#sent.clear();
  }
}
