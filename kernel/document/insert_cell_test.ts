import assert from "node:assert/strict";
import { cellsOf, insertCell, parseDocument } from "./mod.ts";

const F = "`".repeat(3);

Deno.test("insertCell() inserts after a cell with one blank line on each side", () => {
  const src = `${F}table t\nfrom: t.csv\n${F}\nNext paragraph.\n`;
  const out = insertCell(parseDocument(src), 0, "fit", "line", "on: t\n");
  assert.equal(
    out,
    `${F}table t\nfrom: t.csv\n${F}\n\n${F}fit line\non: t\n${F}\n\nNext paragraph.\n`,
  );
});

Deno.test("insertCell() at -1 goes right after the front matter, in the document's CRLF", () => {
  const src = "\uFEFF---\r\ntitle: T\r\n---\r\n\r\nText\r\n";
  const out = insertCell(parseDocument(src), -1, "table", "t", "from: a.csv\n");
  assert.equal(
    out,
    `\uFEFF---\r\ntitle: T\r\n---\r\n${F}table t\r\nfrom: a.csv\r\n${F}\r\n\r\nText\r\n`,
  );
});

Deno.test("insertCell() at the end of a document without a final newline", () => {
  const out = insertCell(parseDocument("Last words"), { offset: 10 }, "calc", "c", "1 + 1");
  assert.equal(out, `Last words\n\n${F}calc c\n1 + 1\n${F}\n`);
});

Deno.test("insertCell() picks a fence longer than any fence in the body", () => {
  const out = insertCell(parseDocument(""), -1, "calc", "c", "const s = `\n```\n`;\n");
  assert.equal(out, "````calc c\nconst s = `\n```\n`;\n````\n");
  assert.equal(cellsOf(parseDocument(out))[0].body, "const s = `\n```\n`;\n");
});

Deno.test("insertCell() refuses malformed words, taken names and positions inside fences", () => {
  const doc = parseDocument(`intro\n${F}fit a\non: t\n${F}\n`);
  assert.throws(
    () => insertCell(doc, 0, "Fit", "b", ""),
    new RangeError(
      'Cannot insert a cell of kind "Fit": a kind is lower case letters, digits, _ or -',
    ),
  );
  assert.throws(
    () => insertCell(doc, 0, "fit", "9b", ""),
    new RangeError(
      'Cannot insert a cell named "9b": a name is letters, digits, _ or - and starts with a letter or _',
    ),
  );
  assert.throws(
    () => insertCell(doc, 0, "fit", "a", ""),
    new RangeError('Cannot insert a cell named "a": the cell at line 2 has that name'),
  );
  assert.throws(
    () => insertCell(doc, { offset: 12 }, "fit", "b", ""),
    new RangeError(
      "Cannot insert a cell at offset 12: it must be a line start outside front matter and fences",
    ),
  );
  assert.throws(
    () => insertCell(doc, 1, "fit", "b", ""),
    new RangeError("Cannot insert a cell after cell index 1: the document has 1 cells"),
  );
});
