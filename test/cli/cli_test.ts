/**
 * `plumb run` as scripts use it: a subprocess with the task's permissions,
 * RUN-JSON on stdout, exit status 0, 1 or 2 (../shared/RUN-JSON.md).
 */
import { deepEqual, equal, match, ok } from "node:assert/strict";
import { join } from "node:path";

const MAIN = new URL("../../cells/main.ts", import.meta.url).pathname;
const DEMO = new URL("../../examples/fade/fade.md", import.meta.url).pathname;

async function plumb(...args: string[]) {
  const out = await new Deno.Command(Deno.execPath(), {
    args: [
      "run",
      "--allow-read",
      "--allow-env=LOG_TOKENS,LOG_STREAM",
      `--allow-run=${Deno.execPath()}`,
      MAIN,
      ...args,
    ],
    stdout: "piped",
    stderr: "piped",
    env: { NO_COLOR: "1" },
  }).output();
  const dec = new TextDecoder();
  return { code: out.code, stdout: dec.decode(out.stdout), stderr: dec.decode(out.stderr) };
}

Deno.test("plumb run --json prints RUN-JSON for the demo and exits 0", async () => {
  const r = await plumb("run", DEMO, "--json");
  equal(r.code, 0, r.stderr + r.stdout);
  const json = JSON.parse(r.stdout);
  equal(json.plumb, "0.1.0");
  equal(json.ok, true);
  deepEqual(json.cells.slice(0, 4).map((c: { kind: string }) => c.kind), [
    "table",
    "fit",
    "fit",
    "fit",
  ]);
  ok(json.cells.every((c: { state: string }) => c.state === "current"));
  const table = json.cells[0];
  deepEqual(Object.keys(table), ["name", "kind", "state", "line", "error", "warnings", "result"]);
  equal(table.result.rows_read, 120);
  equal(table.result.rows_used, 119);
  deepEqual(table.result.excluded.map((e: { row: number }) => e.row), [41]);
  match(table.result.sha256, /^[0-9a-f]{64}$/);
  const root = json.cells[2].result;
  equal(root.method, "linear");
  equal(root.n, 119);
  equal(root.rows.length, 119);
  ok(!root.rows.includes(41), "the excluded row is not used");
});

Deno.test("plumb run prints one line a cell and the state counts", async () => {
  const r = await plumb("run", DEMO);
  equal(r.code, 0, r.stderr);
  match(r.stdout, /^Capacity fade, pouch cells of batch 7/);
  match(r.stdout, /current +fit +root +capacity = q0 - a\*sqrt\(cycle\)/);
  match(r.stdout, /\n\d+ current, 0 failed, 0 held/);
});

Deno.test("plumb run exits 1 with the located error when a cell fails", async () => {
  const dir = await Deno.makeTempDir({ prefix: "plumb-cli-" });
  try {
    const doc = join(dir, "bad.md");
    await Deno.writeTextFile(
      doc,
      "# Bad\n\n```table t\nfrom: nowhere.csv\n```\n\n```fit f\non: t\nmodel: y = a + b*x\n```\n",
    );
    const r = await plumb("run", doc, "--json");
    equal(r.code, 1);
    const json = JSON.parse(r.stdout);
    equal(json.ok, false);
    deepEqual(json.cells.map((c: { state: string }) => c.state), ["failed", "held"]);
    deepEqual([json.cells[0].error.line, json.cells[0].error.column], [4, 7]);
    equal(json.cells[0].result, null);
    const human = await plumb("run", doc);
    match(human.stdout, /failed +table +t +line 4:7 +File "nowhere.csv" not found/);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("plumb exits 2 for a usage error and for an unreadable document", async () => {
  equal((await plumb("run")).code, 2);
  equal((await plumb("frobnicate")).code, 2);
  const missing = await plumb("run", "/nonexistent/doc.md", "--json");
  equal(missing.code, 2);
  equal(missing.stdout, "");
  match(missing.stderr, /Cannot read document "\/nonexistent\/doc.md": no such file/);
});

Deno.test("plumb run --json --without-rows: the same result less each kind's per-row fields, named in omitted", async () => {
  const full = JSON.parse((await plumb("run", DEMO, "--json", "--no-history")).stdout);
  const lean = JSON.parse(
    (await plumb("run", DEMO, "--json", "--no-history", "--without-rows")).stdout,
  );
  equal(lean.cells.length, full.cells.length);
  let left = 0;
  for (let i = 0; i < full.cells.length; i++) {
    const f = full.cells[i], l = lean.cells[i];
    const omitted: string[] = l.omitted ?? [];
    left += omitted.length;
    const expected = { ...f.result };
    for (const k of omitted) delete expected[k];
    // A calc cell's own time differs between two runs; everything else is the same.
    const lr = { ...l.result };
    if (f.kind === "calc") delete lr.run_ms, delete expected.run_ms;
    deepEqual(lr, expected, f.name);
  }
  const fit = lean.cells.find((c: { kind: string }) => c.kind === "fit");
  deepEqual(fit.omitted, ["fitted", "residuals", "rows", "rows_missing"]);
  ok(left > 0);
});

Deno.test("plumb run --json of a 6,000-row document (per-row arrays moved as Float64Array) is JSON.stringify's text", async () => {
  // Invented data: a line with a seeded wobble; 6,000 rows make the per-row arrays long enough to
  // be moved between threads as Float64Array (kernel/worker/protocol.ts, packRows).
  const dir = await Deno.makeTempDir({ prefix: "plumb-cli-json-" });
  try {
    const rows = Array.from(
      { length: 6000 },
      (_, i) => `${i / 10},${(2 + 0.3 * i / 10 + Math.sin(i)).toFixed(6)}`,
    );
    await Deno.writeTextFile(join(dir, "d.csv"), `x,y\n${rows.join("\n")}\n`);
    const doc = "```table t\nfrom: d.csv\n```\n\n```fit line\non: t\nmodel: y = a + b*x\n```\n\n" +
      "```check judge\nfit: line\n```\n";
    await Deno.writeTextFile(join(dir, "doc.md"), doc);
    const r = await plumb("run", join(dir, "doc.md"), "--json", "--no-history");
    equal(r.code, 0, r.stderr);
    const json = JSON.parse(r.stdout);
    equal(json.cells[1].result.fitted.length, 6000);
    equal(json.cells[2].result.leverage.length, 6000);
    // The writer's promise: exactly JSON.stringify(value, null, 2) and a line feed.
    equal(r.stdout, JSON.stringify(json, null, 2) + "\n");
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});
