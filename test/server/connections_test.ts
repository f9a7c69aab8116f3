/**
 * Connections and the live channel under abuse (issue 11, defects 3 and 4),
 * against a live server in its own process (`_serve_child.ts`):
 *
 * - idle and slow-header connections are closed on timeouts, and running out
 *   of file descriptors (a low `ulimit -n`) never ends the server: a normal
 *   request is still answered;
 * - a WebSocket client that never reads does not grow the server's memory
 *   without bound: the server stops queueing for it and closes it.
 *
 * @module
 */
import { equal, ok } from "node:assert/strict";
import { join } from "node:path";
import { deafPage, firstLine } from "../load/_clients.ts";

const HELPER = new URL("./_serve_child.ts", import.meta.url).pathname;
const CONFIG = new URL("../../deno.json", import.meta.url).pathname;

interface Spawned {
  port: number;
  token: string;
  pid: number;
  child: Deno.ChildProcess;
  stderr: () => Promise<string>;
}

/** Starts the helper under `ulimit -n <files>` and waits for its first line. */
async function spawnServer(doc: string, files: number, extra: unknown = {}): Promise<Spawned> {
  const deno = Deno.execPath();
  const cmd = `ulimit -n ${files} && exec "$0" run --config "$1" --allow-read --allow-write ` +
    `--allow-net=127.0.0.1 --allow-env "$2" "$3" "$4"`;
  const child = new Deno.Command("sh", {
    args: ["-c", cmd, deno, CONFIG, HELPER, doc, JSON.stringify(extra)],
    stdout: "piped",
    stderr: "piped",
  }).spawn();
  const first = JSON.parse(await firstLine(child));
  void child.stdout.cancel().catch(() => {});
  const errText = child.stderr.pipeThrough(new TextDecoderStream()).getReader();
  let err = "";
  const pump = (async () => {
    for (;;) {
      const { value, done } = await errText.read();
      if (done) return;
      err += value;
    }
  })();
  return { ...first, child, stderr: () => pump.then(() => err) };
}

async function stop(s: Spawned): Promise<void> {
  try {
    s.child.kill("SIGTERM");
  } catch { /* already gone */ }
  await s.child.status;
}

/** A document and its data in a temporary folder. */
async function folder(prose = ""): Promise<{ dir: string; doc: string; csv: string }> {
  const dir = await Deno.makeTempDir({ prefix: "plumb-conn-" });
  const doc = join(dir, "doc.md");
  const csv = join(dir, "a.csv");
  await Deno.writeTextFile(csv, "x,y\n1,2.1\n2,3.9\n3,6.2\n4,8.1\n");
  await Deno.writeTextFile(
    doc,
    `# Connections\n\n${prose}\`\`\`table t\nfrom: a.csv\n\`\`\`\n\n` +
      "```fit f\non: t\nmodel: y = a + b*x\n```\n",
  );
  return { dir, doc, csv };
}

/**
 * GET / with the token cookie on a fresh connection (no client pool between
 * the test's idle sockets and this request); the status, or why there is none.
 */
async function normalRequest(port: number, token: string): Promise<number | string> {
  let conn: Deno.Conn | null = null;
  const timer = setTimeout(() => conn?.close(), 5000);
  try {
    conn = await Deno.connect({ hostname: "127.0.0.1", port });
    const head = `GET / HTTP/1.1\r\nHost: 127.0.0.1:${port}\r\nCookie: plumb_token=${token}\r\n` +
      "Connection: close\r\n\r\n";
    await conn.write(new TextEncoder().encode(head));
    const buf = new Uint8Array(64);
    const n = await conn.read(buf);
    const line = new TextDecoder().decode(buf.subarray(0, n ?? 0));
    return Number(/^HTTP\/1\.1 (\d{3})/.exec(line)?.[1] ?? NaN) || `no answer: "${line}"`;
  } catch (err) {
    return err instanceof Error ? err.name : String(err);
  } finally {
    clearTimeout(timer);
    try {
      conn?.close();
    } catch { /* closed by the timer */ }
  }
}

async function openIdle(port: number, n: number): Promise<Deno.Conn[]> {
  const conns: Deno.Conn[] = [];
  for (let i = 0; i < n; i++) {
    try {
      conns.push(await Deno.connect({ hostname: "127.0.0.1", port }));
    } catch {
      break; // refused: the backlog is full
    }
  }
  return conns;
}

function closeAll(conns: Deno.Conn[]): void {
  for (const c of conns) {
    try {
      c.close();
    } catch { /* closed by the server */ }
  }
}

Deno.test("serve keeps answering when idle connections exhaust a low file limit", async () => {
  const f = await folder();
  const s = await spawnServer(f.doc, 128, { connections: { headMs: 1500, idleMs: 1500 } });
  let conns: Deno.Conn[] = [];
  try {
    conns = await openIdle(s.port, 300);
    ok(conns.length > 128, `only ${conns.length} connections opened`);
    await new Promise((r) => setTimeout(r, 500));
    equal(await normalRequest(s.port, s.token), 200);
    // The idle ones are closed on the timeout; the server is still there and answers.
    await new Promise((r) => setTimeout(r, 2000));
    equal(await normalRequest(s.port, s.token), 200);
    const gone = await Promise.race([s.child.status, new Promise((r) => setTimeout(r, 10))]);
    if (gone !== undefined) throw new Error(`The server exited: ${await s.stderr()}`);
  } finally {
    closeAll(conns);
    await stop(s);
    await Deno.remove(f.dir, { recursive: true });
  }
});

Deno.test("serve closes a connection whose request head is sent too slowly", async () => {
  const f = await folder();
  const s = await spawnServer(f.doc, 1024, { connections: { headMs: 800 } });
  const conn = await Deno.connect({ hostname: "127.0.0.1", port: s.port });
  try {
    const t0 = performance.now();
    const enc = new TextEncoder();
    await conn.write(enc.encode("GET / HTTP/1.1\r\n"));
    let closed = false;
    for (let i = 0; i < 30 && !closed; i++) {
      await new Promise((r) => setTimeout(r, 100)); // one header line every 100 ms: never done
      try {
        await conn.write(enc.encode(`X-Slow-${i}: y\r\n`));
      } catch {
        closed = true;
      }
    }
    // Closed by the server: a read ends (EOF or reset) well before the 3 s we wait.
    const ended = await Promise.race([
      conn.read(new Uint8Array(512)).then(() => true, () => true),
      new Promise((r) => setTimeout(() => r(false), 3000)),
    ]);
    ok(closed || ended, "the slow request head was not cut off");
    ok(performance.now() - t0 < 6000);
  } finally {
    closeAll([conn]);
    await stop(s);
    await Deno.remove(f.dir, { recursive: true });
  }
});

/** The resident memory of a process in MB, from `ps` (reading /proc needs every permission). */
async function rssMb(pid: number): Promise<number> {
  const out = await new Deno.Command("ps", { args: ["-o", "rss=", "-p", String(pid)] }).output();
  return Number(new TextDecoder().decode(out.stdout).trim()) / 1024;
}

Deno.test("serve bounds what it queues for WebSocket clients that never read", async () => {
  // A 2 MB document: every data change sent its whole text to every socket.
  const para = "Measured at 25 °C on the bench; nothing here is computed. ".repeat(16) + "\n\n";
  const f = await folder(para.repeat(Math.ceil(2_000_000 / para.length)));
  const s = await spawnServer(f.doc, 1024, { connections: { slowBytes: 4 << 20, stallMs: 1500 } });
  const deaf: Deno.Conn[] = [];
  try {
    for (let i = 0; i < 3; i++) deaf.push(await deafPage(s.port, s.token));
    await new Promise((r) => setTimeout(r, 500));
    const before = await rssMb(s.pid);
    for (let i = 0; i < 25; i++) {
      await Deno.writeTextFile(f.csv, `${5 + i},${10 + 2 * i}.1\n`, { append: true });
      await new Promise((r) => setTimeout(r, 120));
    }
    const after = await rssMb(s.pid);
    console.log(`server RSS ${before.toFixed(0)} → ${after.toFixed(0)} MB`);
    ok(after - before < 150, `server RSS grew ${(after - before).toFixed(0)} MB`);
    equal(await normalRequest(s.port, s.token), 200);
  } finally {
    closeAll(deaf);
    await stop(s);
    await Deno.remove(f.dir, { recursive: true });
  }
});

Deno.test("serve answers a second request on a kept-alive connection at once", async () => {
  const f = await folder();
  const s = await spawnServer(f.doc, 1024);
  const conn = await Deno.connect({ hostname: "127.0.0.1", port: s.port });
  // Before: the head search restarted at a stale offset, so the second request
  // waited for the 5 s idle timeout and was answered on a new connection.
  const timer = setTimeout(() => conn.close(), 3000);
  try {
    const head =
      `GET / HTTP/1.1\r\nHost: 127.0.0.1:${s.port}\r\nCookie: plumb_token=${s.token}\r\n\r\n`;
    let got = "";
    for (let i = 1; i <= 2; i++) {
      await conn.write(new TextEncoder().encode(head));
      const buf = new Uint8Array(1 << 16);
      while ((got.match(/HTTP\/1\.1 200/g) ?? []).length < i) {
        const n = await conn.read(buf);
        if (n === null) break;
        got += new TextDecoder().decode(buf.subarray(0, n));
      }
    }
    equal((got.match(/HTTP\/1\.1 200/g) ?? []).length, 2);
  } finally {
    clearTimeout(timer);
    closeAll([conn]);
    await stop(s);
    await Deno.remove(f.dir, { recursive: true });
  }
});
