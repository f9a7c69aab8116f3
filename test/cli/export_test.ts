/**
 * `plumb export` through the documented task, from a folder outside the
 * checkout: the record of every example is written beside its document,
 * two exports with SOURCE_DATE_EPOCH are the same bytes (separate
 * processes), a failing cell still writes the record (exit 1), bad options
 * and a missing document are one line, and --pdf prints through Chromium.
 */
import { equal, match, ok } from "node:assert/strict";
import { join } from "node:path";
import { inScratch, oneClearLine, REPO, runIn, task } from "./_cli.ts";
import { skipWithoutBrowser } from "../e2e/_harness.ts";

async function copyExample(name: string, dir: string): Promise<string> {
  const from = join(REPO, "examples", name);
  await new Deno.Command("cp", { args: ["-r", from, dir] }).output();
  const md = [...Deno.readDirSync(join(dir, name))].find((e) =>
    e.name.endsWith(".md") &&
    e.name !== "README.md"
  );
  return join(name, md!.name);
}

Deno.test("plumb export writes the record of every example beside its document", async () => {
  const examples = [...Deno.readDirSync(join(REPO, "examples"))].filter((e) => e.isDirectory);
  ok(examples.length >= 1);
  await inScratch(async (dir) => {
    for (const e of examples) {
      const doc = await copyExample(e.name, dir);
      const r = await task(dir, "plumb", "export", doc);
      equal(r.code, 0, `${doc}: ${r.stderr}`);
      const out = join(dir, doc.replace(/\.md$/, ".record.html"));
      const html = await Deno.readTextFile(out);
      match(html, /^<!doctype html>/);
      ok(!/<script/i.test(html), `${doc}: no script`);
    }
  });
});

Deno.test("plumb export: same bytes with SOURCE_DATE_EPOCH in two processes", async () => {
  await inScratch(async (dir) => {
    const doc = await copyExample("fade", dir);
    const run = (out: string) =>
      runIn(dir, Deno.execPath(), [
        "task",
        "-q",
        "--config",
        join(REPO, "deno.json"),
        "plumb",
        "export",
        doc,
        "-o",
        out,
      ], { SOURCE_DATE_EPOCH: "1767225600" });
    equal((await run("a.html")).code, 0);
    equal((await run("b.html")).code, 0);
    const a = await Deno.readFile(join(dir, "a.html"));
    const b = await Deno.readFile(join(dir, "b.html"));
    ok(a.length > 10_000 && a.length === b.length && a.every((x, i) => x === b[i]), "identical");
    match(new TextDecoder().decode(a), /2026-01-01T00:00:00Z/);
  });
});

Deno.test("plumb export: a failed cell still writes the record (exit 1); misuse is one line", async () => {
  await inScratch(async (dir) => {
    const doc = await copyExample("fade", dir);
    const path = join(dir, doc);
    const text = await Deno.readTextFile(path);
    await Deno.writeTextFile(path, text.replace("a*sqrt(cycle)", "a*sqrt(cylce)"));
    const r = await task(dir, "plumb", "export", doc, "-o", "broken.html");
    equal(r.code, 1, r.stderr);
    match(await Deno.readTextFile(join(dir, "broken.html")), /id="banner"/);
    for (
      const args of [["absent.md"], [doc, "--paper", "a3"], [doc, "--frobnicate"], [doc, "-o"]]
    ) {
      const bad = await task(dir, "plumb", "export", ...args);
      equal(bad.code, 2, args.join(" "));
      ok(oneClearLine(bad.stderr), `${args.join(" ")}: ${bad.stderr}`);
    }
  });
});

Deno.test({
  name: "plumb export --pdf prints the record through Chromium",
  ignore: skipWithoutBrowser("export --pdf"),
  fn: async () => {
    await inScratch(async (dir) => {
      const doc = await copyExample("fade", dir);
      const r = await task(dir, "plumb", "export", doc, "--pdf", "--paper", "letter");
      equal(r.code, 0, r.stderr);
      const pdf = await Deno.readFile(join(dir, doc.replace(/\.md$/, ".record.pdf")));
      equal(new TextDecoder().decode(pdf.slice(0, 5)), "%PDF-");
      const pages = new TextDecoder("latin1").decode(pdf).match(/\/Type\s*\/Page(?![a-z])/g);
      ok(pages !== null && pages.length >= 4, `${pages?.length} pages`);
      const left = [...Deno.readDirSync(join(dir, "fade"))].filter((e) =>
        e.name.startsWith(".plumb-pdf-")
      );
      equal(left.length, 0, "the browser's temporary folder is removed");
    });
  },
});
