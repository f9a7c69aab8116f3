import assert from "node:assert/strict";
import { parseDocument, removeCell } from "./mod.ts";

const F = "`".repeat(3);

Deno.test("removeCell() removes the cell and one of the blank lines around it", () => {
  const src = `Intro\n\n${F}fit a\non: t\n${F}\n\n${F}fit b\non: t\n${F}\n\nEnd\n`;
  assert.equal(removeCell(parseDocument(src), "a"), `Intro\n\n${F}fit b\non: t\n${F}\n\nEnd\n`);
  assert.equal(removeCell(parseDocument(src), "b"), `Intro\n\n${F}fit a\non: t\n${F}\n\nEnd\n`);
});

Deno.test("removeCell() leaves a tight neighbour's text alone", () => {
  const src = `Intro\r\n${F}fit a\r\n${F}\r\n\r\nEnd`;
  assert.equal(removeCell(parseDocument(src), "a"), "Intro\r\n\r\nEnd");
});

Deno.test("removeCell() removes a last cell without a final newline", () => {
  assert.equal(removeCell(parseDocument(`Text\n\n${F}fit a\non: t\n${F}`), "a"), "Text\n\n");
});

Deno.test("removeCell() throws a ReferenceError for an unknown cell", () => {
  assert.throws(
    () => removeCell(parseDocument("no cells\n"), "a"),
    new ReferenceError('Cannot remove "a": no cell has that name'),
  );
});
