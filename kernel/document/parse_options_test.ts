import assert from "node:assert/strict";
import { LocatedError } from "../errors.ts";
import { cellsOf, parseDocument, parseOptions } from "./mod.ts";

const F = "`".repeat(3);

function optionsOf(src: string, index = 0) {
  const doc = parseDocument(src);
  return parseOptions(cellsOf(doc)[index], doc);
}

const TABLE = [
  "---", //                                     1
  "title: T", //                                2
  "---", //                                     3
  "", //                                        4
  `${F}table cycles`, //                        5
  "from: data/batch7.csv", //                   6
  "units: { cycle: cycles, capacity: mAh }", // 7
  "exclude:", //                                8
  "  - rows: [41, 42]", //                      9
  "    why: thermocouple came loose", //       10
  '  - why: "a \\"quoted\\" note"', //          11
  "    rows:", //                              12
  "note: |", //                                13
  "  first line", //                           14
  "  second line", //                          15
  F, //                                        16
  "",
].join("\n");

Deno.test("parseOptions() reads the body as plain data", () => {
  const { options, errors } = optionsOf(TABLE);
  assert.deepEqual(errors, []);
  assert.deepEqual(options, {
    from: "data/batch7.csv",
    units: { cycle: "cycles", capacity: "mAh" },
    exclude: [{ rows: [41, 42], why: "thermocouple came loose" }, {
      why: 'a "quoted" note',
      rows: null,
    }],
    note: "first line\nsecond line\n",
  });
});

Deno.test("parseOptions() locate() maps nested paths to document lines and columns", () => {
  const { locate } = optionsOf(TABLE);
  assert.deepEqual(locate([]), { line: 5, column: 1 });
  assert.deepEqual(locate(["from"]), { line: 6, column: 7 });
  assert.deepEqual(locate(["units", "capacity"]), { line: 7, column: 35 });
  assert.deepEqual(locate(["exclude", 0, "rows", 1]), { line: 9, column: 16 });
  assert.deepEqual(locate(["exclude", 0, "why"]), { line: 10, column: 10 });
  // A key with no value: the key's position.
  assert.deepEqual(locate(["exclude", 1, "rows"]), { line: 12, column: 5 });
  // A missing path: the nearest existing ancestor.
  assert.deepEqual(locate(["exclude", 0, "nope", 3]), { line: 9, column: 5 });
  assert.deepEqual(locate(["missing"]), { line: 5, column: 1 });
});

Deno.test("parseOptions() locate() maps offsets inside plain, quoted and block scalars", () => {
  const { locate } = optionsOf(TABLE);
  // "from: data/batch7.csv": offset 5 is the "b" of batch7.
  assert.deepEqual(locate(["from"], 5), { line: 6, column: 12 });
  // '"a \"quoted\" note"': value offset 3 is the q, after the quote and an escape.
  assert.deepEqual(locate(["exclude", 1, "why"], 3), { line: 11, column: 15 });
  // Block scalar: value offset 11 ("first line\n" is 11 characters) is the "s" of "second" on the next line.
  assert.deepEqual(locate(["note"], 11), { line: 15, column: 3 });
});

Deno.test("parseOptions() maps positions in CRLF and lone-CR bodies", () => {
  const crlf = optionsOf(`intro\r\n${F}fit f\r\non: t\r\nmodel: y = a*x\r\n${F}\r\n`);
  assert.deepEqual(crlf.errors, []);
  assert.deepEqual(crlf.locate(["model"], 4), { line: 4, column: 12 });
  const cr = optionsOf(`${F}fit f\ron: t\rmodel: y = a*x\r${F}\r`);
  assert.deepEqual(cr.options, { on: "t", model: "y = a*x" });
  assert.deepEqual(cr.locate(["model"]), { line: 3, column: 8 });
});

Deno.test("parseOptions() places a YAML syntax error at its document line and column", () => {
  const src = `# Doc\n\n${F}fit f\non: t\nstart: { q0: 1, a: 2\nmodel: y = x\n${F}\n`;
  const { options, errors } = optionsOf(src);
  assert.deepEqual(options, {});
  assert.equal(errors.length >= 1, true);
  assert.ok(errors[0] instanceof LocatedError);
  assert.match(errors[0].message, /^Options of cell "f" are not valid YAML: /);
  assert.equal(errors[0].pos.line >= 5 && errors[0].pos.line <= 6, true);
  const tab = optionsOf(`${F}fit f\non: t\n\tmodel: x\n${F}\n`).errors[0];
  assert.deepEqual(tab.pos, { line: 3, column: 1 });
});

Deno.test("parseOptions() reports a body that is not a mapping", () => {
  for (const body of ["- a\n- b\n", "just text\n", "42\n"]) {
    const { options, errors } = optionsOf(`x\n${F}fit f\n${body}${F}\n`);
    assert.deepEqual(options, {});
    assert.equal(errors.length, 1);
    assert.equal(errors[0].message, 'Options of cell "f" must be a YAML mapping of key: value');
    assert.deepEqual(errors[0].pos, { line: 3, column: 1 });
  }
});

Deno.test("parseOptions() reports a repeated key at the repeat", () => {
  const { errors } = optionsOf(`${F}fit f\non: t\nmodel: a\non: u\n${F}\n`);
  assert.equal(errors.length, 1);
  assert.ok(errors[0] instanceof LocatedError);
  assert.equal(errors[0].message, 'Options of cell "f" repeat key "on": each key may appear once');
  assert.deepEqual(errors[0].pos, { line: 4, column: 1 });
});

Deno.test("parseOptions() gives {} for an empty or comments-only body", () => {
  for (const body of ["", "\n", "# nothing yet\n"]) {
    const r = optionsOf(`${F}fit f\n${body}${F}\n`);
    assert.deepEqual([r.options, r.errors], [{}, []]);
  }
});

Deno.test("parseOptions() follows anchors and aliases in data and in locate()", () => {
  const src = `${F}fit f\nbase: &b { q0: 1, a: 2 }\nstart: *b\n${F}\n`;
  const { options, locate } = optionsOf(src);
  assert.deepEqual(options.start, { q0: 1, a: 2 });
  assert.deepEqual(locate(["start", "a"]), { line: 2, column: 22 });
});
