/**
 * The documented commands work for a document anywhere on disk, with
 * relative paths taken from the folder the user stands in (issue 12):
 * `deno task --config <repo>/deno.json plumb …` typed in a scratch folder
 * outside the repository, the way a user with a clone elsewhere types it.
 * Failures a user meets first (missing document, port in use) are one line.
 */
import { equal, match, ok } from "node:assert/strict";
import { join } from "node:path";
import { inScratch, oneClearLine, REPO, serving, task } from "./_cli.ts";

const DOC = "# Springs\n\n```table pulls\nfrom: pulls.csv\n```\n\n" +
  "```fit hooke\non: pulls\nmodel: stretch = a + b*load\n```\n";
const CSV = "load,stretch\n1,2.1\n2,3.9\n3,6.2\n4,7.8\n5,10.1\n";

/** A document and its data in `<dir>/notes/`. */
async function writeDoc(dir: string): Promise<void> {
  await Deno.mkdir(join(dir, "notes"));
  await Deno.writeTextFile(join(dir, "notes", "springs.md"), DOC);
  await Deno.writeTextFile(join(dir, "notes", "pulls.csv"), CSV);
}

Deno.test("plumb run resolves a relative document from the caller's folder (INIT_CWD)", async () => {
  await inScratch(async (dir) => {
    await writeDoc(dir);
    const r = await task(dir, "plumb", "run", "notes/springs.md", "--json");
    equal(r.code, 0, r.stderr);
    const json = JSON.parse(r.stdout);
    equal(json.document, "notes/springs.md");
    equal(json.ok, true);
    equal(json.cells[0].result.rows_read, 5);
    const b = json.cells[1].result.parameters.find((p: { name: string }) => p.name === "b");
    ok(Math.abs(b.estimate - 2.0) < 0.1, `slope ${b.estimate}`);
    const human = await task(join(dir, "notes"), "plumb", "run", "springs.md");
    equal(human.code, 0, human.stderr);
    match(human.stdout.split("\n")[0], /\(springs\.md\)$/);
  });
});

Deno.test("plumb run and serve: a missing document is one clear line and exit 2", async () => {
  await inScratch(async (dir) => {
    for (const command of ["run", "serve"]) {
      const r = await task(dir, "plumb", command, "absent.md");
      equal(r.code, 2, `${command}: ${r.stderr}`);
      equal(r.stdout, "");
      ok(oneClearLine(r.stderr), r.stderr);
      equal(r.stderr.trim(), `Cannot read document "absent.md": no such file`);
    }
  });
});

Deno.test("plumb serve: a port in use is one clear line and exit 2", async () => {
  await inScratch(async (dir) => {
    await writeDoc(dir);
    const taken = Deno.listen({ hostname: "127.0.0.1", port: 0 });
    const port = (taken.addr as Deno.NetAddr).port;
    try {
      const r = await task(dir, "plumb", "serve", "notes/springs.md", "--port", String(port));
      equal(r.code, 2, r.stderr);
      ok(oneClearLine(r.stderr), r.stderr);
      match(
        r.stderr,
        new RegExp(`^Cannot serve "notes/springs.md": port ${port} on 127\\.0\\.0\\.1 is in use`),
      );
    } finally {
      taken.close();
    }
  });
});

Deno.test("deno task start serves the demo with no argument and the given document with one", async () => {
  await inScratch(async (dir) => {
    await writeDoc(dir);
    for (
      const [args, doc] of [[[], join(REPO, "examples", "fade", "fade.md")], [
        ["notes/springs.md"],
        join(dir, "notes", "springs.md"),
      ]] as const
    ) {
      const served = await serving(dir, "start", ...args);
      try {
        equal(served.document, doc);
      } finally {
        await served.close();
      }
    }
  });
});
