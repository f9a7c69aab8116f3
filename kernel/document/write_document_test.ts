import assert from "node:assert/strict";
import { parseDocument, writeDocument } from "./mod.ts";

Deno.test("writeDocument() is lossless on seeded random documents of fence-like lines", () => {
  // A tiny linear congruential generator (Numerical Recipes' constants, from memory) keeps it reproducible.
  let state = 12345;
  const next = (n: number) => (state = (state * 1664525 + 1013904223) >>> 0) % n;
  const pieces = [
    "```",
    "````",
    "~~~",
    "```fit a",
    "~~~table b",
    "```python",
    "---",
    "...",
    "  ```",
    "    ```",
    "text",
    "",
    " \t",
    "\uFEFF",
    "é😀",
    "@(a.b, 2)",
    "`x`",
    "```fit a b",
    "x: [1, 2",
  ];
  const endings = ["\n", "\r\n", "\r", ""];
  for (let t = 0; t < 500; t++) {
    let src = "";
    const lines = next(12);
    for (let i = 0; i < lines; i++) {
      src += pieces[next(pieces.length)] + endings[next(endings.length)];
    }
    assert.equal(writeDocument(parseDocument(src)), src, JSON.stringify(src));
  }
});

Deno.test("writeDocument() throws when blocks do not cover the source", () => {
  const doc = parseDocument("a\n\n```fit x\n```\nb\n");
  doc.blocks.splice(1, 1);
  assert.throws(
    () => writeDocument(doc),
    new RangeError("Cannot write the document: a block starts at 16, expected 3"),
  );
});
