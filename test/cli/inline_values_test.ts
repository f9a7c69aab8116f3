/**
 * `plumb run` resolves inline values as the page does: a broken one is a
 * document error (exit 1, in the summary and in RUN-JSON's
 * `document_errors`), a parameter named like a result field is refused with
 * both paths, and a good one passes.
 */
import { equal, match, ok } from "node:assert/strict";
import { join } from "node:path";
import { inScratch, task } from "./_cli.ts";

const F = "```";
const DOC = (prose: string) =>
  `---\ntitle: Inline values\n---\n\n${F}table t\ncolumns: [x, y]\nrows:\n` +
  `  - [1, 2.1]\n  - [2, 3.9]\n  - [3, 6.2]\n  - [4, 7.8]\n  - [5, 10.1]\n${F}\n\n` +
  `${F}fit page\non: t\nmodel: y = n*x + c\n${F}\n\n${prose}\n`;

Deno.test("plumb run fails on a broken inline value and refuses an ambiguous one", async () => {
  await inScratch(async (dir) => {
    await Deno.writeTextFile(join(dir, "good.md"), DOC("Slope @(page.parameters.n.estimate, 3)."));
    const good = await task(dir, "plumb", "run", "good.md");
    equal(good.code, 0, good.stdout + good.stderr);

    await Deno.writeTextFile(join(dir, "bad.md"), DOC("R² is @(page.r3, 3) and n is @(page.n)."));
    const bad = await task(dir, "plumb", "run", "bad.md");
    equal(bad.code, 1);
    match(
      bad.stdout,
      /Inline value @\(page\.r3, 3\): Unknown field "r3" in "page": did you mean "r2"/,
    );
    match(bad.stdout, /Inline value @\(page\.n\): "page\.n" could mean the result's field "n"/);
    const json = await task(dir, "plumb", "run", "bad.md", "--json");
    equal(json.code, 1);
    const out = JSON.parse(json.stdout) as { ok: boolean; document_errors: { line: number }[] };
    equal(out.ok, false);
    equal(out.document_errors.length, 2);
    ok(out.document_errors.every((e) => e.line === 20), JSON.stringify(out.document_errors));
  });
});
