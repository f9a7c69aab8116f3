/**
 * The page's WebSocket to `/live`: parses each message and queues it; the
 * queue is applied to the store in arrival order once per animation frame,
 * in one signal batch, so a burst of messages (a run's queued, computing and
 * current states) costs one render, not one per message. A `run` message
 * ends a run's burst (the server sends a short run's cells together, then
 * it): the queue is applied at once, so the page's work is done before the
 * next frame rather than after it. Reconnects with a growing pause (0.25 s doubling
 * to 4 s) when the connection drops, since the server sends the whole
 * document again on connect. While it retries the connection stays
 * "closed" (the top bar says the page is not live) until a socket opens.
 *
 * @module
 */
import type { ServerMessage } from "../kernel/server/protocol.ts";
import { batch } from "@preact/signals";
import type { LiveStore } from "./store.ts";

/** Longest wait for a frame (a hidden tab gets none): then the queue is applied anyway. */
const FRAME_FALLBACK_MS = 50;

/**
 * A queue of messages applied together once per frame.
 *
 * @param store The page's store.
 * @returns `push`, which queues one message and asks for a frame.
 */
function frameQueue(store: LiveStore): { push(msg: ServerMessage): void } {
  let queue: ServerMessage[] = [];
  let frame: number | null = null;
  let timer: ReturnType<typeof setTimeout> | null = null;
  const flush = () => {
    if (frame !== null) cancelAnimationFrame(frame);
    if (timer !== null) clearTimeout(timer);
    frame = timer = null;
    const msgs = queue;
    queue = [];
    batch(() => {
      for (const m of msgs) store.apply(m);
    });
  };
  return {
    push(msg) {
      queue.push(msg);
      if (msg.type === "run") return flush();
      if (frame !== null) return;
      frame = requestAnimationFrame(flush);
      timer = setTimeout(flush, FRAME_FALLBACK_MS);
    },
  };
}

/**
 * Connects the store to the server.
 *
 * @param store The page's store.
 * @param url The WebSocket URL (default: `/live?text=changed` on this page's host: the
 *   document's text is sent only when it changed, see kernel/server/live_channel.ts).
 * @returns A function that closes the connection for good.
 */
export function connectLive(store: LiveStore, url?: string): () => void {
  const target = url ??
    `${location.protocol === "https:" ? "wss:" : "ws:"}//${location.host}/live?text=changed`;
  let pause = 250;
  let closed = false;
  let ws: WebSocket | null = null;
  const queue = frameQueue(store);
  const open = () => {
    // Retrying after a loss stays "closed" until open: the page says not live, without flicker.
    if (store.connection.value !== "closed") store.connection.value = "connecting";
    ws = new WebSocket(target);
    ws.onopen = () => {
      pause = 250;
      store.connection.value = "open";
    };
    ws.onmessage = (e) => {
      let msg: ServerMessage | ServerMessage[];
      try {
        msg = JSON.parse(String(e.data));
      } catch {
        console.warn("Plumb: a live message was not JSON");
        return;
      }
      // A frame holds one message, or a run's burst as an array in order.
      for (const m of Array.isArray(msg) ? msg : [msg]) queue.push(m);
    };
    ws.onclose = () => {
      if (closed) return;
      store.connection.value = "closed";
      setTimeout(open, pause);
      pause = Math.min(4000, pause * 2);
    };
  };
  open();
  return () => {
    closed = true;
    ws?.close();
  };
}
