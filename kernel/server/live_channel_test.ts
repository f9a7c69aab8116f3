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
