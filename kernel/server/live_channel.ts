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
 * A page connected with `/live?text=changed` is sent the document's text
 * (`source` and `blocks`) only when it changed: a `document` message for a
 * version the socket already has (a data-only change) goes without them
 * (2 MB document: 4.3 MB a socket for each appended row before). Other
 * pages get every `document` message whole, as before.
 *
 * A page that does not read what it is sent (`bufferedAmount` over
 * `slowBytes`) is skipped: nothing more is queued for it; when its queue has
 * drained below a quarter of that it is sent the latest state (the welcome)
 * afresh; when it stays behind for `stallMs` it is closed (code 1013) and
 * the page reconnects. What the server holds for one page is thus about
 * `slowBytes` plus one welcome (3 pages that never read: 262 MB → 1.45 GB
 * of server memory in 20 s before).
 *
 * @module
 */
import type { PageText } from "../session/session.ts";
import type { CellMessage, ChangesMessage, DocumentMessage, RunMessage } from "./protocol.ts";

/** A cell message as the server holds it: the result as the worker's JSON text. */
export interface OutgoingCell extends Omit<CellMessage, "result"> {
  /** The page copy of the result (present only with state current). */
  result?: PageText;
}

/** A server → browser message as the server holds it (the page reads it as a `ServerMessage`). */
export type Outgoing = DocumentMessage | OutgoingCell | RunMessage | ChangesMessage;

/** What the channel needs of a socket (a WebSocket, or web_socket.ts's LiveSocket). */
export interface LiveSink {
  readonly readyState: number;
  readonly bufferedAmount: number;
  send(text: string): void;
  close(code?: number, reason?: string): void;
}

/** How the channel treats slow pages (see the module's text). */
export interface ChannelLimits {
  slowBytes: number;
  stallMs: number;
}

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
  #data: string | null = null;

  constructor(readonly msg: Outgoing) {}

  /** The message without its result: what a socket that has the result gets. */
  get light(): string {
    return this.#light ??= JSON.stringify(withoutResult(this.msg));
  }

  /** A document message without its text (`source`, `blocks`), for a socket that has it. */
  get data(): string {
    if (this.msg.type !== "document") return this.light;
    const { source: _s, blocks: _b, ...rest } = this.msg;
    return this.#data ??= JSON.stringify(rest);
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

/** What the channel keeps per socket. */
interface Peer {
  /** Per cell: its kind and the id of the result the socket has. */
  sent: Map<string, { kind: string; id: string }>;
  /** The version of the document text the socket has. */
  text: string | null;
  /** Whether the page asked for the text only when it changed. */
  textOnce: boolean;
  /** The latest state, for a resend when the page has caught up. */
  latest: () => Outgoing[];
  /** Since when the socket has been skipped (performance.now()), or null. */
  behind: number | null;
}

/** The open sockets of one server and what each has been sent. */
export class LiveChannel {
  #peers = new Map<LiveSink, Peer>();
  #limits: ChannelLimits;
  #timer: ReturnType<typeof setInterval> | null = null;

  /** @param limits When a page counts as slow, and how long it may stay behind. */
  constructor(limits: Partial<ChannelLimits> = {}) {
    this.#limits = { slowBytes: 4 << 20, stallMs: 30_000, ...limits };
  }

  /** How many sockets are open. */
  get size(): number {
    return this.#peers.size;
  }

  /**
   * Adds a socket and sends it the messages that bring it up to date.
   *
   * @param ws An open socket.
   * @param welcome The document message and the latest message of every cell
   *   (a function: called again when a slow page has caught up).
   * @param url The socket's request URL: `?text=changed` asks for the text only when it changed.
   */
  open(ws: LiveSink, welcome: Outgoing[] | (() => Outgoing[]), url?: string): void {
    const latest = typeof welcome === "function" ? welcome : () => welcome;
    const textOnce = url !== undefined && new URL(url).searchParams.get("text") === "changed";
    const peer: Peer = { sent: new Map(), text: null, textOnce, latest, behind: null };
    this.#peers.set(ws, peer);
    this.#welcome(ws, peer);
  }

  /**
   * Forgets a socket.
   *
   * @param ws The socket.
   */
  close(ws: LiveSink): void {
    this.#peers.delete(ws);
  }

  /**
   * Sends a message to every open socket, a cell's result only to those that do not have it.
   *
   * @param msg The message (a cell message carries its page result as text).
   */
  broadcast(msg: Outgoing): void {
    const texts = new Texts(msg);
    for (const [ws, peer] of this.#ready()) ws.send(this.#textFor(peer, texts));
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
    for (const [ws, peer] of this.#ready()) {
      ws.send(`[${texts.map((t) => this.#textFor(peer, t)).join(",")}]`);
    }
  }

  /** Closes every socket. */
  closeAll(): void {
    for (const ws of this.#peers.keys()) ws.close();
    this.#peers.clear();
    if (this.#timer !== null) clearInterval(this.#timer);
    this.#timer = null;
  }

  /** The open sockets that keep up; one over `slowBytes` is set aside (skipped). */
  #ready(): [LiveSink, Peer][] {
    const out: [LiveSink, Peer][] = [];
    for (const [ws, peer] of this.#peers) {
      if (ws.readyState !== WebSocket.OPEN || peer.behind !== null) continue;
      if (ws.bufferedAmount > this.#limits.slowBytes) {
        peer.behind = performance.now();
        this.#timer ??= setInterval(() => this.#checkBehind(), 100);
        continue;
      }
      out.push([ws, peer]);
    }
    return out;
  }

  /** Resends the latest state to slow pages that caught up; closes those stalled too long. */
  #checkBehind(): void {
    let left = 0;
    for (const [ws, peer] of this.#peers) {
      if (peer.behind === null) continue;
      if (ws.readyState !== WebSocket.OPEN) {
        this.#peers.delete(ws);
      } else if (ws.bufferedAmount <= this.#limits.slowBytes / 4) {
        peer.behind = null;
        this.#welcome(ws, peer);
      } else if (performance.now() - peer.behind > this.#limits.stallMs) {
        this.#peers.delete(ws);
        ws.close(1013, "The page fell behind the updates: reconnect to catch up");
      } else left++;
    }
    if (left === 0 && this.#timer !== null) {
      clearInterval(this.#timer);
      this.#timer = null;
    }
  }

  /** Sends a socket the whole latest state, forgetting what it was sent before. */
  #welcome(ws: LiveSink, peer: Peer): void {
    peer.sent.clear();
    peer.text = null;
    for (const msg of peer.latest()) {
      if (ws.readyState === WebSocket.OPEN) ws.send(this.#textFor(peer, new Texts(msg)));
    }
  }

  /** The text a socket gets: without what it has (result, document text), else whole (and noted). */
  #textFor(peer: Peer, texts: Texts): string {
    const msg = texts.msg;
    if (msg.type === "document" && peer.textOnce && peer.text === msg.version) return texts.data;
    if (this.#has(peer, msg)) return texts.light;
    this.#remember(peer, msg);
    return texts.full;
  }

  /** Whether a cell message's result is the one this socket was last sent for that cell. */
  #has(peer: Peer, msg: Outgoing): boolean {
    return msg.type === "cell" && msg.result !== undefined &&
      peer.sent.get(msg.name)?.id === msg.result.id;
  }

  /** Notes what a socket is being sent: the results it has, the cells a document keeps. */
  #remember(peer: Peer, msg: Outgoing): void {
    const sent = peer.sent;
    if (msg.type === "document") {
      peer.text = msg.version;
      const kinds = new Map<string, string>();
      for (const b of msg.blocks) if (b.type === "cell") kinds.set(b.name, b.kind);
      for (const [name, s] of sent) if (kinds.get(name) !== s.kind) sent.delete(name);
    } else if (msg.type === "cell" && msg.result !== undefined) {
      sent.set(msg.name, { kind: msg.kind, id: msg.result.id });
    }
  }
}
