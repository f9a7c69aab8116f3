/**
 * `deno task load`: the live server under a standing load, loopback only,
 * bounded in time and count. A server in its own process
 * (test/server/_serve_child.ts) serves a small document while:
 *
 * - 50 pages read /live (`?text=changed`), 3 pages never read;
 * - 500 idle connections are kept open (one the server closes is opened again);
 * - 20 edits a second for 60 s, alternating a cell save (POST /api/cell, the
 *   body's `# edit N`) and a row appended to the data file;
 * - GET / is timed every 500 ms on a fresh connection.
 *
 * Reported (printed and in load-report.json): p50/p95 broadcast latency (an
 * edit made → a page sees it in a document message), lost edits (an edit a
 * page never saw by the end), server RSS growth, the slowest normal request
 * and failed ones, idle connections closed by the server. Targets: no crash,
 * no lost edit, RSS growth under 100 MB, every normal request under 1 s.
 * `--seconds N` shortens the run.
 *
 * @module
 */
import { join } from "node:path";
import { SERVE_V8_FLAGS } from "../../kernel/cli/serve.ts";
import { deafPage, firstLine, IdlePool, openPage, type Page, probe } from "./_clients.ts";

const seconds = Number(Deno.args[Deno.args.indexOf("--seconds") + 1]) || 60;
const PAGES = 50, DEAF = 3, IDLE = 500, EDITS_PER_S = 20;
const HELPER = new URL("../server/_serve_child.ts", import.meta.url).pathname;
const CONFIG = new URL("../../deno.json", import.meta.url).pathname;

const cellBody = (n: number) => `on: t\nmodel: y = a + b*x\n# edit ${n}\n`;

async function rssMb(pid: number): Promise<number> {
  const out = await new Deno.Command("ps", { args: ["-o", "rss=", "-p", String(pid)] }).output();
  return Number(new TextDecoder().decode(out.stdout).trim()) / 1024;
}

async function start(dir: string) {
  const doc = join(dir, "doc.md");
  const rows = Array.from({ length: 20 }, (_, i) => `${i + 1},${(2 * i + 1.1).toFixed(1)}`);
  await Deno.writeTextFile(join(dir, "a.csv"), `x,y\n${rows.join("\n")}\n`);
  await Deno.writeTextFile(
    doc,
    "# Load\n\nInvented data for the load suite.\n\n```table t\nfrom: a.csv\n```\n\n" +
      "```fit f\n" + cellBody(0) + "```\n",
  );
  const child = new Deno.Command(Deno.execPath(), {
    args: [
      "run",
      SERVE_V8_FLAGS, // as `plumb serve` starts its server
      "--config",
      CONFIG,
      "--allow-read",
      "--allow-write",
      "--allow-net=127.0.0.1",
      "--allow-env=LOG_TOKENS,LOG_STREAM",
      HELPER,
      doc,
    ],
    stdout: "piped",
    stderr: "inherit",
  }).spawn();
  const info = JSON.parse(await firstLine(child)) as { port: number; token: string; pid: number };
  return { ...info, child, doc, csv: join(dir, "a.csv") };
}

/** One edit: a save on even numbers, a data row on odd ones; the key pages will see. */
async function edit(
  s: Awaited<ReturnType<typeof start>>,
  n: number,
  state: { version: string; rows: number },
) {
  if (n % 2 === 1) {
    await Deno.writeTextFile(s.csv, `${state.rows + 1},${(state.rows * 2.1).toFixed(1)}\n`, {
      append: true,
    });
    state.rows++;
    return `r${state.rows}`;
  }
  const res = await fetch(`http://127.0.0.1:${s.port}/api/cell`, {
    method: "POST",
    headers: {
      cookie: `plumb_token=${s.token}`,
      "x-plumb-token": s.token,
      "content-type": "application/json",
    },
    body: JSON.stringify({ name: "f", body: cellBody(n), base: state.version }),
  });
  const answer = await res.json();
  if (res.status !== 200) {
    throw new Error(`Save ${n} answered ${res.status}: ${JSON.stringify(answer)}`);
  }
  state.version = answer.version;
  return `e${n}`;
}

function quantile(xs: number[], q: number): number {
  if (xs.length === 0) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(q * s.length))];
}

async function main() {
  const dir = await Deno.makeTempDir({ prefix: "plumb-load-" });
  const s = await start(dir);
  const pages: Page[] = [];
  for (let i = 0; i < PAGES; i++) pages.push(await openPage(s.port, s.token));
  const deaf = [];
  for (let i = 0; i < DEAF; i++) deaf.push(await deafPage(s.port, s.token));
  const idle = new IdlePool(s.port, IDLE);
  await idle.topUp(IDLE);
  const first = await (await fetch(`http://127.0.0.1:${s.port}/`, {
    headers: { cookie: `plumb_token=${s.token}` },
  })).text();
  void first;
  const { version } = await (await fetch(`http://127.0.0.1:${s.port}/api/cell`, {
    method: "POST",
    headers: {
      cookie: `plumb_token=${s.token}`,
      "x-plumb-token": s.token,
      "content-type": "application/json",
    },
    body: JSON.stringify({ name: "f", body: cellBody(0), base: "" }),
  }).then((r) => r.json().then((j) => ({ version: j.diskVersion ?? j.version }))));
  const state = { version, rows: 20 };
  const rss0 = await rssMb(s.pid);
  const made = new Map<string, number>();
  const probes: (number | null)[] = [];
  let rssMax = rss0;
  const t0 = performance.now();
  const background = setInterval(() => {
    void probe(s.port, s.token).then((ms) => probes.push(ms));
    void idle.topUp(50);
    void rssMb(s.pid).then((r) => rssMax = Math.max(rssMax, r)).catch(() => {});
  }, 500);
  for (let n = 1; performance.now() - t0 < seconds * 1000; n++) {
    const due = t0 + (n * 1000) / EDITS_PER_S;
    await new Promise((r) => setTimeout(r, Math.max(0, due - performance.now())));
    const at = performance.now();
    made.set(await edit(s, n, state), at);
  }
  await new Promise((r) => setTimeout(r, 3000)); // the last runs settle
  clearInterval(background);
  const rss1 = await rssMb(s.pid);
  const alive =
    (await Promise.race([s.child.status, new Promise((r) => setTimeout(r, 10))])) === undefined;
  const report = summarise({ made, pages, probes, rss0, rss1, rssMax, idle, alive, seconds });
  idle.stop();
  for (const p of pages) p.ws.close();
  for (const c of deaf) c.close();
  s.child.kill("SIGTERM");
  await s.child.status;
  await Deno.remove(dir, { recursive: true });
  await Deno.writeTextFile("load-report.json", JSON.stringify(report, null, 2) + "\n");
  console.log(
    `Load (${seconds} s): ${report.edits} edits, ${report.pages} pages, ${DEAF} not reading, ${IDLE} idle`,
  );
  console.log(
    `  broadcast latency p50 ${report.latency_ms.p50.toFixed(0)} ms, p95 ${
      report.latency_ms.p95.toFixed(0)
    } ms`,
  );
  console.log(
    `  lost edits ${report.lost_edits}; pages closed ${report.pages_closed}; server alive ${report.server_alive}`,
  );
  console.log(
    `  server RSS ${rss0.toFixed(0)} → ${rss1.toFixed(0)} MB (peak ${rssMax.toFixed(0)}), growth ${
      report.rss_growth_mb.toFixed(0)
    } MB`,
  );
  console.log(
    `  normal request slowest ${
      report.normal_request.slowest_ms.toFixed(0)
    } ms, failed ${report.normal_request.failed} of ${probes.length}`,
  );
  console.log(`  idle connections closed by the server ${idle.closedByServer}`);
  const met = report.server_alive && report.lost_edits === 0 && report.rss_growth_mb < 100 &&
    report.normal_request.failed === 0 && report.normal_request.slowest_ms < 1000;
  console.log(met ? "  targets met" : "  TARGETS MISSED");
}

function summarise(r: {
  made: Map<string, number>;
  pages: Page[];
  probes: (number | null)[];
  rss0: number;
  rss1: number;
  rssMax: number;
  idle: IdlePool;
  alive: boolean;
  seconds: number;
}) {
  const latencies: number[] = [];
  let lost = 0;
  for (const p of r.pages) {
    for (const [key, at] of r.made) {
      const seen = p.seen.get(key);
      if (seen === undefined) lost++;
      else latencies.push(seen - at);
    }
  }
  const ok = r.probes.filter((x): x is number => x !== null);
  return {
    seconds: r.seconds,
    edits: r.made.size,
    pages: r.pages.length,
    pages_closed: r.pages.filter((p) => p.closed).length,
    latency_ms: {
      p50: quantile(latencies, 0.5),
      p95: quantile(latencies, 0.95),
      max: quantile(latencies, 1),
    },
    lost_edits: lost,
    rss_mb: { start: r.rss0, end: r.rss1, peak: r.rssMax },
    rss_growth_mb: r.rssMax - r.rss0,
    normal_request: {
      count: r.probes.length,
      failed: r.probes.length - ok.length,
      slowest_ms: Math.max(0, ...ok),
    },
    idle_closed_by_server: r.idle.closedByServer,
    server_alive: r.alive,
  };
}

await main();
