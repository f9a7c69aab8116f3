/**
 * `deno task install` (issue 12): `plumb` installed into a temporary root
 * with the fewest permissions, then run from another folder as a user
 * would. The install reads npm packages from the local cache; where it
 * cannot work offline the test says so in one line and skips the rest.
 */
import { equal, match, ok } from "node:assert/strict";
import { join } from "node:path";
import { inScratch, runIn, task } from "./_cli.ts";

Deno.test("deno task install puts a plumb that runs, creates and refuses from any folder", async () => {
  await inScratch(async (dir) => {
    const root = join(dir, "tools");
    const installed = await task(dir, "install", "--root", "tools");
    if (installed.code !== 0 && /download|network|fetch|dns|connect/i.test(installed.stderr)) {
      console.log(`skip: install needs the network here: ${installed.stderr.trim()}`);
      return;
    }
    equal(installed.code, 0, installed.stderr);
    const plumb = join(root, "bin", "plumb");
    match(installed.stdout, new RegExp(`^Installed plumb at ${plumb}`));
    const shim = await Deno.readTextFile(plumb);
    ok(shim.includes(`--allow-run=${Deno.execPath()}`), shim);
    ok(shim.includes("--allow-net=127.0.0.1 "), shim);
    ok(!shim.includes("--allow-write") && !shim.includes("--allow-all"), shim);
    ok(shim.includes(`exec '${Deno.execPath()}' run`), "the shim runs the Deno that installed it");

    const work = join(dir, "work");
    await Deno.mkdir(join(work, "shed"), { recursive: true });
    const made = await runIn(work, plumb, ["new", "shed/leak.md"]);
    equal(made.code, 0, made.stderr);
    const run = await runIn(work, plumb, ["run", "shed/leak.md"]);
    equal(run.code, 0, run.stderr + run.stdout);
    match(run.stdout, /\n8 current, 0 failed, 0 held/);
    const again = await runIn(join(work, "shed"), plumb, ["new", "leak.md"]);
    equal(again.code, 2);
    equal(again.stderr.trim(), `Will not overwrite "leak.md": it exists (nothing was written)`);
  });
});
