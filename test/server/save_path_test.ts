/**
 * The save path of `plumb serve` (issue 11): a save changes only the edited
 * cell's bytes, refuses a document that is not UTF-8, bounds request bodies,
 * never echoes them, cleans its own stray temporary files and says in plain
 * words why it refused or failed.
 *
 * @module
 */
import { deepEqual, equal, match, ok } from "node:assert/strict";
import { join } from "node:path";
import { namesIn, post, versionOf, withServer } from "./_live_server.ts";
import { chmodStopsWrites } from "../_chmod_stops_writes.ts";

const F = "```";
const enc = (s: string) => new TextEncoder().encode(s);
const CSV = "x,y\n1,2.1\n2,3.9\n3,6.2\n4,7.8\n";

// A BOM, CRLF endings, a lone CR and letters outside ASCII: all outside the edited body.
const CRLF_DOC =
  `\uFEFF---\r\ntitle: Größe\r\n---\r\n\r\nIntro — naïve text.\rStill prose.\r\n\r\n` +
  `${F}table t\r\nfrom: a.csv\r\n${F}\r\n\r\nAfter the cell, ünïcode.\r\n`;

Deno.test("POST /api/cell keeps a BOM, CRLF endings and every byte outside the edited cell", async () => {
  await withServer({ document: CRLF_DOC, files: { "a.csv": CSV, "b.csv": CSV } }, async (ctx) => {
    const before = await Deno.readFile(ctx.doc);
    const res = await post(ctx, "/api/cell", {
      name: "t",
      body: "from: b.csv\n",
      base: await versionOf(before),
    });
    equal(res.status, 200, await res.clone().text());
    const after = await Deno.readFile(ctx.doc);
    equal((await res.json()).version, await versionOf(after));
    const old = enc("from: a.csv\r\n");
    const at = indexOfBytes(before, old);
    deepEqual(after.subarray(0, at), before.subarray(0, at)); // BOM and all before the body
    const tail = before.length - at - old.length;
    deepEqual(after.subarray(after.length - tail), before.subarray(at + old.length));
    deepEqual(after.subarray(at, after.length - tail), enc("from: b.csv\r\n"));
  });
});

Deno.test("POST /api/cell refuses a document that is not valid UTF-8 with 422 and writes nothing", async () => {
  const bytes = new Uint8Array([
    ...enc(`Caf`),
    0xe9,
    ...enc(`\n\n${F}table t\nfrom: a.csv\n${F}\n`),
  ]);
  await withServer({ document: bytes, files: { "a.csv": CSV } }, async (ctx) => {
    const res = await post(ctx, "/api/cell", {
      name: "t",
      body: "from: b.csv\n",
      base: await versionOf(bytes),
    });
    equal(res.status, 422);
    equal(
      (await res.json()).error,
      `Cannot edit "doc.md": it is not valid UTF-8 (byte 0xe9 at offset 3); ` +
        `save it as UTF-8 in a text editor first`,
    );
    deepEqual(await Deno.readFile(ctx.doc), bytes);
  });
});

const SIMPLE = `# Doc\n\n${F}table t\nfrom: a.csv\n${F}\n\nEnd.\n`;

Deno.test("POST /api/cell answers 413 for a body over the limit, reads no further and echoes nothing", async () => {
  await withServer({ document: SIMPLE, files: { "a.csv": CSV } }, async (ctx) => {
    const big = "x".repeat(17 * 1024 * 1024);
    const res = await post(ctx, "/api/cell", { name: "t", body: big, base: "0".repeat(64) });
    equal(res.status, 413);
    const text = await res.text();
    ok(text.length < 300, `${text.length} characters answered`);
    match(JSON.parse(text).error, /^The request body is larger than 16 MiB/);
    equal(await Deno.readTextFile(ctx.doc), SIMPLE);
  });
});

Deno.test("POST /api/cell with a stale base answers 409 without echoing the request's body", async () => {
  await withServer({ document: SIMPLE, files: { "a.csv": CSV } }, async (ctx) => {
    const mine = "from: a.csv\n# " + "y".repeat(1_000_000) + "\n";
    const res = await post(ctx, "/api/cell", { name: "t", body: mine, base: "0".repeat(64) });
    equal(res.status, 409);
    const text = await res.text();
    ok(!text.includes("yyyyyyyy"), `the body came back (${text.length} characters)`);
    equal(JSON.parse(text).disk, SIMPLE);
  });
});

Deno.test("POST /api/cell refuses wrong JSON types with 400 and a sentence naming the field", async () => {
  await withServer({ document: SIMPLE, files: { "a.csv": CSV } }, async (ctx) => {
    const base = await versionOf(SIMPLE);
    const cases: [string, unknown, string][] = [
      [
        "/api/cell",
        { name: { toString: 1 }, body: "x", base },
        `"name" must be text: got an object`,
      ],
      ["/api/cell", { name: "t", body: [1], base }, `"body" must be text: got a list`],
      ["/api/cell/new", { after: null, kind: 3, name: "n", base }, `"kind" must be text: got 3`],
      ["/api/cell/delete", { name: null, base }, `"name" must be text: got null`],
      [
        "/api/cell/restore",
        { text: { a: 1 }, at: null, base },
        `"text" must be text: got an object`,
      ],
      ["/api/cell", { name: "t", body: "x", base: 7 }, `"base" must be the document version`],
    ];
    for (const [path, body, message] of cases) {
      const res = await post(ctx, path, body);
      equal(res.status, 400, path);
      equal((await res.json()).error, message);
    }
    const bad = await post(ctx, "/api/cell", '{"name": "t", "body": ');
    equal(bad.status, 400);
    equal((await bad.json()).error, "The request body must be a JSON object");
    equal(await Deno.readTextFile(ctx.doc), SIMPLE);
  });
});

Deno.test("GET with a malformed percent-encoded path answers 400 in plain words", async () => {
  const katex = await Deno.makeTempDir();
  try {
    await withServer({ document: SIMPLE, options: { katexDir: katex } }, async (ctx) => {
      for (const path of ["/katex/%E0%A4%A", "/katex/%", "/%ZZ"]) {
        const res = await fetch(`${ctx.origin}${path}`, { headers: { cookie: ctx.cookie } });
        const text = await res.text();
        ok(res.status === 400 || res.status === 404, `${path}: ${res.status}`);
        ok(!text.includes("Internal Server Error"), text);
      }
      const res = await fetch(`${ctx.origin}/katex/%E0%A4%A`, { headers: { cookie: ctx.cookie } });
      equal(res.status, 400);
      equal(await res.text(), `Malformed percent-encoding in the path "/katex/%E0%A4%A"\n`);
    });
  } finally {
    await Deno.remove(katex, { recursive: true });
  }
});

Deno.test("POST /api/cell after the document was removed answers 404 naming it and writes nothing", async () => {
  await withServer({ document: SIMPLE, files: { "a.csv": CSV } }, async (ctx) => {
    await Deno.remove(ctx.doc);
    const res = await post(ctx, "/api/cell", { name: "t", body: "x: 1\n", base: "0".repeat(64) });
    equal(res.status, 404);
    equal((await res.json()).error, `Cannot edit "doc.md": the file is no longer there`);
    deepEqual(await namesIn(ctx.dir), ["a.csv"]);
  });
});

Deno.test("POST /api/cell into a read-only folder answers 403 in words and leaves the file intact", async () => {
  const chmod = await chmodStopsWrites();
  const fail = () => {
    throw new Deno.errors.PermissionDenied("Permission denied (os error 13)");
  };
  await withServer({
    document: SIMPLE,
    files: { "a.csv": CSV },
    // Root writes through chmod 0555: there the save's first file-system step is made to fail.
    options: chmod ? {} : { saveHooks: { step: (s) => s === "temp" && fail() } },
  }, async (ctx) => {
    if (chmod) await Deno.chmod(ctx.dir, 0o555);
    const res = await post(ctx, "/api/cell", {
      name: "t",
      body: "from: b.csv\n",
      base: await versionOf(SIMPLE),
    });
    equal(res.status, 403);
    equal(
      (await res.json()).error,
      `Cannot save "doc.md": no permission to write in its folder "${ctx.dir}"; the file is unchanged`,
    );
    equal(await Deno.readTextFile(ctx.doc), SIMPLE);
    deepEqual(await namesIn(ctx.dir), ["a.csv", "doc.md"]);
  });
});

Deno.test("POST /api/cell failing after its temporary file is written removes it and keeps the file", async () => {
  const fail = () => {
    throw new Error("Input/output error (os error 5)");
  };
  const options = { saveHooks: { step: (s: string) => s === "compared" && fail() } };
  await withServer({ document: SIMPLE, files: { "a.csv": CSV }, options }, async (ctx) => {
    const res = await post(ctx, "/api/cell", {
      name: "t",
      body: "from: b.csv\n",
      base: await versionOf(SIMPLE),
    });
    equal(res.status, 500);
    equal(
      (await res.json()).error,
      `Cannot save "doc.md": Input/output error (os error 5); the file is unchanged`,
    );
    equal(await Deno.readTextFile(ctx.doc), SIMPLE);
    deepEqual(await namesIn(ctx.dir), ["a.csv", "doc.md"]);
  });
});

/** Our own temporary names for doc.md, another document's, and look-alikes. */
async function strays(dir: string): Promise<void> {
  for (const n of [".plumb-save-doc.md-0a1b2c.tmp", ".plumb-save-doc.md-a1b2c3d4e5f6.tmp"]) {
    await Deno.writeTextFile(join(dir, n), "half a save");
  }
  await Deno.writeTextFile(join(dir, ".plumb-save-other.md-a1b2c3.tmp"), "another document's");
  await Deno.writeTextFile(join(dir, "notes.tmp"), "the user's");
  await Deno.writeTextFile(join(dir, ".plumb-save-doc.md-a1b2c3.tmp.bak"), "the user's");
  await Deno.mkdir(join(dir, ".plumb-save-doc.md-dddddd.tmp"));
  await Deno.symlink(join(dir, "notes.tmp"), join(dir, ".plumb-save-doc.md-eeeeee.tmp"));
}

const KEPT = [
  ".plumb-save-doc.md-a1b2c3.tmp.bak",
  ".plumb-save-doc.md-dddddd.tmp",
  ".plumb-save-doc.md-eeeeee.tmp",
  ".plumb-save-other.md-a1b2c3.tmp",
  "a.csv",
  "doc.md",
  "notes.tmp",
];

Deno.test("startServer() removes its document's stray temporary files and nothing else", async () => {
  await withServer({ document: SIMPLE, files: { "a.csv": CSV }, prepare: strays }, async (ctx) => {
    const names = await namesIn(ctx.dir);
    deepEqual(names, KEPT);
    equal(await Deno.readTextFile(join(ctx.dir, "notes.tmp")), "the user's");
  });
});

Deno.test("POST /api/cell removes stray temporary files left since the start, and nothing else", async () => {
  await withServer({ document: SIMPLE, files: { "a.csv": CSV } }, async (ctx) => {
    await strays(ctx.dir);
    const res = await post(ctx, "/api/cell", {
      name: "t",
      body: "from: a.csv\n",
      base: await versionOf(SIMPLE),
    });
    equal(res.status, 200);
    await res.body?.cancel();
    const names = await namesIn(ctx.dir);
    deepEqual(names, KEPT);
  });
});

function indexOfBytes(hay: Uint8Array, needle: Uint8Array): number {
  outer: for (let i = 0; i + needle.length <= hay.length; i++) {
    for (let j = 0; j < needle.length; j++) if (hay[i + j] !== needle[j]) continue outer;
    return i;
  }
  return -1;
}
