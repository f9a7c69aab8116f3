/**
 * Nothing accepted silently by `plumb run` (issue 11 #14). Before: a
 * document whose only problem was its front matter (invalid YAML, a bad
 * setting) exited 0 with `ok: true`; a fence almost `<kind> <name>` (`Fit
 * power`, `fit` with no name) became prose without a word. Now the first
 * exits 1 with the located error and the second is a located warning with
 * the reading meant (RUN-JSON `document_warnings`).
 */
import { deepEqual, equal, match } from "node:assert/strict";
import { join } from "node:path";
import { task } from "./_cli.ts";

const F = "`".repeat(3);

/** `plumb run doc.md [--json]` typed in a folder holding the document and t.csv. */
async function plumbRun(doc: string, json: boolean) {
  const dir = await Deno.makeTempDir({ prefix: "plumb-silent-" });
  try {
    await Deno.writeTextFile(join(dir, "t.csv"), "x,y\n1,2.1\n2,3.9\n3,6.2\n4,7.8\n");
    await Deno.writeTextFile(join(dir, "doc.md"), doc);
    return await task(dir, "plumb", "run", "doc.md", ...(json ? ["--json"] : []));
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

const TABLE = `${F}table t\nfrom: t.csv\n${F}\n`;

Deno.test("plumb run exits 1 for invalid front matter, with line and column", async () => {
  for (
    const [front, line, column, message] of [
      ["title: [unclosed", 3, 1, /^Front matter is not valid YAML: /],
      ["confidence: 2", 2, 13, /^Setting "confidence" must be a number between 0 and 1/],
      ["title: a\ntitle: b", 3, 1, /^Front matter repeats key "title"/],
    ] as const
  ) {
    const r = await plumbRun(`---\n${front}\n---\n\n${TABLE}`, true);
    equal(r.code, 1, r.stdout);
    const json = JSON.parse(r.stdout);
    equal(json.ok, false);
    equal(json.cells[0].state, "current", "the cells still run");
    equal(json.document_errors.length, 1);
    match(json.document_errors[0].message, message);
    deepEqual([json.document_errors[0].line, json.document_errors[0].column], [line, column]);
  }
});

Deno.test("plumb run warns of fences that are almost cells, naming the line", async () => {
  const doc =
    `${TABLE}\n${F}Fit line\non: t\nmodel: y = a + b*x\n${F}\n\n${F}fit\non: t\n${F}\n\n` +
    `${F}python\nprint(1)\n${F}\n`;
  const r = await plumbRun(doc, true);
  equal(r.code, 0, "warnings alone do not fail the run");
  const json = JSON.parse(r.stdout);
  equal(json.ok, true);
  deepEqual(json.document_warnings, [
    {
      message: 'Code block "Fit line" is prose, not a cell: did you mean "fit line"?',
      line: 5,
      column: 4,
    },
    {
      message: 'Code block "fit" is prose, not a cell: a fit cell needs a name, as in "fit name"',
      line: 10,
      column: 4,
    },
  ]);
  const human = await plumbRun(doc, false);
  match(
    human.stdout,
    /\nwarning {3}line 5:4 {2}Code block "Fit line" is prose, not a cell: did you mean "fit line"\?\n/,
  );
  match(human.stdout, /\n\n1 current, 0 failed, 0 held/);
});
