import { deepEqual, ok } from "node:assert/strict";
import { join } from "node:path";
import { fakeRegistry } from "../session/testdata/fake_kinds.ts";
import { LiveWorkspace } from "./live_workspace.ts";
import type { ServerMessage } from "./protocol.ts";

const WORKER = new URL("../session/testdata/fake_worker.ts", import.meta.url);
const fence = (info: string, body: string) => "```" + info + "\n" + body + "\n```\n";

/** The cell states sent for a run of `doc`, after a warm-up run (workers started) of another document. */
async function statesSent(doc: string, busyGraceMs?: number): Promise<string[]> {
  const dir = await Deno.makeTempDir({ prefix: "plumb-live-" });
  const path = join(dir, "doc.md");
  await Deno.writeTextFile(path, fence("num warm", "value: 0"));
  const sent: ServerMessage[] = [];
  const ws = new LiveWorkspace({
    path,
    registry: fakeRegistry,
    workerUrl: WORKER,
    send: (m) => sent.push(m),
    busyGraceMs,
  });
  try {
    await ws.request();
    sent.length = 0;
    await Deno.writeTextFile(path, doc);
    await ws.request([path]);
  } finally {
    ws.close();
    await Deno.remove(dir, { recursive: true });
  }
  return sent.flatMap((m) => m.type === "cell" ? [`${m.name}:${m.state}`] : []);
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
