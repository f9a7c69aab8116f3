/**
 * `plumb new` (issue 12): a new analysis with invented data that runs at
 * once, every common kind current; never an overwrite; a folder it cannot
 * write is one line. Typed in a scratch folder outside the repository,
 * through the documented task.
 */
import { deepEqual, equal, match, ok } from "node:assert/strict";
import { join } from "node:path";
import { inScratch, oneClearLine, type Printed, REPO, runIn, task } from "./_cli.ts";

const exists = (p: string) => Deno.lstat(p).then(() => true, () => false);

Deno.test("plumb new writes a document and invented data that plumb run runs with exit 0", async () => {
  await inScratch(async (dir) => {
    await Deno.mkdir(join(dir, "shed"));
    const made = await task(dir, "plumb", "new", "shed/leak.md");
    equal(made.code, 0, made.stderr);
    match(made.stdout, /^Wrote shed\/leak\.md and shed\/leak-invented\.csv \(invented/);
    const doc = await Deno.readTextFile(join(dir, "shed", "leak.md"));
    match(doc, /_Invented data\._ The readings in `leak-invented\.csv` were made up/);
    match(doc, /from: leak-invented\.csv/);
    const r = await task(dir, "plumb", "run", "shed/leak.md", "--json");
    equal(r.code, 0, r.stderr + r.stdout.slice(0, 2000));
    const json = JSON.parse(r.stdout);
    equal(json.ok, true);
    ok(json.cells.every((c: { state: string }) => c.state === "current"));
    deepEqual(
      [...new Set(json.cells.map((c: { kind: string }) => c.kind))],
      ["table", "fit", "compare", "check", "predict", "chart"],
    );
    const byName = Object.fromEntries(
      json.cells.map((c: { name: string; result: unknown }) => [c.name, c.result]),
    );
    equal(byName.readings.rows_read, 20);
    deepEqual(byName.readings.excluded.map((e: { row: number }) => e.row), [12]);
    equal(byName.leak.preferred, "warmth");
    const k = byName.fraction.parameters.find((p: { name: string }) => p.name === "k");
    ok(k.estimate > 0.025 && k.estimate < 0.035, `loss a day ${k.estimate}`);
    deepEqual(json.document_errors, []);
  });
});

Deno.test("plumb new refuses to overwrite the document or its data and writes nothing", async () => {
  await inScratch(async (dir) => {
    equal((await task(dir, "plumb", "new", "leak.md")).code, 0);
    await Deno.writeTextFile(join(dir, "leak.md"), "my own words\n");
    const again = await task(dir, "plumb", "new", "leak.md");
    equal(again.code, 2);
    ok(oneClearLine(again.stderr), again.stderr);
    equal(again.stderr.trim(), `Will not overwrite "leak.md": it exists (nothing was written)`);
    equal(await Deno.readTextFile(join(dir, "leak.md")), "my own words\n");

    await Deno.writeTextFile(join(dir, "other-invented.csv"), "x\n1\n");
    const data = await task(dir, "plumb", "new", "other.md");
    equal(data.code, 2);
    equal(
      data.stderr.trim(),
      `Will not overwrite "other-invented.csv": it exists (nothing was written)`,
    );
    ok(!(await exists(join(dir, "other.md"))), "the document was not written either");
    equal(await Deno.readTextFile(join(dir, "other-invented.csv")), "x\n1\n");
  });
});

/**
 * Runs `plumb new` so that the operating system refuses the write: as an
 * ordinary user a 0555 folder is enough; root ignores the mode (seen by
 * writing a probe), so root runs the task in a user namespace where it is
 * an ordinary user.
 */
async function newAsOrdinaryUser(dir: string, path: string): Promise<Printed | null> {
  const probe = join(dir, path, "..", "probe");
  const privileged = await Deno.writeTextFile(probe, "").then(() => true, () => false);
  if (!privileged) return await task(dir, "plumb", "new", path);
  await Deno.remove(probe);
  const namespaces = await new Deno.Command("unshare", {
    args: ["-U", "--map-user=1000", "--map-group=1000", "true"],
  }).output().catch(() => null);
  if (!namespaces?.success) return null;
  return await runIn(dir, "unshare", [
    "-U",
    "--map-user=1000",
    "--map-group=1000",
    Deno.execPath(),
    "task",
    "-q",
    "--config",
    join(REPO, "deno.json"),
    "plumb",
    "new",
    path,
  ]);
}

Deno.test("plumb new: a folder without write permission or no folder at all is one clear line", async () => {
  await inScratch(async (dir) => {
    const missing = await task(dir, "plumb", "new", "nowhere/leak.md");
    equal(missing.code, 2);
    ok(oneClearLine(missing.stderr), missing.stderr);
    equal(missing.stderr.trim(), `Cannot write "nowhere/leak.md": no folder "nowhere"`);

    await Deno.mkdir(join(dir, "locked"));
    await Deno.chmod(join(dir, "locked"), 0o555);
    const r = await newAsOrdinaryUser(dir, "locked/leak.md");
    if (r === null) {
      console.log("skip: unwritable folder case (running as root and unshare is not available)");
      return;
    }
    equal(r.code, 2, r.stderr);
    ok(oneClearLine(r.stderr), r.stderr);
    equal(r.stderr.trim(), `Cannot write "locked/leak.md" in folder "locked": permission denied`);
    deepEqual([...Deno.readDirSync(join(dir, "locked"))], []);
  });
});
