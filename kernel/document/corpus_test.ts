/**
 * Round trips over the awkward-document corpus in test/corpus/documents
 * (written by its `_generate.ts`).
 */
import assert from "node:assert/strict";
import { CORPUS } from "../../test/corpus/documents/_generate.ts";
import {
  cellsOf,
  insertCell,
  parseDocument,
  parseOptions,
  removeCell,
  replaceCellBody,
  writeDocument,
} from "./mod.ts";

const dir = new URL("../../test/corpus/documents/", import.meta.url);
// ignoreBOM keeps U+FEFF in the text: the parser must see it to write it back.
const decoder = new TextDecoder("utf-8", { ignoreBOM: true, fatal: true });
const read = async (file: string) => decoder.decode(await Deno.readFile(new URL(file, dir)));

Deno.test("corpus files on disk equal the generator's text (git kept the bytes)", async () => {
  assert.ok(CORPUS.length >= 15);
  for (const c of CORPUS) assert.equal(await read(c.file), c.text, c.file);
});

Deno.test("writeDocument() returns parseDocument()'s source byte for byte on the corpus", async () => {
  for (const c of CORPUS) {
    const text = await read(c.file);
    const doc = parseDocument(text);
    const out = writeDocument(doc);
    assert.deepEqual(new TextEncoder().encode(out), new TextEncoder().encode(text), c.file);
  }
});

Deno.test("parseDocument() finds the corpus cells, errors and front matter", () => {
  for (const c of CORPUS) {
    const doc = parseDocument(c.text);
    assert.deepEqual(cellsOf(doc).map((x) => x.name), c.cells, c.file);
    assert.equal(doc.errors.length, c.errors, c.file);
    assert.equal(doc.frontMatter !== null, c.frontMatter, c.file);
    for (const cell of cellsOf(doc)) {
      assert.equal(c.text.slice(cell.bodyStart, cell.bodyEnd), cell.body, c.file);
      assert.equal(c.text.slice(cell.kindStart, cell.kindStart + cell.kind.length), cell.kind);
      assert.equal(c.text.slice(cell.nameStart, cell.nameStart + cell.name.length), cell.name);
    }
  }
});

Deno.test("replaceCellBody() changes only bytes inside the cell's body range on the corpus", () => {
  for (const c of CORPUS) {
    const doc = parseDocument(c.text);
    for (const cell of cellsOf(doc)) {
      const out = replaceCellBody(doc, cell.name, "replaced: true\nwith: [1, 2]\n");
      const tail = c.text.length - cell.bodyEnd;
      assert.equal(out.slice(0, cell.bodyStart), c.text.slice(0, cell.bodyStart), c.file);
      assert.equal(out.slice(out.length - tail), c.text.slice(cell.bodyEnd), c.file);
      const again = parseDocument(out);
      assert.deepEqual(cellsOf(again).map((x) => x.name), c.cells, c.file);
      const body = cellsOf(again).find((x) => x.name === cell.name)!.body;
      assert.equal(body.replace(/\r\n?/g, "\n"), "replaced: true\nwith: [1, 2]\n", c.file);
    }
  }
});

Deno.test("insertCell() then removeCell() keep the other cells of every corpus document", () => {
  for (const c of CORPUS) {
    const doc = parseDocument(c.text);
    const n = cellsOf(doc).length;
    for (const at of [-1, n - 1]) {
      const out = insertCell(doc, at, "calc", "added_cell", "x = 1\n");
      const again = parseDocument(out);
      const names = cellsOf(again).map((x) => x.name);
      assert.equal(names.length, n + 1, c.file);
      assert.deepEqual(names.filter((x) => x !== "added_cell"), c.cells, c.file);
      assert.equal(cellsOf(again).find((x) => x.name === "added_cell")!.body.trimEnd(), "x = 1");
      const back = parseDocument(removeCell(again, "added_cell"));
      assert.deepEqual(cellsOf(back).map((x) => x.name), c.cells, c.file);
    }
  }
});

Deno.test("parseOptions() reads every corpus cell and the YAML features document exactly", () => {
  for (const c of CORPUS) {
    const doc = parseDocument(c.text);
    for (const cell of cellsOf(doc)) parseOptions(cell, doc);
  }
  const doc = parseDocument(CORPUS.find((c) => c.file === "yaml-features.txt")!.text);
  const { options, errors } = parseOptions(cellsOf(doc)[0], doc);
  assert.deepEqual(errors, []);
  assert.deepEqual(options, {
    on: "cycles",
    start: { q0: 2500, a: 1, b: 0.7 },
    again: { q0: 2500, a: 1, b: 0.7 },
    model: "capacity = q0 - a*cycle^b\n",
    exclude: [
      { rows: [41, 42], why: 'thermocouple "loose"' },
      { rows: [7], why: "operator's note" },
    ],
  });
});
