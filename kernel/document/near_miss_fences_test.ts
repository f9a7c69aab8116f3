import assert from "node:assert/strict";
import { nearMissFences, parseDocument } from "./mod.ts";

const F = "`".repeat(3);
const KINDS = ["table", "fit", "predict", "compare", "check", "chart"];

const warnings = (src: string) =>
  nearMissFences(parseDocument(src), KINDS).map((w) => [w.pos.line, w.pos.column, w.message]);

Deno.test("nearMissFences() names the line and the reading meant for almost-cells", () => {
  const src = [
    `${F}table t`, //            1: a cell
    "from: t.csv",
    F,
    "",
    `${F}Fit upper`, //          5: letter case
    F,
    `${F}fit`, //                7: no name
    F,
    `  ~~~~ fit two words`, //   9: indented, a name of two words
    "  ~~~~",
    `${F}chart   bad!name`, //   11: a name with "!"
    F,
    `${F}fit ...`, //            13: nothing of a name
    F,
  ].join("\n") + "\n";
  assert.deepEqual(warnings(src), [
    [5, 4, 'Code block "Fit upper" is prose, not a cell: did you mean "fit upper"?'],
    [7, 4, 'Code block "fit" is prose, not a cell: a fit cell needs a name, as in "fit name"'],
    [9, 8, 'Code block "fit two words" is prose, not a cell: did you mean "fit two-words"?'],
    [11, 4, 'Code block "chart   bad!name" is prose, not a cell: did you mean "chart badname"?'],
    [
      13,
      4,
      'Code block "fit ..." is prose, not a cell: a cell name is one word of letters, digits, "_" and "-"',
    ],
  ]);
});

Deno.test("nearMissFences() leaves code samples alone", () => {
  for (const info of ["", "python", "text", "js", "sh", "yaml", "csv", "fitt", "python title=x"]) {
    assert.deepEqual(warnings(`${F}${info}\nx = 1\n${F}\n`), [], info);
  }
});

Deno.test("nearMissFences() suggests the kind for a misspelt kind with a bad name", () => {
  assert.deepEqual(warnings(`${F}Predcit end of life\n${F}\n`), [
    [
      1,
      4,
      'Code block "Predcit end of life" is prose, not a cell: did you mean "predict end-of-life"?',
    ],
  ]);
});

Deno.test("nearMissFences() reports front matter below line 1 as prose", () => {
  const src = `\n\n---\ntitle: Fade\n---\n\n${F}table t\nfrom: t.csv\n${F}\n`;
  assert.deepEqual(warnings(src), [
    [
      3,
      1,
      'Front matter must start on line 1: the "---" on line 3 follows blank lines, so it is read as prose',
    ],
  ]);
  assert.deepEqual(warnings(`---\ntitle: Fade\n---\n`), []);
  assert.deepEqual(warnings(`Text\n\n---\n\nMore\n\n---\n`), [], "thematic breaks after prose");
});
