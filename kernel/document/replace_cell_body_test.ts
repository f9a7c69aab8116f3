import assert from "node:assert/strict";
import { parseDocument, replaceCellBody } from "./mod.ts";

const F = "`".repeat(3);

Deno.test("replaceCellBody() changes only the body and keeps the cell's CRLF endings", () => {
  const src = `# T\r\n\r\n${F}fit a\r\non: t\r\n${F}\r\n\r\n${F}fit b\r\non: t\r\n${F}\r\n`;
  const out = replaceCellBody(parseDocument(src), "b", "on: u\nmodel: y = k*x");
  assert.equal(
    out,
    `# T\r\n\r\n${F}fit a\r\non: t\r\n${F}\r\n\r\n${F}fit b\r\non: u\r\nmodel: y = k*x\r\n${F}\r\n`,
  );
});

Deno.test("replaceCellBody() turns CRLF in the new body into the cell's LF", () => {
  const out = replaceCellBody(parseDocument(`${F}fit a\nx: 1\n${F}\n`), "a", "x: 2\r\ny: 3\r\n");
  assert.equal(out, `${F}fit a\nx: 2\ny: 3\n${F}\n`);
});

Deno.test("replaceCellBody() empties a body and fills an empty one", () => {
  const emptied = replaceCellBody(parseDocument(`${F}fit a\nx: 1\n${F}`), "a", "");
  assert.equal(emptied, `${F}fit a\n${F}`);
  assert.equal(replaceCellBody(parseDocument(emptied), "a", "x: 9"), `${F}fit a\nx: 9\n${F}`);
});

Deno.test("replaceCellBody() starts a new line after a fence on the last line", () => {
  assert.equal(
    replaceCellBody(parseDocument(`t\r\n${F}fit a`), "a", "x: 1"),
    `t\r\n${F}fit a\r\nx: 1\r\n`,
  );
});

Deno.test("replaceCellBody() refuses a body line that would close the fence", () => {
  assert.throws(
    () => replaceCellBody(parseDocument(`${F}calc c\nx\n${F}\n`), "c", "a\n````\nb"),
    new RangeError(
      'Cannot replace the body of "c": line 2 of the new body would close its ``` fence',
    ),
  );
  const longer = replaceCellBody(parseDocument(`~~~~calc c\nx\n~~~~\n`), "c", "```\n~~~\n");
  assert.equal(longer, "~~~~calc c\n```\n~~~\n~~~~\n");
});

Deno.test("replaceCellBody() names the near miss when no cell has the name", () => {
  assert.throws(
    () => replaceCellBody(parseDocument(`${F}fit line\n${F}\n`), "lien", "x: 1"),
    new ReferenceError(
      'Cannot replace the body of "lien": no cell has that name: did you mean "line"?',
    ),
  );
});
