import { deepEqual, equal, match, notEqual, ok } from "node:assert/strict";
import { join } from "node:path";
import { TEMP_PREFIX } from "../../kernel/server/atomic_write.ts";
import type { CellMessage, RunMessage, ServerMessage } from "../../kernel/server/protocol.ts";
import { type Ctx, post, versionOf, withServer as withFolder } from "./_live_server.ts";
const F = "```";

// Two independent chains:  a.csv ─ ta ─ fa     b.csv ─ tb ─ fb
const DOC = `---
title: Two chains
---

# Two chains

Prose before the cells.

${F}table ta
from: a.csv
${F}

${F}fit fa
on: ta
model: y = a + b*x
${F}

Between the chains.

${F}table tb
from: b.csv
${F}

${F}fit fb
on: tb
model: y = a + b*x
${F}

The end.
`;

// Invented rows (common practice, no source: any non-collinear points fit a line).
const CSV = "x,y\n1,2.1\n2,3.9\n3,6.2\n4,7.8\n5,10.1\n";

const withServer = (fn: (ctx: Ctx) => Promise<void>) =>
  withFolder({ document: DOC, files: { "a.csv": CSV, "b.csv": CSV } }, fn);

/** Sends a raw HTTP/1.1 request (to set Host and Origin freely) and returns the status code. */
async function rawStatus(port: number, head: string[]): Promise<number> {
  const conn = await Deno.connect({ hostname: "127.0.0.1", port });
  try {
    await conn.write(new TextEncoder().encode([...head, "Connection: close", "", ""].join("\r\n")));
    const buf = new Uint8Array(256);
    const n = await conn.read(buf);
    const line = new TextDecoder().decode(buf.subarray(0, n ?? 0)).split("\r\n")[0];
    return Number(line.split(" ")[1]);
  } finally {
    conn.close();
  }
}

const WS_UPGRADE = [
  "Upgrade: websocket",
  "Connection: Upgrade",
  "Sec-WebSocket-Key: dGhlIHNhbXBsZSBub25jZQ==",
  "Sec-WebSocket-Version: 13",
];

/** A live-channel client collecting every message. */
async function openLive(ctx: Ctx) {
  const messages: ServerMessage[] = [];
  // Deno's WebSocket takes headers (a browser sends Origin and the cookie itself).
  const ws = new WebSocket(`ws://127.0.0.1:${ctx.server.port}/live`, {
    headers: { origin: ctx.origin, cookie: ctx.cookie },
  } as unknown as string[]);
  const closed = new Promise<void>((r) => ws.onclose = () => r());
  // A frame holds one message or an array of them (a run's burst).
  ws.onmessage = (e) => messages.push(...[JSON.parse(e.data)].flat());
  await new Promise<void>((r, j) => {
    ws.onopen = () => r();
    ws.onerror = () => j(new Error("WebSocket failed"));
  });
  return {
    messages,
    async close() {
      ws.close();
      await closed;
    },
  };
}

/** Polls until `pred` holds, for at most `ms` milliseconds. */
async function waitFor<T>(get: () => T | undefined, ms = 8000): Promise<T> {
  for (let t = 0; t < ms; t += 20) {
    const v = get();
    if (v !== undefined) return v;
    await new Promise((r) => setTimeout(r, 20));
  }
  throw new Error(`Timed out after ${ms} ms`);
}

Deno.test("startServer() exchanges the URL's token for an HttpOnly SameSite=Strict cookie", async () => {
  await withServer(async (ctx) => {
    const res = await fetch(ctx.server.url, { redirect: "manual" });
    await res.body?.cancel();
    equal(res.status, 303);
    equal(res.headers.get("location"), "/");
    const cookie = res.headers.get("set-cookie") ?? "";
    match(cookie, new RegExp(`^plumb_token=${ctx.server.token};`));
    match(cookie, /HttpOnly/);
    match(cookie, /SameSite=Strict/);
    const page = await fetch(`${ctx.origin}/`, { headers: { cookie: ctx.cookie } });
    equal(page.status, 200);
    match(await page.text(), new RegExp(`content="${ctx.server.token}"`));
    match(ctx.server.url, /^http:\/\/127\.0\.0\.1:\d+\/enter\/[0-9a-f]{32}$/);
  });
});

Deno.test("startServer() answers 401 without the token, with a wrong one and with a wrong cookie", async () => {
  await withServer(async (ctx) => {
    for (
      const [url, headers] of [
        [`${ctx.origin}/`, {}],
        [`${ctx.origin}/enter/${"0".repeat(32)}`, {}],
        [`${ctx.origin}/`, { cookie: `plumb_token=${"0".repeat(32)}` }],
      ] as const
    ) {
      const res = await fetch(url, { headers, redirect: "manual" });
      await res.body?.cancel();
      equal(res.status, 401, url);
    }
    const api = await fetch(`${ctx.origin}/api/cell`, { method: "POST", body: "{}" });
    equal(api.status, 401);
    match((await api.json()).error, /token/);
  });
});

Deno.test("startServer() refuses a foreign Host header with 421, even with the cookie", async () => {
  await withServer(async (ctx) => {
    const status = await rawStatus(ctx.server.port, [
      "GET / HTTP/1.1",
      `Host: rebound.example:${ctx.server.port}`,
      `Cookie: ${ctx.cookie}`,
    ]);
    equal(status, 421);
    const own = await rawStatus(ctx.server.port, [
      "GET / HTTP/1.1",
      `Host: localhost:${ctx.server.port}`,
      `Cookie: ${ctx.cookie}`,
    ]);
    equal(own, 200);
  });
});

Deno.test("startServer() refuses a WebSocket upgrade from a foreign Origin with 403", async () => {
  await withServer(async (ctx) => {
    const head = (origin: string) => [
      "GET /live HTTP/1.1",
      `Host: 127.0.0.1:${ctx.server.port}`,
      `Cookie: ${ctx.cookie}`,
      `Origin: ${origin}`,
      ...WS_UPGRADE,
    ];
    equal(await rawStatus(ctx.server.port, head("http://evil.example")), 403);
    equal(await rawStatus(ctx.server.port, head(`http://127.0.0.1:${ctx.server.port + 1}`)), 403);
    const noCookie = head(ctx.origin).filter((l) => !l.startsWith("Cookie"));
    equal(await rawStatus(ctx.server.port, noCookie), 401);
    equal(await rawStatus(ctx.server.port, head(ctx.origin)), 101);
  });
});

Deno.test("startServer() refuses a POST without the X-Plumb-Token header or with a foreign Origin", async () => {
  await withServer(async (ctx) => {
    const before = await Deno.readTextFile(ctx.doc);
    const body = { name: "fa", body: "on: ta\nmodel: y = b*x\n", base: await versionOf(before) };
    const bare = await fetch(`${ctx.origin}/api/cell`, {
      method: "POST",
      headers: { cookie: ctx.cookie, "content-type": "application/json" },
      body: JSON.stringify(body),
    });
    equal(bare.status, 403);
    match((await bare.json()).error, /X-Plumb-Token/);
    const foreign = await post(ctx, "/api/cell", body, { origin: "http://evil.example" });
    equal(foreign.status, 403);
    await foreign.body?.cancel();
    equal(await Deno.readTextFile(ctx.doc), before);
    const sameOrigin = await fetch(`${ctx.origin}/api/cell`, {
      method: "POST",
      headers: { cookie: ctx.cookie, origin: ctx.origin },
      body: JSON.stringify(body),
    });
    equal(sameOrigin.status, 200);
    await sameOrigin.body?.cancel();
  });
});

Deno.test("POST /api/cell changes the file on disk in that cell only and reruns it and its dependents", async () => {
  await withServer(async (ctx) => {
    const live = await openLive(ctx);
    try {
      const before = await Deno.readTextFile(ctx.doc);
      const res = await post(ctx, "/api/cell", {
        name: "fa",
        body: "on: ta\nmodel: y = b*x\n",
        base: await versionOf(before),
      });
      equal(res.status, 200);
      const { version } = await res.json();
      const after = await Deno.readTextFile(ctx.doc);
      equal(version, await versionOf(after));
      const old = "on: ta\nmodel: y = a + b*x\n";
      const at = before.indexOf(old);
      const a = new TextEncoder().encode(before), b = new TextEncoder().encode(after);
      const pre = new TextEncoder().encode(before.slice(0, at)).length;
      const suf = new TextEncoder().encode(before.slice(at + old.length)).length;
      deepEqual(b.subarray(0, pre), a.subarray(0, pre));
      deepEqual(b.subarray(b.length - suf), a.subarray(a.length - suf));
      equal(after.slice(at, after.length - suf), "on: ta\nmodel: y = b*x\n");
      const run = await waitFor(() =>
        live.messages.find((m): m is RunMessage => m.type === "run" && m.version === version)
      );
      deepEqual(run.ran, ["fa"]);
      const names = (await Array.fromAsync(Deno.readDir(ctx.dir))).map((e) => e.name);
      ok(!names.some((n) => n.startsWith(TEMP_PREFIX)), names.join(", "));
    } finally {
      await live.close();
    }
  });
});

Deno.test("POST /api/cell with a stale base answers 409 with both versions and keeps the disk edit", async () => {
  await withServer(async (ctx) => {
    const loaded = await Deno.readTextFile(ctx.doc);
    const base = await versionOf(loaded);
    const edited = loaded.replace("The end.", "The end, edited in another editor.");
    await Deno.writeTextFile(ctx.doc, edited);
    const mine = "on: ta\nmodel: y = b*x\n";
    const res = await post(ctx, "/api/cell", { name: "fa", body: mine, base });
    equal(res.status, 409);
    const c = await res.json();
    equal(c.conflict, true);
    equal(c.disk, edited);
    equal(c.diskVersion, await versionOf(edited));
    ok(!("yours" in c), "the request body came back");
    equal(await Deno.readTextFile(ctx.doc), edited);
  });
});

Deno.test("POST /api/cell/new, /delete and /restore add, remove and put back a cell exactly", async () => {
  await withServer(async (ctx) => {
    const original = await Deno.readTextFile(ctx.doc);
    let res = await post(ctx, "/api/cell/new", {
      after: "fa",
      kind: "fit",
      name: "fa2",
      base: await versionOf(original),
    });
    equal(res.status, 200);
    let { version } = await res.json();
    const added = await Deno.readTextFile(ctx.doc);
    match(added, /```fit fa2\non: tb\nmodel: y = a \+ b\*x\n```/);
    res = await post(ctx, "/api/cell/delete", { name: "fa2", base: version });
    equal(res.status, 200);
    const del = await res.json();
    equal(await Deno.readTextFile(ctx.doc), original);
    res = await post(ctx, "/api/cell/restore", {
      text: del.removed,
      at: del.at,
      base: del.version,
    });
    equal(res.status, 200);
    ({ version } = await res.json());
    equal(await Deno.readTextFile(ctx.doc), added);
    res = await post(ctx, "/api/cell/new", { after: null, kind: "fitt", name: "z", base: version });
    equal(res.status, 400);
    match((await res.json()).error, /^Unknown cell kind "fitt": did you mean "fit"\?$/);
    res = await post(ctx, "/api/cell/delete", { name: "nope", base: version });
    equal(res.status, 404);
    await res.body?.cancel();
  });
});

Deno.test("startServer() reruns only the affected chain when rows are appended to a CSV", async () => {
  await withServer(async (ctx) => {
    const live = await openLive(ctx);
    try {
      const runsBefore = new Map(ctx.server.workspace.runs);
      const file = await Deno.open(join(ctx.dir, "a.csv"), { append: true });
      await file.write(new TextEncoder().encode("6,12.2\n7,13.8\n"));
      file.close();
      const run = await waitFor(() =>
        live.messages.find((m): m is RunMessage => m.type === "run" && m.ran.length > 0)
      );
      deepEqual(run.ran, ["ta", "fa"]);
      const counted = ["ta", "fa", "tb", "fb"].map((n) =>
        (ctx.server.workspace.runs.get(n) ?? 0) - (runsBefore.get(n) ?? 0)
      );
      deepEqual(counted, [1, 1, 0, 0]);
      const doc = live.messages.findLast((m) => m.type === "document");
      equal(doc?.type === "document" && doc.data.find((d) => d.path === "a.csv")?.rows, 7);
      const fb = live.messages.findLast((m): m is CellMessage =>
        m.type === "cell" && m.name === "fb" && m.run === run.run
      );
      equal(fb?.state, "current");
      equal(fb?.cached, true);
    } finally {
      await live.close();
    }
  });
});

Deno.test("startServer() picks up a document edit on disk made by an atomic replace", async () => {
  await withServer(async (ctx) => {
    const live = await openLive(ctx);
    try {
      const first = await waitFor(() => live.messages.find((m) => m.type === "document"));
      const text = (await Deno.readTextFile(ctx.doc)).replace(
        "model: y = a + b*x\n",
        "model: y = b*x\n",
      );
      const temp = join(ctx.dir, "doc.md.editor-swap");
      await Deno.writeTextFile(temp, text);
      await Deno.rename(temp, ctx.doc);
      const version = await versionOf(text);
      notEqual(first.version, version);
      const run = await waitFor(() =>
        live.messages.find((m): m is RunMessage => m.type === "run" && m.version === version)
      );
      deepEqual(run.ran, ["fa"]);
      const doc = live.messages.find((m) => m.type === "document" && m.version === version);
      equal(doc?.type === "document" && doc.source, text);
      // An unchanged rewrite of the same bytes recomputes nothing and sends no run.
      const count = live.messages.filter((m) => m.type === "run").length;
      await Deno.writeTextFile(ctx.doc, text);
      await new Promise((r) => setTimeout(r, 300));
      await ctx.server.workspace.idle();
      equal(live.messages.filter((m) => m.type === "run").length, count);
    } finally {
      await live.close();
    }
  });
});

Deno.test("GET /record: the static record of the latest run, as a download", async () => {
  const dir = await Deno.makeTempDir({ prefix: "plumb-record-route-" });
  const doc = `${dir}/doc.md`;
  await Deno.writeTextFile(
    doc,
    "---\ntitle: Route\n---\n\n```table t\ncolumns: [x, y]\nrows:\n  - [1, 2]\n  - [2, 4.1]\n  - [3, 5.9]\n```\n",
  );
  const { startServer } = await import("../../kernel/server/server.ts");
  const { registry } = await import("../../cells/mod.ts");
  const server = await startServer({
    document: doc,
    registry,
    workerUrl: new URL("../../cells/worker.ts", import.meta.url),
    recordUrl: new URL("../../ui/record/mod.ts", import.meta.url),
  });
  try {
    const origin = `http://127.0.0.1:${server.port}`;
    const cookie = `plumb_token=${server.token}`;
    let res: Response | null = null;
    for (let i = 0; i < 100; i++) {
      res = await fetch(`${origin}/record`, { headers: { cookie } });
      if (res.status !== 503) break;
      await res.body?.cancel();
      await new Promise((r) => setTimeout(r, 50));
    }
    equal(res!.status, 200);
    match(
      res!.headers.get("content-disposition") ?? "",
      /attachment; filename="doc\.record\.html"/,
    );
    const html = await res!.text();
    match(html, /<title>Route — record<\/title>/);
    ok(!/<script/i.test(html));
    const refused = await fetch(`${origin}/record`);
    equal(refused.status, 401);
    await refused.body?.cancel();
  } finally {
    await server.close();
    await Deno.remove(dir, { recursive: true });
  }
});
