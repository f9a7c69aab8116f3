import assert from "node:assert/strict";
import { DelimitedError } from "./delimited_error.ts";
import { type DelimitedData, readDelimited, type ReadDelimitedOptions } from "./read_delimited.ts";

const enc = new TextEncoder();
const read = (text: string, options?: ReadDelimitedOptions) =>
  readDelimited(enc.encode(text), options);
const col = (d: DelimitedData, name: string) => d.columns.find((c) => c.name === name)!;
const nums = (d: DelimitedData, name: string) => Array.from(col(d, name).values as Float64Array);

function throwsDelimited(fn: () => unknown, message: string | RegExp): DelimitedError {
  let caught: unknown;
  try {
    fn();
  } catch (e) {
    caught = e;
  }
  assert.ok(caught instanceof DelimitedError, `expected DelimitedError, got ${caught}`);
  if (typeof message === "string") assert.equal(caught.message, message);
  else assert.match(caught.message, message);
  return caught;
}

// RFC 4180 §2 rules 5–7 (quoted fields, embedded delimiters and line breaks, doubled quotes).
Deno.test("readDelimited() reads RFC 4180 quoted fields with delimiters, newlines and doubled quotes", () => {
  const d = read('id,note,v\n1,"a, b",2\n2,"line one\nline two",3\n3,"say ""hi""",4\n4,"",5\n');
  assert.equal(d.rowCount, 4);
  assert.deepEqual(col(d, "note").values, ["a, b", "line one\nline two", 'say "hi"', null]);
  assert.deepEqual(nums(d, "v"), [2, 3, 4, 5]);
  assert.equal(col(d, "note").missing, 1);
});

Deno.test("readDelimited() reads quoted numbers as numbers and quoted header names", () => {
  const d = read('"time (s)","v"\n"1.5","2"\n');
  assert.deepEqual(d.columns.map((c) => [c.name, c.type]), [["time (s)", "number"], [
    "v",
    "number",
  ]]);
  assert.deepEqual(nums(d, "time (s)"), [1.5]);
});

Deno.test("readDelimited() accepts CRLF, lone CR and a missing final line end", () => {
  for (const text of ["a,b\r\n1,2\r\n3,4\r\n", "a,b\r1,2\r3,4", "a,b\n1,2\n3,4"]) {
    const d = read(text);
    assert.equal(d.rowCount, 2, JSON.stringify(text));
    assert.deepEqual(nums(d, "b"), [2, 4]);
  }
});

Deno.test("readDelimited() keeps CRLF inside a quoted field", () => {
  const d = read('a,b\r\n"x\r\ny",1\r\n');
  assert.deepEqual(col(d, "a").values, ["x\r\ny"]);
});

Deno.test("readDelimited() skips a UTF-8 byte order mark and decodes UTF-8 names and text", () => {
  const d = readDelimited(
    new Uint8Array([0xef, 0xbb, 0xbf, ...enc.encode("Temp °C,site\n21.5,Zürich\n")]),
  );
  assert.deepEqual(d.columns.map((c) => c.name), ["Temp °C", "site"]);
  assert.deepEqual(nums(d, "Temp °C"), [21.5]);
  assert.deepEqual(col(d, "site").values, ["Zürich"]);
});

Deno.test("readDelimited() skips blank lines, which are not rows", () => {
  const d = read("a,b\n1,2\n\n3,4\n\n\n");
  assert.equal(d.rowCount, 2);
  assert.deepEqual(nums(d, "a"), [1, 3]);
});

Deno.test("readDelimited() reads semicolons with a decimal comma", () => {
  const d = read("t;U\n0;1,25\n1;-0,5e1\n", { decimal: "," });
  assert.equal(d.delimiter, ";");
  assert.deepEqual(nums(d, "U"), [1.25, -5]);
});

Deno.test("readDelimited() picks a tab for .tsv names and obeys an explicit delimiter", () => {
  assert.deepEqual(nums(read("a\tb\n1\t2\n", { name: "data/run.tsv" }), "b"), [2]);
  assert.deepEqual(nums(read("a;b\n1;2\n", { delimiter: ";" }), "b"), [2]);
  assert.deepEqual(nums(read("a|b\n1|2\n", { delimiter: "|" }), "b"), [2]);
});

Deno.test("readDelimited() refuses a comma delimiter with a decimal comma, and multi-character delimiters", () => {
  const e = throwsDelimited(
    () => read("a,b\n", { decimal: ",", delimiter: "," }),
    `Delimiter "," cannot be used with a decimal comma: use ";" or "\\t" between fields`,
  );
  assert.deepEqual(e.option, ["delimiter"]);
  throwsDelimited(() => read("a,b\n", { delimiter: "::" }), /^Delimiter "::" cannot be used/);
});

Deno.test("readDelimited() treats empty fields, NA and NaN as missing, and obeys a missing list", () => {
  const d = read("x,y,z\n1,,a\nNA,2,NA\nNaN, 3 ,b\n4,5, \n");
  assert.deepEqual(nums(d, "x").map(String), ["1", "NaN", "NaN", "4"]);
  assert.equal(col(d, "x").missing, 2);
  assert.equal(col(d, "y").missing, 1);
  assert.deepEqual(nums(d, "y").slice(2), [3, 5]);
  assert.deepEqual(col(d, "z").values, ["a", null, "b", null]);
  const m = read("x\n1\n-\n-999\n", { missing: ["-", "-999"] });
  assert.equal(col(m, "x").missing, 2);
  assert.equal(col(m, "x").type, "number");
});

Deno.test("readDelimited() names the row and both counts for a ragged row", () => {
  const e = throwsDelimited(
    () => read("a,b,c\n1,2,3\n4,5\n", { name: "data/x.csv" }),
    `File "data/x.csv": row 2 has 2 fields, expected 3 as in the header`,
  );
  assert.equal(e.row, 2);
  throwsDelimited(
    () => read("a,b\n1,2\n3,4,5\n"),
    `File "input": row 2 has 3 fields, expected 2 as in the header`,
  );
});

Deno.test("readDelimited() refuses a mostly numeric column with a stray value, naming row and value", () => {
  const lines = Array.from({ length: 20 }, (_, i) => `${i + 1},${2500 - i}.5`);
  lines[16] = "17,2,5O1";
  const text = "cycle,capacity\n" + lines.join("\n").replace("17,2,5O1", '17,"2,5O1"');
  const e = throwsDelimited(
    () => read(text),
    `Column "capacity" is mostly numbers but row 17 has "2,5O1": correct the value, list it ` +
      `under missing, or declare types: { capacity: text }`,
  );
  assert.equal(e.row, 17);
  assert.equal(e.column, "capacity");
});

Deno.test("readDelimited() types a column with many non-numbers as text", () => {
  const d = read("id,v\nA1,1\n7,2\nB2,3\n");
  assert.equal(col(d, "id").type, "text");
  assert.deepEqual(col(d, "id").values, ["A1", "7", "B2"]);
});

Deno.test("readDelimited() obeys declared types and names row, column and value when a number is not one", () => {
  const d = read("batch,v\n1,2\n2,3\n", { types: { batch: "text" } });
  assert.deepEqual(col(d, "batch").values, ["1", "2"]);
  const e = throwsDelimited(
    () => read("id,v\nA1,1\nB2,x\n", { types: { v: "number" } }),
    `Column "v" is declared number but row 2 has "x": correct the value or list it under missing`,
  );
  assert.deepEqual([e.row, e.column, e.option], [2, "v", ["types", "v"]]);
});

Deno.test("readDelimited() refuses declared types of unknown columns with a suggestion", () => {
  const e = throwsDelimited(
    () => read("cycle,capacity\n1,2\n", { types: { capcity: "number" } }),
    `Column "capcity" is not in the header: did you mean "capacity"?`,
  );
  assert.deepEqual(e.option, ["types", "capcity"]);
});

Deno.test("readDelimited() refuses an empty file and a file holding only a BOM or blank lines", () => {
  const msg = `File "data/x.csv" is empty: expected a header row of column names`;
  throwsDelimited(() => readDelimited(new Uint8Array(0), { name: "data/x.csv" }), msg);
  throwsDelimited(
    () => readDelimited(new Uint8Array([0xef, 0xbb, 0xbf]), { name: "data/x.csv" }),
    msg,
  );
  throwsDelimited(() => read("\n\r\n", { name: "data/x.csv" }), msg);
});

// Regression (fuzz, test/fuzz/fixtures/csv-unlocated-*.json): these errors carried no place.
Deno.test("readDelimited() places an empty file and a bad header name at their byte offset", () => {
  const empty = (bytes: Uint8Array) => throwsDelimited(() => readDelimited(bytes), /is empty/);
  assert.equal(empty(new Uint8Array(0)).offset, 0);
  assert.equal(empty(new Uint8Array([0xef, 0xbb, 0xbf])).offset, 3);
  const unnamed = throwsDelimited(() => read("a, ,c\n1,2,3\n"), /column 2 has no name/);
  assert.deepEqual([unnamed.offset, unnamed.row, unnamed.column], [2, null, null]);
  const repeated = throwsDelimited(() => read("\ufefft,v, t\n1,2,3\n"), /both named "t"/);
  assert.deepEqual([repeated.offset, repeated.column], [7, "t"]);
});

Deno.test("readDelimited() reads a header-only file as zero rows", () => {
  const d = read("cycle,capacity\n");
  assert.equal(d.rowCount, 0);
  assert.deepEqual(d.columns.map((c) => [c.name, c.type, c.values.length]), [
    ["cycle", "number", 0],
    ["capacity", "number", 0],
  ]);
});

Deno.test("readDelimited() refuses empty and repeated header names, naming the positions", () => {
  throwsDelimited(
    () => read("a, ,c\n1,2,3\n"),
    `File "input": column 2 has no name in the header row`,
  );
  throwsDelimited(
    () => read("t,v, t\n1,2,3\n"),
    `File "input": columns 1 and 3 are both named "t" in the header row`,
  );
});

Deno.test("readDelimited() names the bad byte, its row and offset for invalid UTF-8", () => {
  // "Café" saved as Latin-1: 0xE9 followed by ASCII is not UTF-8 (Unicode §3.9, Table 3-7).
  const head = enc.encode("name,v\nok,1\n");
  const bytes = new Uint8Array([...head, 0x43, 0x61, 0x66, 0xe9, 0x2c, 0x32, 0x0a]);
  const e = throwsDelimited(
    () => readDelimited(bytes, { name: "data/x.csv" }),
    `File "data/x.csv" is not valid UTF-8: bad byte 0xE9 at row 2 (byte ${
      head.length + 3
    }); save it as UTF-8`,
  );
  assert.deepEqual([e.row, e.offset], [2, head.length + 3]);
  throwsDelimited(
    () => readDelimited(new Uint8Array([0x61, 0xff, 0x0a, 0x31, 0x0a])),
    `File "input" is not valid UTF-8: bad byte 0xFF in the header (byte 1); save it as UTF-8`,
  );
  // Inside quotes, an overlong encoding (0xC0 0xAF) and a surrogate (0xED 0xA0 0x80).
  for (const bad of [[0xc0, 0xaf], [0xed, 0xa0, 0x80]]) {
    const b = new Uint8Array([...enc.encode('a\n"x'), ...bad, 0x22, 0x0a]);
    throwsDelimited(
      () => readDelimited(b),
      /is not valid UTF-8: bad byte 0x(C0|ED) at row 1 \(byte 4\)/,
    );
  }
});

Deno.test("readDelimited() names the row of an unclosed quote and of text after a closing quote", () => {
  throwsDelimited(
    () => read('a,b\n1,2\n3,"open\n'),
    `File "input" has a quote that is never closed at row 2 (byte 10): a quoted field must end with "`,
  );
  throwsDelimited(
    () => read('a,b\n"x"y,2\n'),
    `File "input" has text after a closing quote at row 1 (byte 7): write a quote inside a quoted field as ""`,
  );
});

Deno.test("readDelimited() keeps decimal corrections for small tables and drops them past loLimit", () => {
  const small = read("x,y\n0.1,1\n0.2,2\n");
  const x = col(small, "x");
  assert.ok(x.type === "number" && x.lo !== null);
  assert.ok(x.lo![0] < 0 && x.lo![0] > -1e-17); // the double 0.1 is above 1/10 (IEEE 754 binary64)
  const big = read("x,y\n0.1,1\n0.2,2\n0.3,3\n", { loLimit: 4 });
  assert.equal((col(big, "x") as { lo: unknown }).lo, null);
});

Deno.test("readDelimited() reads an empty last field after a trailing delimiter", () => {
  const d = read("a,b\n1,\n2,3");
  assert.deepEqual(nums(d, "b").map(String), ["NaN", "3"]);
});

Deno.test("readDelimited() reports progress up to 1", () => {
  const seen: number[] = [];
  read("a\n1\n", { onProgress: (f) => seen.push(f) });
  assert.equal(seen.at(-1), 1);
});

Deno.test("readDelimited() reads numbers as Number() does, bare, quoted or padded with spaces", () => {
  // Number() is correctly rounded (ECMA-262 StringToNumber); common practice, no source.
  let seed = 7;
  const next = () => (seed = (Math.imul(seed, 1103515245) + 12345) >>> 0) / 2 ** 32;
  const texts: string[] = [];
  for (let i = 0; i < 3000; i++) {
    const digits = String(Math.floor(next() * 1e9)) +
      String(Math.floor(next() * 1e9)).slice(0, Math.floor(next() * 9));
    const p = Math.floor(next() * digits.length);
    let t = (next() < 0.3 ? "-" : "") + digits.slice(0, p) + "." + digits.slice(p);
    if (next() < 0.3) t += "e" + Math.floor((next() - 0.5) * 80);
    texts.push(t);
  }
  const wrap = (t: string, i: number) => (i % 3 === 0 ? t : i % 3 === 1 ? `"${t}"` : ` ${t} `);
  const d = read("x\n" + texts.map(wrap).join("\n") + "\n");
  const x = col(d, "x");
  assert.equal(x.type, "number");
  texts.forEach((t, i) => {
    if (!Object.is((x.values as Float64Array)[i], Number(t))) {
      assert.fail(`"${t}" read as ${x.values[i]}`);
    }
  });
});

Deno.test("readDelimited() falls back from a number prefix to text: 12abc, 1e, 3.5.1", () => {
  const d = read("a,b\n12abc,1\n1e,2\n3.5.1,3\n");
  assert.deepEqual(col(d, "a").values, ["12abc", "1e", "3.5.1"]);
  const m = read("a\n1\n-999\n", { missing: ["-999"] });
  assert.equal(col(m, "a").missing, 1, "a numeric marker still wins over the fused number path");
});
