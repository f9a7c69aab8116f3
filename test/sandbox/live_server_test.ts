/**
 * Hostile calc cells in a document the live server serves: the calc cannot
 * reach the server's own port, and after a loop, a memory bomb and an exit
 * the server still answers, and still runs the document when it changes.
 */
import { equal, ok } from "node:assert/strict";
import { withServer } from "../server/_live_server.ts";
import type { RunReport } from "../../kernel/session/types.ts";
import {
  assertRefused,
  bufferBomb,
  calc,
  denoExit,
  documentOf,
  type Hostile,
  loop,
  SAYS,
} from "./_calc_doc.ts";

/** A port free a moment ago on 127.0.0.1 (the server binds it next). */
function freePort(): number {
  const l = Deno.listen({ hostname: "127.0.0.1", port: 0 });
  const port = (l.addr as Deno.NetAddr).port;
  l.close();
  return port;
}

Deno.test("the live server keeps serving after hostile calc cells, and its own port is refused to them", async () => {
  const port = freePort();
  const net = SAYS.net;
  const hostile: Hostile[] = [
    {
      name: "own-page",
      code: `return (await fetch('http://127.0.0.1:${port}/')).status;`,
      says: net,
    },
    {
      name: "own-api",
      code: `const r = await fetch('http://localhost:${port}/api/cell/delete', ` +
        `{ method: 'POST', body: '{"name":"fine"}' });\nreturn r.status;`,
      says: net,
    },
    {
      name: "own-socket",
      code: `await Deno.connect({ hostname: '127.0.0.1', port: ${port} });\nreturn 1;`,
      says: net,
    },
    loop("loop"),
    bufferBomb("bomb"),
    denoExit("exit"),
  ];
  const source = documentOf(hostile);
  await withServer({ document: source, options: { port } }, async (ctx) => {
    equal(ctx.server.port, port);
    const report = (): RunReport => {
      const last = ctx.server.workspace.lastRun;
      ok(last !== null, "no run yet");
      return last.report;
    };
    assertRefused(report(), hostile);
    // The server answers its page ...
    const page = await fetch(`${ctx.origin}/`, { headers: { cookie: ctx.cookie } });
    equal(page.status, 200);
    await page.body?.cancel();
    // ... and runs the document again when it changes: a new calc cell computes, and the page
    // answers while a second endless loop runs.
    const more = source + calc("after", "return { ok: 6 * 7 };") +
      calc("loop-again", "for (;;) {}", "time: 2 s");
    await Deno.writeTextFile(ctx.doc, more);
    const rerun = ctx.server.workspace.request([ctx.doc]);
    const during = await fetch(`${ctx.origin}/`, { headers: { cookie: ctx.cookie } });
    equal(during.status, 200);
    await during.body?.cancel();
    await rerun;
    const after = report().cells.find((c) => c.name === "after");
    equal(after?.state, "current", after?.error?.message);
    // Exact arithmetic: 6 · 7 = 42.
    equal((after!.result as { value: { ok: number } }).value.ok, 42);
    const again = loop("loop-again");
    assertRefused(report(), [...hostile, again]);
  });
});
