/**
 * Crash safety of the save path (issue 11): the server process is killed
 * with SIGKILL at seeded random moments while 200 saves go through the HTTP
 * API. After every kill the document parses and is either the last version
 * the server acknowledged or the one in flight; whatever else is in the
 * folder carries our temporary-name pattern (never a name that could pass
 * for the document), and the next start removes it.
 *
 * @module
 */
import { equal, ok } from "node:assert/strict";
import { join } from "node:path";
import { parseDocument } from "../../kernel/document/mod.ts";
import { isOwnTemp } from "../../kernel/server/atomic_write.ts";
import { saveCell } from "../../kernel/server/edits.ts";
import { namesIn, versionOf } from "./_live_server.ts";

const F = "```";
const DOC = `# Crash\n\nProse that must survive.\n\n${F}table t\nfrom: a.csv\n${F}\n\nThe end.\n`;
const SERVER = new URL("./_crash_server.ts", import.meta.url).pathname;
const SAVES = 200;

/** mulberry32 (common practice, no source): the kill moments are seeded. */
function seeded(seed: number): () => number {
  return () => {
    seed = (seed + 0x6d2b79f5) >>> 0;
    let t = Math.imul(seed ^ (seed >>> 15), seed | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

interface Running {
  child: Deno.ChildProcess;
  port: number;
  token: string;
}

async function start(doc: string): Promise<Running> {
  const child = new Deno.Command(Deno.execPath(), {
    args: [
      "run",
      "--no-check",
      "--allow-read",
      "--allow-write",
      "--allow-net=127.0.0.1",
      "--allow-env",
      SERVER,
      doc,
    ],
    stdout: "piped",
    stderr: "null",
  }).spawn();
  const reader = child.stdout.pipeThrough(new TextDecoderStream()).getReader();
  let text = "";
  while (!text.includes("\n")) {
    const { done, value } = await reader.read();
    if (done) throw new Error(`The server exited before listening: ${text}`);
    text += value;
  }
  void reader.closed.catch(() => {});
  void (async () => {
    while (!(await reader.read().catch(() => ({ done: true }))).done);
  })();
  return { child, ...JSON.parse(text.split("\n")[0]) };
}

/** Saves one after another until the process dies or `left` runs out; returns what it saw. */
async function saveUntilKilled(run: Running, state: { acked: string; sent: number }) {
  let inFlight: string | null = null;
  try {
    while (state.sent < SAVES) {
      const next = saveCell(state.acked, "t", `from: a.csv\n# save ${state.sent}\n`).source;
      inFlight = next;
      state.sent++;
      const res = await fetch(`http://127.0.0.1:${run.port}/api/cell`, {
        method: "POST",
        headers: { cookie: `plumb_token=${run.token}`, "x-plumb-token": run.token },
        body: JSON.stringify({
          name: "t",
          body: `from: a.csv\n# save ${state.sent - 1}\n`,
          base: await versionOf(state.acked),
        }),
      });
      const json = await res.json();
      equal(res.status, 200, JSON.stringify(json));
      state.acked = next;
      inFlight = null;
    }
  } catch (err) {
    if (!(err instanceof TypeError)) throw err; // the connection died with the process
  }
  return inFlight;
}

Deno.test("plumb serve killed by SIGKILL at seeded moments during 200 saves keeps the acknowledged or in-flight version", async () => {
  const dir = await Deno.makeTempDir({ prefix: "plumb-crash-" });
  const doc = join(dir, "doc.md");
  await Deno.writeTextFile(doc, DOC);
  await Deno.writeTextFile(join(dir, "a.csv"), "x,y\n1,2\n2,4\n");
  const random = seeded(11);
  const state = { acked: DOC, sent: 0 };
  let kills = 0, inFlightKept = 0, tempsLeft = 0;
  try {
    while (state.sent < SAVES) {
      const run = await start(doc);
      equal((await namesIn(dir)).join(), "a.csv,doc.md", "the start left temporary files");
      const timer = setTimeout(() => run.child.kill("SIGKILL"), 2 + random() * 120);
      const inFlight = await saveUntilKilled(run, state);
      clearTimeout(timer);
      try {
        run.child.kill("SIGKILL");
      } catch { /* already killed */ }
      await run.child.status;
      kills++;
      const now = await Deno.readTextFile(doc);
      ok(now === state.acked || now === inFlight, `after kill ${kills}: neither version\n${now}`);
      if (now !== state.acked) inFlightKept++;
      ok(parseDocument(now).blocks.some((b) => b.type === "cell" && b.name === "t"));
      const others = (await namesIn(dir)).filter((n) => n !== "a.csv" && n !== "doc.md");
      ok(others.every((n) => isOwnTemp("doc.md", n)), others.join(", "));
      tempsLeft += others.length;
      state.acked = now;
    }
    const last = await start(doc);
    equal((await namesIn(dir)).join(), "a.csv,doc.md");
    last.child.kill("SIGKILL");
    await last.child.status;
    ok(kills >= 10, `${kills} kills`);
    console.log(
      `${kills} kills in ${SAVES} saves; ${inFlightKept} kept the in-flight version; ` +
        `${tempsLeft} temporary files left by kills, all removed by the next start`,
    );
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});
