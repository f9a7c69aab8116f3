/**
 * The page's WebSocket to `/live`: parses each message and hands it to the
 * store in arrival order; reconnects with a growing pause (0.25 s doubling
 * to 4 s) when the connection drops, since the server sends the whole
 * document again on connect.
 *
 * @module
 */
import type { ServerMessage } from "../kernel/server/protocol.ts";
import type { LiveStore } from "./store.ts";

/**
 * Connects the store to the server.
 *
 * @param store The page's store.
 * @param url The WebSocket URL (default: `/live` on this page's host).
 * @returns A function that closes the connection for good.
 */
export function connectLive(store: LiveStore, url?: string): () => void {
  const target = url ??
    `${location.protocol === "https:" ? "wss:" : "ws:"}//${location.host}/live`;
  let pause = 250;
  let closed = false;
  let ws: WebSocket | null = null;
  const open = () => {
    store.connection.value = "connecting";
    ws = new WebSocket(target);
    ws.onopen = () => {
      pause = 250;
      store.connection.value = "open";
    };
    ws.onmessage = (e) => {
      let msg: ServerMessage;
      try {
        msg = JSON.parse(String(e.data));
      } catch {
        console.warn("Plumb: a live message was not JSON");
        return;
      }
      store.apply(msg);
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
