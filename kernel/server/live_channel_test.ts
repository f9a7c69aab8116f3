import { deepEqual, equal, ok } from "node:assert/strict";
import { encodeMessage, LiveChannel, type OutgoingCell } from "./live_channel.ts";
import type { DocumentMessage } from "./protocol.ts";

/** A socket that keeps the texts it is sent. */
function fakeSocket() {
  const texts: string[] = [];
  const ws = { readyState: WebSocket.OPEN, send: (t: string) => texts.push(t), close() {} };
  return { ws: ws as unknown as WebSocket, texts };
}

const current = (json: string, id: string): OutgoingCell => ({
  type: "cell",
  version: "v1",
  name: "f",
  kind: "fit",
  state: "current",
  run: 1,
  ms: 3,
  warnings: [],
  cached: false,
  result: { json, id },
  omitted: ["rows"],
  summaryLine: "r² = 0.5",
});

const doc = (cells: [string, string][]): DocumentMessage => ({
  type: "document",
  version: "v1",
  path: "a.md",
  title: "A",
  source: "",
  blocks: cells.map(([name, kind]) => ({ type: "cell", name, kind, line: 1, body: "" })),
  data: [],
});

Deno.test("encodeMessage() splices the worker's text in: the page reads the message it read before", () => {
  const json = '{"r2":0.5,"params":[{"name":"a","estimate":-1.25e-7}],"note":"\\"q\\""}';
  const msg = current(json, "k1");
  deepEqual(JSON.parse(encodeMessage(msg)), { ...msg, result: JSON.parse(json) });
  const { result: _r, omitted: _o, ...light } = msg;
  deepEqual(JSON.parse(encodeMessage(light)), light);
});

Deno.test("LiveChannel.broadcast() sends a cell's result once per socket and cache key", () => {
  const channel = new LiveChannel();
  const a = fakeSocket();
  channel.open(a.ws, []);
  channel.broadcast(current('{"r2":0.5}', "k1"));
  channel.broadcast(current('{"r2":0.5}', "k1"));
  channel.broadcast(current('{"r2":0.7}', "k2"));
  const got = a.texts.map((t) => JSON.parse(t));
  deepEqual(got.map((m) => m.result), [{ r2: 0.5 }, undefined, { r2: 0.7 }]);
  equal(got[1].omitted, undefined);
  equal(got[1].summaryLine, "r² = 0.5");
  // A socket opened later gets the result it does not have.
  const b = fakeSocket();
  channel.open(b.ws, [current('{"r2":0.7}', "k2")]);
  deepEqual(JSON.parse(b.texts[0]).result, { r2: 0.7 });
});

Deno.test("LiveChannel.broadcastMany() sends one frame and resends a result after a document drops its cell", () => {
  const channel = new LiveChannel();
  const a = fakeSocket();
  channel.open(a.ws, [doc([["f", "fit"]]), current('{"r2":0.5}', "k1")]);
  channel.broadcastMany([doc([]), doc([["f", "fit"]]), current('{"r2":0.5}', "k1")]);
  equal(a.texts.length, 3);
  const frame = JSON.parse(a.texts[2]);
  ok(Array.isArray(frame) && frame.length === 3);
  deepEqual(frame[2].result, { r2: 0.5 });
});

/** A socket whose queue can be made to look full. */
function slowSocket() {
  const texts: string[] = [];
  const ws = {
    readyState: WebSocket.OPEN as number,
    bufferedAmount: 0,
    send: (t: string) => texts.push(t),
    close(code?: number) {
      ws.readyState = WebSocket.CLOSED;
      texts.push(`closed ${code}`);
    },
  };
  return { ws, texts };
}

Deno.test("LiveChannel skips a page that does not read, resends the latest state when it drains, closes it when it stalls", async () => {
  const channel = new LiveChannel({ slowBytes: 100, stallMs: 250 });
  const a = slowSocket();
  const b = slowSocket();
  let latest = [doc([["f", "fit"]]), current('{"r2":0.5}', "k1")];
  channel.open(a.ws, () => latest);
  channel.open(b.ws, () => latest);
  a.ws.bufferedAmount = b.ws.bufferedAmount = 1000; // neither reads
  channel.broadcast(current('{"r2":0.6}', "k2"));
  equal(a.texts.length, 2, "a slow page was sent more");
  latest = [doc([["f", "fit"]]), current('{"r2":0.6}', "k2")];
  a.ws.bufferedAmount = 0; // a drains: it gets the latest state whole
  await new Promise((r) => setTimeout(r, 150));
  deepEqual(JSON.parse(a.texts[3]).result, { r2: 0.6 });
  await new Promise((r) => setTimeout(r, 300)); // b stays behind past stallMs
  equal(b.texts.at(-1), "closed 1013");
  equal(channel.size, 1);
  channel.closeAll();
});

Deno.test("LiveChannel sends the document text only when it changed to a page that asks", () => {
  const channel = new LiveChannel();
  const asks = fakeSocket();
  const old = fakeSocket();
  const d = { ...doc([["f", "fit"]]), source: "x".repeat(1000) };
  channel.open(asks.ws, [d], "http://127.0.0.1:1/live?text=changed");
  channel.open(old.ws, [d], "http://127.0.0.1:1/live");
  channel.broadcast({ ...d, data: [{ path: "a.csv", rows: 5, bytes: 40, changed: "" }] });
  const light = JSON.parse(asks.texts[1]);
  equal(light.source, undefined);
  equal(light.blocks, undefined);
  equal(light.data[0].rows, 5);
  equal(JSON.parse(old.texts[1]).source.length, 1000);
  channel.broadcast({ ...d, version: "v2" }); // the text changed: sent whole
  equal(JSON.parse(asks.texts[2]).source.length, 1000);
});
