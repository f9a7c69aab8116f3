import { deepEqual, equal, match, notEqual, ok } from "node:assert/strict";
import { join } from "node:path";
import { Session } from "./session.ts";
import { fakeRegistry } from "./testdata/fake_kinds.ts";

const WORKER = new URL("./testdata/fake_worker.ts", import.meta.url);

function cell(kind: string, name: string, body: string): string {
  return "```" + `${kind} ${name}\n${body}\n` + "```\n";
}

async function withSession(fn: (s: Session, dir: string) => Promise<void>) {
  const dir = await Deno.makeTempDir({ prefix: "plumb-session-" });
  const s = new Session({ registry: fakeRegistry, workerUrl: WORKER, dir });
  try {
    await fn(s, dir);
  } finally {
    s.close();
    await Deno.remove(dir, { recursive: true });
  }
}

const stateOf = (r: Awaited<ReturnType<Session["run"]>>, name: string) =>
  r.cells.find((c) => c.name === name)!;

//        a
//       / \
//      b   c
//       \ /
//        d
const diamond = (a: number, prose = "Some prose.") =>
  `# Diamond\n\n${prose}\n\n` + cell("num", "a", `value: ${a}`) +
  cell("sum", "b", "of: [a]") + cell("sum", "c", "of: [a, a]") + cell("sum", "d", "of: [b, c]");

Deno.test("Session.run() computes a diamond's bottom cell once per change", async () => {
  await withSession(async (s) => {
    let r = await s.run(diamond(1));
    deepEqual(r.ran, ["a", "b", "c", "d"]);
    equal((stateOf(r, "d").result as { value: number }).value, 3);
    r = await s.run(diamond(2));
    deepEqual(r.ran, ["a", "b", "c", "d"]);
    equal(s.runs.get("d"), 2);
    equal((stateOf(r, "d").result as { value: number }).value, 6);
  });
});

Deno.test("Session.run() recomputes nothing after a prose edit or a YAML whitespace edit", async () => {
  await withSession(async (s) => {
    await s.run(diamond(1));
    let r = await s.run(diamond(1, "Other prose, with an edit."));
    deepEqual(r.ran, []);
    ok(r.cells.every((c) => c.state === "current" && c.cached));
    r = await s.run(diamond(1).replace("value: 1", "value:    1   # same"));
    deepEqual(r.ran, []);
  });
});

//   a ── b ── c        x ── y
// editing b reruns b and c only
Deno.test("Session.run() reruns exactly the downstream cells of an edit", async () => {
  const doc = (bOf: string) =>
    cell("num", "a", "value: 1") + cell("sum", "b", `of: [${bOf}]`) + cell("sum", "c", "of: [b]") +
    cell("num", "x", "value: 5") + cell("sum", "y", "of: [x]");
  await withSession(async (s) => {
    await s.run(doc("a"));
    const r = await s.run(doc("a, a"));
    deepEqual(r.ran, ["b", "c"]);
    deepEqual([...s.runs.entries()].sort(), [["a", 1], ["b", 2], ["c", 2], ["x", 1], ["y", 1]]);
  });
});

Deno.test("Session.run() reports a cycle of three cells naming the whole path", async () => {
  const doc = cell("sum", "a", "of: [b]") + cell("sum", "b", "of: [c]") +
    cell("sum", "c", "of: [a]") +
    cell("num", "free", "value: 1");
  await withSession(async (s) => {
    const r = await s.run(doc);
    for (const n of ["a", "b", "c"]) {
      equal(stateOf(r, n).state, "failed");
      match(stateOf(r, n).error!.message, /^Cycle: /);
    }
    equal(stateOf(r, "a").error!.message, "Cycle: a → b → c → a");
    equal(stateOf(r, "a").error!.line, 2);
    equal(stateOf(r, "free").state, "current");
  });
});

Deno.test("Session.run() suggests the nearest name for an unknown reference and holds dependents", async () => {
  const doc = cell("num", "cycles", "value: 1") + cell("sum", "s", "of: [cylces]") +
    cell("sum", "t", "of: [s]");
  await withSession(async (s) => {
    const r = await s.run(doc);
    equal(stateOf(r, "s").state, "failed");
    equal(stateOf(r, "s").error!.message, 'Unknown cell "cylces" in "s": did you mean "cycles"?');
    deepEqual([stateOf(r, "s").error!.line, stateOf(r, "s").error!.column], [5, 6]);
    equal(stateOf(r, "t").state, "held");
    equal(stateOf(r, "cycles").state, "current");
  });
});

Deno.test("Session.run() refuses a reference to a cell of the wrong output type", async () => {
  await withSession(async (s, dir) => {
    await Deno.writeTextFile(join(dir, "data.txt"), "12345");
    const r = await s.run(cell("bytes", "raw", "from: data.txt") + cell("sum", "s", "of: [raw]"));
    equal(stateOf(r, "raw").state, "current");
    equal(
      stateOf(r, "s").error!.message,
      '"of.0" of "s" must name a value cell, but "raw" is a bytes cell (gives table)',
    );
  });
});

Deno.test("Session.run() fails a duplicate name and an unknown kind, other cells still run", async () => {
  const doc = cell("num", "a", "value: 1") + cell("num", "a", "value: 2") +
    cell("nmu", "b", "value: 3") +
    cell("sum", "c", "of: [a]");
  await withSession(async (s) => {
    const r = await s.run(doc);
    equal(r.cells[1].state, "failed");
    match(
      r.cells[1].error!.message,
      /^Duplicate cell name "a": already used by the num cell at line 1/,
    );
    equal(r.cells[2].state, "failed");
    match(r.cells[2].error!.message, /^Unknown cell kind "nmu": did you mean "num"\?/);
    deepEqual([r.cells[2].error!.line, r.cells[2].error!.column], [7, 4]);
    equal((stateOf(r, "c").result as { value: number }).value, 1);
  });
});

Deno.test("Session.run() reruns a file's readers when the file changes, and only them", async () => {
  await withSession(async (s, dir) => {
    const path = join(dir, "data.txt");
    await Deno.writeTextFile(path, "abc");
    const doc = cell("bytes", "raw", "from: data.txt") + cell("num", "k", "value: 1");
    await s.run(doc);
    await Deno.writeTextFile(path, "abcdef");
    s.files.forget(path);
    const r = await s.run(doc);
    deepEqual(r.ran, ["raw"]);
    equal((stateOf(r, "raw").result as { value: number }).value, 6);
  });
});

Deno.test("Session.run() with once: true lets go of a file after its last reader, and its readers' outputs stay", async () => {
  const dir = await Deno.makeTempDir({ prefix: "plumb-session-" });
  const s = new Session({ registry: fakeRegistry, workerUrl: WORKER, dir, once: true });
  try {
    const path = join(dir, "data.txt");
    await Deno.writeTextFile(path, "abcde");
    // raw2 settles while l waits in the worker's queue: the file is let go then (raw2 is its
    // last reader), and the outputs of raw2 and l must stay for the cells after them.
    const doc = cell("bytes", "raw", "from: data.txt") + cell("bytes", "raw2", "from: data.txt") +
      cell("length", "l", "of: raw2") + cell("sum", "t", "of: [l]") +
      cell("length", "m", "of: raw");
    let r = await s.run(doc);
    deepEqual(r.cells.map((c) => [c.name, c.state]), [
      ["raw", "current"],
      ["raw2", "current"],
      ["l", "current"],
      ["t", "current"],
      ["m", "current"],
    ]);
    equal((stateOf(r, "t").result as { value: number }).value, 5);
    equal((stateOf(r, "m").result as { value: number }).value, 5);
    // SHA-256 of "abcde" (common practice, no source: any sha256sum gives it).
    deepEqual(r.files, [{
      path: "data.txt",
      sha256: "36bbe50ed96841d10443bcb670d6554f0a34b761be67ec9c4a8ad2c0c44ca42c",
      bytes: 5,
      lines: 1,
    }]);
    // Let go of, so read again without a forget from a watcher.
    await Deno.writeTextFile(path, "abcdefg");
    r = await s.run(doc);
    equal((stateOf(r, "l").result as { value: number }).value, 7);
  } finally {
    s.close();
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("Session.run() locates a missing file and a path leaving the folder at the option", async () => {
  await withSession(async (s) => {
    const r = await s.run(
      cell("bytes", "a", "from: nope.csv") + cell("bytes", "b", "from: ../etc/passwd"),
    );
    match(stateOf(r, "a").error!.message, /^File "nope.csv" not found/);
    deepEqual([stateOf(r, "a").error!.line, stateOf(r, "a").error!.column], [2, 7]);
    match(
      stateOf(r, "b").error!.message,
      /^File "..\/etc\/passwd" is outside the document's folder/,
    );
  });
});

Deno.test("compute worker has no permissions: a cell reading the disk is refused", async () => {
  await withSession(async (s) => {
    const r = await s.run(cell("peek", "p", "path: /etc/hostname"));
    equal(stateOf(r, "p").state, "failed");
    equal(stateOf(r, "p").error!.message, "Refused: NotCapable");
  });
});

Deno.test("Session.run() superseded by a newer run stops updating and the newer one wins", async () => {
  await withSession(async (s) => {
    const slow = (tag: number) =>
      cell("spin", "a", `ms: 150\ntag: ${tag}`) + cell("spin", "b", `ms: 150\ntag: ${tag}`);
    const first = s.run(slow(1));
    await new Promise((r) => setTimeout(r, 20));
    const second = await s.run(slow(2));
    const old = await first;
    ok(old.superseded);
    equal(second.superseded, false);
    equal((stateOf(second, "b").result as { value: number }).value, 2);
  });
});

Deno.test("Session.run() locates a kind's parse error at the option", async () => {
  await withSession(async (s) => {
    const r = await s.run("Intro\n\n" + cell("num", "a", "# comment\nvalue: high"));
    equal(stateOf(r, "a").error!.message, '"value" of "a" must be a number');
    deepEqual([stateOf(r, "a").error!.line, stateOf(r, "a").error!.column], [5, 8]);
  });
});

Deno.test("Session.run() computes independent cells on two workers at once and copies an input across", async () => {
  const dir = await Deno.makeTempDir({ prefix: "plumb-session-" });
  const events: string[] = [];
  const s = new Session({
    registry: fakeRegistry,
    workerUrl: WORKER,
    dir,
    workers: 2,
    onEvent: (e) => events.push(`${e.name}:${e.state}`),
  });
  try {
    // a and b busy-wait 200 ms each; c reads both, so one of them is copied to c's worker.
    const doc = cell("spin", "a", "ms: 200\ntag: 3") + cell("spin", "b", "ms: 200\ntag: 4") +
      cell("sum", "c", "of: [a, b]");
    const r = await s.run(doc);
    equal((stateOf(r, "c").result as { value: number }).value, 7);
    // Both were computing before either settled: they ran at the same time.
    const settledFirst = Math.min(events.indexOf("a:current"), events.indexOf("b:current"));
    ok(
      events.indexOf("a:computing") < settledFirst && events.indexOf("b:computing") < settledFirst,
    );
    // Copied, not computed again, for c.
    deepEqual([s.runs.get("a"), s.runs.get("b"), s.runs.get("c")], [1, 1, 1]);
    deepEqual(r.ran, ["a", "b", "c"]);
  } finally {
    s.close();
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("Session.run() superseded cancels its cells queued in the worker, which count as not run", async () => {
  await withSession(async (s) => {
    // b and c wait in the worker's queue behind a (sent ahead of a's answer).
    const chain = (tag: number) =>
      cell("spin", "a", `ms: 200\ntag: ${tag}`) + cell("sum", "b", "of: [a]") +
      cell("sum", "c", "of: [b]");
    await s.run(cell("num", "warm", "value: 0")); // the worker is up
    const first = s.run(chain(1));
    await new Promise((r) => setTimeout(r, 50));
    const second = await s.run(chain(2));
    const old = await first;
    ok(old.superseded);
    equal((stateOf(second, "c").result as { value: number }).value, 2);
    // The first run's b and c never started (a, busy meanwhile, finished, or on a slow
    // machine was cancelled too): only the second run's b and c count.
    deepEqual([s.runs.get("b"), s.runs.get("c")], [1, 1]);
    ok(s.runs.get("a")! >= 1);
    deepEqual(second.ran, ["a", "b", "c"]);
  });
});

//   p (fails when run) ── s
// s is sent into p's worker queue ahead of p's answer; the worker then finds p missing.
Deno.test("Session.run() holds a cell whose input failed, names the input once and does not count it as run", async () => {
  await withSession(async (s) => {
    await s.run(cell("num", "warm", "value: 0")); // the worker is up
    const r = await s.run(cell("peek", "p", "path: /etc/hostname") + cell("sum", "s", "of: [p]"));
    equal(stateOf(r, "p").state, "failed");
    equal(stateOf(r, "s").state, "held");
    // The state says held; the message only why (the page and the terminal add the word).
    equal(stateOf(r, "s").error!.message, 'input "p" is failed');
    deepEqual(r.ran, ["p"]);
    deepEqual([s.runs.get("p"), s.runs.get("s")], [1, undefined]);
  });
});

Deno.test("Session.run() with page: true keeps the worker's text of a result and parses it on demand", async () => {
  const dir = await Deno.makeTempDir({ prefix: "plumb-session-" });
  const s = new Session({ registry: fakeRegistry, workerUrl: WORKER, dir, page: true });
  try {
    const doc = (v: number) => cell("num", "a", `value: ${v}`) + cell("sum", "b", "of: [a]");
    let r = await s.run(doc(2));
    const b = stateOf(r, "b");
    equal(b.page!.json, '{"value":2}');
    deepEqual(b.result, { value: 2 });
    // Reused from the cache: the same text under the same id.
    r = await s.run(doc(2) + "\nProse.\n");
    deepEqual([stateOf(r, "b").page, stateOf(r, "b").cached], [b.page, true]);
    // A new value: a new key.
    r = await s.run(doc(5));
    notEqual(stateOf(r, "b").page!.id, b.page!.id);
  } finally {
    s.close();
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("Session.run() reads a large CSV in two halves in the compute worker, the helper started by the main thread", async () => {
  await withSession(async (s, dir) => {
    // Invented data: 3,000,000 records "i,2i" (about 34 MB, over the 32 MB from which the
    // reader splits the file); made as bytes, not strings.
    const rows = 3_000_000;
    const lines = ["x,y"];
    for (let i = 0; i < rows; i++) lines.push(`${i},${2 * i}`);
    await Deno.writeTextFile(join(dir, "big.csv"), lines.join("\n") + "\n");
    const doc = cell("csvrows", "c", "from: big.csv");
    let r = await s.run(doc);
    // rows read + 1e6 × (second halves a helper gave): one, in the worker (a helper started
    // inside the worker began about a second late, after the read).
    equal((stateOf(r, "c").result as { value: number }).value, rows + 1e6);
    // Each helper reads once: a second read (the file changed) gets a new one.
    await Deno.writeTextFile(join(dir, "big.csv"), lines.join("\n") + "\n0,0\n");
    s.files.forget();
    r = await s.run(doc);
    equal((stateOf(r, "c").result as { value: number }).value, rows + 1 + 1e6);
  });
});

Deno.test("Session.run() stops a cell still computing whose inputs changed, at its next progress report", async () => {
  await withSession(async (s) => {
    const doc = (tag: number) => cell("tick", "t", `ms: 3000\ntag: ${tag}`);
    const first = s.run(doc(1));
    // Let the first run's cell start computing (the worker starts in about 0.1 s).
    await new Promise((r) => setTimeout(r, 500));
    const second = await s.run(doc(2)); // another key: the first is stopped, not finished
    const old = await first;
    equal(old.superseded, true);
    // Only the second run of `tick` ran to its end in the worker.
    equal((stateOf(second, "t").result as { value: number }).value, 1);
    // A run keeping the key does not stop it: the same text again is answered from the cache.
    const again = await s.run(doc(2));
    deepEqual(again.ran, []);
  });
});
