import { deepEqual, equal, ok } from "node:assert/strict";
import { join } from "node:path";
import { fakeRegistry } from "../session/testdata/fake_kinds.ts";
import type { Outgoing } from "./live_channel.ts";
import { LiveWorkspace } from "./live_workspace.ts";

const WORKER = new URL("../session/testdata/fake_worker.ts", import.meta.url);
const fence = (info: string, body: string) => "```" + info + "\n" + body + "\n```\n";

/** Runs `fn` on a workspace of a document holding `first`, with the messages it sends. */
async function withWorkspace(
  first: string,
  fn: (ws: LiveWorkspace, path: string, sent: Outgoing[]) => Promise<void>,
  busyGraceMs?: number,
): Promise<void> {
  const dir = await Deno.makeTempDir({ prefix: "plumb-live-" });
  const path = join(dir, "doc.md");
  await Deno.writeTextFile(path, first);
  const sent: Outgoing[] = [];
  const ws = new LiveWorkspace({
    path,
    registry: fakeRegistry,
    workerUrl: WORKER,
    send: (m) => sent.push(m),
    busyGraceMs,
  });
  try {
    await fn(ws, path, sent);
  } finally {
    ws.close();
    await Deno.remove(dir, { recursive: true });
  }
}

/** The cell states sent for a run of `doc`, after a warm-up run (workers started) of another document. */
async function statesSent(doc: string, busyGraceMs?: number): Promise<string[]> {
  let states: string[] = [];
  await withWorkspace(fence("num warm", "value: 0"), async (ws, path, sent) => {
    await ws.request();
    sent.length = 0;
    await Deno.writeTextFile(path, doc);
    await ws.request([path]);
    states = sent.flatMap((m) => m.type === "cell" ? [`${m.name}:${m.state}`] : []);
  }, busyGraceMs);
  return states;
}

Deno.test("LiveWorkspace sends no busy states for cells that settle within the grace period", async () => {
  const doc = fence("num a", "value: 1") + fence("sum b", "of: [a]");
  deepEqual(await statesSent(doc), ["a:current", "b:current"]);
  // With no grace, every state goes out as it happens.
  deepEqual(await statesSent(doc, 0), [
    "a:queued",
    "b:queued",
    "a:computing",
    "a:current",
    "b:computing",
    "b:current",
  ]);
});

Deno.test("LiveWorkspace sends the busy states of long work once the grace period is over", async () => {
  const states = await statesSent(fence("num a", "value: 1") + fence("spin s", "ms: 400"), 100);
  // a settles within the grace; s is still computing when it ends, so its state is sent then.
  deepEqual(states.filter((s) => s.startsWith("a:")), ["a:current"]);
  const s = states.filter((x) => x.startsWith("s:"));
  ok(s.length === 2 && s[0] === "s:computing" && s[1] === "s:current", s.join());
});

Deno.test("LiveWorkspace.resultOf() parses a cell's page result from the worker's text; a held cell's message says why once", async () => {
  const doc = fence("num a", "value: 4") + fence("peek p", "path: /etc/hostname") +
    fence("sum s", "of: [a, p]");
  await withWorkspace(doc, async (ws, _path, sent) => {
    await ws.request();
    deepEqual(ws.resultOf("a"), { value: 4 });
    equal(ws.resultOf("s"), null);
    const held = sent.flatMap((m) => m.type === "cell" && m.name === "s" ? [m] : []).at(-1)!;
    equal(held.state, "held");
    equal(held.error?.message, 'input "p" is failed');
  });
});

Deno.test("LiveWorkspace stops a long cell whose inputs changed as it supersedes the run", async () => {
  // `tick` reports progress about every millisecond for 3 s and gives the number of its runs
  // that ran to their end in the worker (kernel/session/testdata/fake_kinds.ts).
  await withWorkspace(fence("tick t", "ms: 3000\ntag: 1"), async (ws, path) => {
    const first = ws.request();
    await new Promise((r) => setTimeout(r, 700)); // the worker has started and t is computing
    await Deno.writeTextFile(path, fence("tick t", "ms: 3000\ntag: 2"));
    await ws.request([path]);
    await first;
    // Only the second run of t ran to its end: the first was stopped, not finished.
    deepEqual(ws.resultOf("t"), { value: 1 });
  });
});
