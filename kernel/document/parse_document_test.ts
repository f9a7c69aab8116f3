import assert from "node:assert/strict";
import { LocatedError } from "../errors.ts";
import { type CellBlock, cellsOf, lineColumnAt, parseDocument, type ProseBlock } from "./mod.ts";

const F = "`".repeat(3);

Deno.test("parseDocument() records a cell's words, positions and offsets", () => {
  const src = `Intro\n\n  ${F}  fit   line \non: t\nmodel: y = a + b*x\n${F}\nafter\n`;
  const doc = parseDocument(src);
  assert.equal(doc.blocks.length, 3);
  const cell = doc.blocks[1] as CellBlock;
  assert.equal(cell.type, "cell");
  assert.equal(cell.kind, "fit");
  assert.equal(cell.name, "line");
  assert.deepEqual([cell.line, cell.column, cell.bodyLine], [3, 3, 4]);
  assert.deepEqual(cell.fence, { char: "`", length: 3, indent: 2 });
  assert.equal(cell.start, src.indexOf("  ```"));
  assert.equal(cell.bodyStart, src.indexOf("on: t"));
  assert.equal(cell.bodyEnd, src.indexOf("```\nafter"));
  assert.equal(cell.end, src.indexOf("after"));
  assert.equal(cell.body, "on: t\nmodel: y = a + b*x\n");
  assert.equal(cell.kindStart, src.indexOf("fit"));
  assert.equal(cell.nameStart, src.indexOf("line "));
  assert.equal(cell.error, null);
  const [before, after] = [doc.blocks[0] as ProseBlock, doc.blocks[2] as ProseBlock];
  assert.deepEqual([before.text, before.line, after.text, after.line], [
    "Intro\n\n",
    1,
    "after\n",
    7,
  ]);
});

Deno.test("parseDocument() keeps one-word, bare and three-word fences in the prose", () => {
  const src =
    `${F}python\nx = 1\n${F}\n${F}\nplain\n${F}\n${F}fit a b\n${F}\n${F}Fit a\n${F}\n${F}fit 9a\n${F}\n`;
  const doc = parseDocument(src);
  assert.equal(doc.blocks.length, 1);
  const prose = doc.blocks[0] as ProseBlock;
  assert.deepEqual(prose.fences.map((f) => [f.line, f.info]), [
    [1, "python"],
    [4, ""],
    [7, "fit a b"],
    [9, "Fit a"],
    [11, "fit 9a"],
  ]);
});

Deno.test("parseDocument() does not mistake a fence inside a longer fence for a cell", () => {
  const src = `${"`".repeat(5)}markdown\n${F}fit shown\non: t\n${F}\n${
    "`".repeat(5)
  }\n\n~~~fit real\n${F}\n~~~\n`;
  const doc = parseDocument(src);
  assert.deepEqual(cellsOf(doc).map((c) => [c.name, c.body]), [["real", "```\n"]]);
  assert.deepEqual(doc.errors, []);
});

Deno.test("parseDocument() reports an unclosed cell and ends it before the next cell", () => {
  const src = `Intro\n\n${F}fit line\non: t\n\n${F}fit root\non: t\n${F}\n`;
  const doc = parseDocument(src);
  const [line, root] = cellsOf(doc);
  assert.ok(line.error instanceof LocatedError);
  assert.equal(
    line.error.message,
    'Unclosed fence: cell "fit line" opened at line 3 has no closing ```',
  );
  assert.deepEqual(line.error.pos, { line: 3, column: 1 });
  assert.deepEqual(doc.errors, [line.error]);
  assert.equal(line.body, "on: t\n\n");
  assert.equal(line.end, root.start);
  assert.equal(root.error, null);
  assert.equal(root.body, "on: t\n");
});

Deno.test("parseDocument() cuts an unclosed fence at the end of the document at the next cell", () => {
  const src = `~~~fit a\non: t\n${F}table t\nfrom: t.csv\n${F}\n`;
  const doc = parseDocument(src);
  const [a, t] = cellsOf(doc);
  assert.equal(
    a.error?.message,
    'Unclosed fence: cell "fit a" opened at line 1 has no closing ~~~',
  );
  assert.equal(a.body, "on: t\n");
  assert.equal(t.name, "t");
  assert.equal(t.error, null);
});

Deno.test("parseDocument() reports an unclosed code block in prose and recovers the next cell", () => {
  const doc = parseDocument(`${F}python\nprint(1)\n\n${F}table t\n${F}\n`);
  assert.equal(
    doc.errors[0].message,
    "Unclosed fence: code block opened at line 1 has no closing ```",
  );
  assert.deepEqual(cellsOf(doc).map((c) => c.name), ["t"]);
});

Deno.test("parseDocument() requires a closing fence of the same character, long enough, without info", () => {
  const src = `${"`".repeat(4)}fit a\n${F}\n~~~~\n${"`".repeat(4)} x\n${
    "`".repeat(6)
  }  \t\nafter\n`;
  const cell = cellsOf(parseDocument(src))[0];
  assert.equal(cell.body, "```\n~~~~\n```` x\n");
  assert.equal(src.slice(cell.end), "after\n");
});

Deno.test("parseDocument() does not take a backtick fence with a backtick in its info string", () => {
  const doc = parseDocument("``` fit `x`\nbody\n```\n");
  assert.equal(cellsOf(doc).length, 0);
  assert.deepEqual((doc.blocks[0] as ProseBlock).fences.map((f) => f.line), [3]);
});

Deno.test("parseDocument() reads front matter after a BOM and positions ignore the BOM", () => {
  const src = "\uFEFF---\r\ntitle: T\r\n---\r\n```fit a\r\n```\r\n";
  const doc = parseDocument(src);
  assert.equal(doc.bom, true);
  assert.deepEqual(doc.frontMatter, {
    line: 1,
    start: 1,
    end: 21,
    bodyStart: 6,
    bodyEnd: 16,
    raw: "title: T\r\n",
  });
  const cell = cellsOf(doc)[0];
  assert.deepEqual([cell.line, cell.column, cell.body], [4, 1, ""]);
  assert.deepEqual(lineColumnAt(doc, 1), { line: 1, column: 1 });
  assert.deepEqual(lineColumnAt(doc, 0), { line: 1, column: 1 });
});

Deno.test("parseDocument() reports unclosed front matter and reads the text as prose", () => {
  const doc = parseDocument("---\ntitle: x\n");
  assert.equal(doc.frontMatter, null);
  assert.equal(
    doc.errors[0].message,
    "Unclosed front matter: the `---` on line 1 has no closing `---` line",
  );
  assert.equal(doc.blocks[0].start, 0);
});

Deno.test("parseDocument() treats LF, CRLF and lone CR as line endings", () => {
  const doc = parseDocument("a\r```fit x\r\nk: 1\r```\nb");
  const cell = cellsOf(doc)[0];
  assert.deepEqual([cell.line, cell.body], [2, "k: 1\r"]);
  assert.deepEqual(lineColumnAt(doc, doc.source.length), { line: 5, column: 2 });
});

Deno.test("parseDocument() gives no blocks for an empty document", () => {
  assert.deepEqual(parseDocument(""), {
    source: "",
    bom: false,
    frontMatter: null,
    blocks: [],
    errors: [],
  });
});

Deno.test("parseDocument() lets a cell hold a fence of the other character or a shorter one", () => {
  const tilde = cellsOf(parseDocument(`${F}calc a\n~~~fit b\n~~~\n${F}\n`));
  assert.deepEqual(tilde.map((c) => [c.name, c.body, c.error]), [["a", "~~~fit b\n~~~\n", null]]);
  const longer = cellsOf(
    parseDocument(`${"`".repeat(4)}calc a\n${F}fit b\n${F}\n${"`".repeat(4)}\n`),
  );
  assert.deepEqual(longer.map((c) => [c.name, c.error]), [["a", null]]);
});
