/**
 * A browser save racing an editor's write (issue 11, defect 2). Before the
 * fix the server compared versions, then wrote: an editor write landing in
 * between was overwritten (an editor appending every 15–25 ms against
 * back-to-back saves lost 476 of 1,187 lines). Every acknowledged editor
 * write must end in the file, or in a conflict the server reported.
 *
 * @module
 */
import { equal, ok } from "node:assert/strict";
import { join } from "node:path";
import { isOwnTemp } from "../../kernel/server/atomic_write.ts";
import type { SaveStep } from "../../kernel/server/replace_if_unchanged.ts";
import { type Ctx, namesIn, post, versionOf, withServer } from "./_live_server.ts";

const F = "```";
const DOC = `# Race\n\n${F}table t\nfrom: a.csv\n${F}\n\nEditor lines follow.\n`;
const CSV = "x,y\n1,2\n2,4\n3,7\n";
const WRITER = new URL("./_append_writer.ts", import.meta.url).pathname;

/** One save of cell `t` on the version now on disk; the answer's status and body. */
async function saveOnce(
  ctx: Ctx,
  k: number,
): Promise<{ status: number; json: { disk: string; diskVersion: string } }> {
  const base = await versionOf(await Deno.readFile(ctx.doc));
  const res = await post(ctx, "/api/cell", { name: "t", body: `from: a.csv\n# save ${k}\n`, base });
  return { status: res.status, json: await res.json() };
}

/**
 * Runs the editor process against back-to-back saves; returns what it acknowledged, the
 * lines missing from the file at the end, those of them a conflict reported, and counts.
 */
async function race(ctx: Ctx, mode: "append" | "rename", count: number) {
  const child = new Deno.Command(Deno.execPath(), {
    args: [
      "run",
      "--no-check",
      "--allow-read",
      "--allow-write",
      WRITER,
      ctx.doc,
      `${count}`,
      "7",
      mode,
    ],
    stdout: "piped",
    stderr: "inherit",
  }).spawn();
  const out = child.output();
  let done = false;
  void out.then(() => done = true);
  const reported = new Set<string>();
  let saves = 0, conflicts = 0;
  while (!done) {
    const { status, json } = await saveOnce(ctx, saves++);
    ok(status === 200 || status === 409, `status ${status}: ${JSON.stringify(json)}`);
    if (status === 409) {
      conflicts++;
      for (const line of json.disk.split("\n")) if (line.startsWith("editor ")) reported.add(line);
    }
  }
  const acked = new TextDecoder().decode((await out).stdout).trim().split("\n").map(Number);
  const final = await Deno.readTextFile(ctx.doc);
  const kept = (await namesIn(ctx.dir)).filter((n) => n.startsWith("doc.md.conflict-"));
  for (const k of kept) {
    for (const l of (await Deno.readTextFile(join(ctx.dir, k))).split("\n")) reported.add(l);
  }
  const missing = acked.filter((n) => !final.includes(`editor ${n}\n`));
  const unreported = missing.filter((n) => !reported.has(`editor ${n}`));
  return { acked, missing, unreported, saves, conflicts, final };
}

for (const mode of ["append", "rename"] as const) {
  Deno.test(`POST /api/cell loses no write of an editor that ${mode}s every 15–25 ms during back-to-back saves`, async () => {
    await withServer({ document: DOC, files: { "a.csv": CSV } }, async (ctx) => {
      const r = await race(ctx, mode, 120);
      equal(r.acked.length, 120);
      // Before: 56-58 (append) and 51-70 (rename) of 120 lost. An in-place writer loses none;
      // a renaming one can still lose a line whose rename lands in the ~0.05 ms between the
      // inode check and our rename (replace_if_unchanged.ts): 0 in 4 runs, 2 in one loaded run.
      const allowed = mode === "append" ? 0 : 4;
      ok(r.unreported.length <= allowed, `lost: ${r.unreported.join(", ")}`);
      if (mode === "append") equal(r.missing.length, 0, `missing: ${r.missing.join(", ")}`);
      ok(r.saves > 20 && r.saves > r.conflicts, `${r.saves} saves, ${r.conflicts} conflicts`);
      ok((await namesIn(ctx.dir)).every((n) => !isOwnTemp("doc.md", n)));
    });
  });
}

/** Serves DOC with a hook on the save's steps. */
const hooked = (step: (s: SaveStep, doc: string) => void, fn: (ctx: Ctx) => Promise<void>) => {
  let doc = "";
  return withServer({
    document: DOC,
    files: { "a.csv": CSV },
    prepare: (_dir, d) => void (doc = d),
    options: { saveHooks: { step: (s) => step(s, doc) } },
  }, fn);
};

const append = (doc: string, line: string) =>
  Deno.writeFileSync(doc, new TextEncoder().encode(line), { append: true });

Deno.test("POST /api/cell answers 409 for an editor's rename after the read, keeping the editor's file", async () => {
  await hooked((s, doc) => {
    if (s !== "temp") return;
    Deno.writeTextFileSync(`${doc}.swap`, DOC + "editor renamed\n");
    Deno.renameSync(`${doc}.swap`, doc);
  }, async (ctx) => {
    const { status, json } = await saveOnce(ctx, 1);
    equal(status, 409);
    equal(json.disk, DOC + "editor renamed\n");
    equal(await Deno.readTextFile(ctx.doc), DOC + "editor renamed\n");
    equal((await namesIn(ctx.dir)).join(), "a.csv,doc.md");
  });
});

Deno.test("POST /api/cell puts back an editor's in-place write between its compare and rename, and answers 409", async () => {
  await hooked(
    (s, doc) => s === "compared" && append(doc, "editor in the window\n"),
    async (ctx) => {
      const { status, json } = await saveOnce(ctx, 1);
      equal(status, 409);
      equal(json.disk, DOC + "editor in the window\n");
      equal(json.diskVersion, await versionOf(DOC + "editor in the window\n"));
      equal(await Deno.readTextFile(ctx.doc), DOC + "editor in the window\n");
      equal((await namesIn(ctx.dir)).join(), "a.csv,doc.md");
    },
  );
});

Deno.test("POST /api/cell puts the old file back when an editor holding it open writes after the rename", async () => {
  let held: Deno.FsFile | null = null;
  const enc = new TextEncoder();
  await hooked((s, doc) => {
    if (s === "compared") held = Deno.openSync(doc, { append: true });
    if (s === "renamed") held!.writeSync(enc.encode("editor after the rename\n"));
  }, async (ctx) => {
    try {
      const { status } = await saveOnce(ctx, 1);
      equal(status, 409);
      held!.writeSync(enc.encode("editor still writing\n")); // its handle names the document again
      equal(
        await Deno.readTextFile(ctx.doc),
        DOC + "editor after the rename\neditor still writing\n",
      );
    } finally {
      held!.close();
    }
  });
});
