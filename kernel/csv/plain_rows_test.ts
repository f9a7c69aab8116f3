/**
 * The reader's fast lane for plain records (`_plain_rows.ts`) and the
 * sizing of columns from a line-feed count (`line_feeds.ts`): whatever mix of
 * plain and other records a file has, every value, correction, missing count
 * and message is the general scanner's.
 *
 * @module
 */
import assert from "node:assert/strict";
import { mulberry32Uint } from "../random.ts";
import { parseDecimal } from "./decimal_parser.ts";
import { DelimitedError } from "./delimited_error.ts";
import { countLineFeeds, recordBound } from "./line_feeds.ts";
import { type NumberData, readDelimited } from "./read_delimited.ts";

const enc = new TextEncoder();

/** Fields a record may hold: plain numbers, markers, and what only the scanner reads. */
const FIELDS = [
  "1",
  "-2.5",
  "+7",
  "0.30000000000000004", // 17 digits: DecimalParser's slow path, inside the lane
  "12345678901234567890",
  "123456789012345678901.5e-3",
  "1234567890.12345678",
  "000000000000000000012",
  "123456789.012345", // 15 digits: the last on the fast path
  "1234567890123456", // 16: DecimalParser's
  "9007199254740993",
  "5.e3",
  "1e400",
  "-0",
  ".5",
  "5.",
  "4.5e-22",
  "1E+05",
  "6.02214076e23",
  "",
  "NA",
  "NaN",
  " 3.25",
  "2.5 ",
  '"8.5"',
  "1e-330",
];

function randomFile(next: () => number, rows: number): { text: string; fields: string[][] } {
  const fields: string[][] = [];
  const lines = ["a,b,c"];
  for (let r = 0; r < rows; r++) {
    const plain = next() % 4 !== 0;
    const row = Array.from(
      { length: 3 },
      () =>
        plain ? String((next() % 2_000_000) / 10 ** (next() % 7)) : FIELDS[next() % FIELDS.length],
    );
    fields.push(row);
    lines.push(row.join(","));
    if (next() % 20 === 0) lines.push(""); // a blank line: not a record
  }
  const eol = ["\n", "\r\n"][next() % 2];
  return { text: lines.join(eol) + (next() % 2 ? eol : ""), fields };
}

/** A field's number as the general parser reads it (quotes and spaces aside), or NaN. */
function expected(field: string): [number, number] {
  const bare = field.replaceAll('"', "").trim();
  return bare === "" || bare === "NA" || bare === "NaN" ? [NaN, 0] : parseDecimal(bare);
}

Deno.test("readDelimited() reads plain and other records alike: values and corrections are DecimalParser's", () => {
  // Source: DecimalParser (correctly rounded, as Number(); tested in decimal_parser_test.ts).
  const next = mulberry32Uint(2026);
  for (let k = 0; k < 40; k++) {
    const { text, fields } = randomFile(next, 1 + (next() % 300));
    const d = readDelimited(enc.encode(text));
    assert.equal(d.rowCount, fields.length);
    d.columns.forEach((c, j) => {
      const col = c as NumberData;
      assert.equal(col.type, "number");
      let missing = 0;
      fields.forEach((row, r) => {
        const [hi, lo] = expected(row[j]);
        if (Number.isNaN(hi)) missing++;
        if (!Object.is(col.values[r], hi)) {
          assert.fail(`${JSON.stringify(row[j])}: ${col.values[r]}`);
        }
        if (col.lo !== null && !Number.isNaN(hi) && !Object.is(col.lo[r], lo)) {
          assert.fail(`${JSON.stringify(row[j])}: lo ${col.lo[r]}, want ${lo}`);
        }
      });
      assert.equal(col.missing, missing);
    });
  }
});

Deno.test("readDelimited() sizes number columns to the rows exactly, without spare room", () => {
  // Exact arithmetic: 8 bytes a double, one per row.
  for (
    const text of ["x\n1\n2\n3\n", "x\n1\n2\n3", "x\r\n1\r\n2\r\n3\r\n\r\n\r\n", "x\n1\n\n2\n3\n"]
  ) {
    const d = readDelimited(enc.encode(text));
    const x = d.columns[0] as NumberData;
    assert.equal(d.rowCount, 3, JSON.stringify(text));
    assert.deepEqual(Array.from(x.values), [1, 2, 3]);
    assert.equal(x.values.buffer.byteLength, 24, JSON.stringify(text));
    assert.equal(x.lo!.buffer.byteLength, 24, JSON.stringify(text));
  }
});

Deno.test("readDelimited() keeps corrections when blank lines made the row bound look too large", () => {
  // loLimit 4 over one column: corrections are kept below 4 rows (read_delimited.ts).
  const spaced = readDelimited(enc.encode("x\n0.1\n\n\n\n\n0.2\n"), { loLimit: 4 });
  const tight = readDelimited(enc.encode("x\n0.1\n0.2\n"), { loLimit: 4 });
  assert.deepEqual((spaced.columns[0] as NumberData).lo, (tight.columns[0] as NumberData).lo);
  assert.notEqual((spaced.columns[0] as NumberData).lo, null);
  // Lone CRs among line feeds (one inside quotes): more rows than line feeds, read by growing.
  const cr = readDelimited(enc.encode('x,y\r1,"a\nb"\r2,c\r3,d\r4,e\r'), { loLimit: 4 });
  assert.equal(cr.rowCount, 4);
  assert.deepEqual(Array.from((cr.columns[0] as NumberData).values), [1, 2, 3, 4]);
  assert.equal((cr.columns[0] as NumberData).lo, null, "4 rows × 1 column is not below 4");
});

Deno.test("readDelimited() gives the scanner's message for a bad record between plain ones", () => {
  const rows = Array.from({ length: 100 }, (_, i) => `${i},${i / 4}`);
  rows[70] = "70,35,1";
  assert.throws(
    () => readDelimited(enc.encode("a,b\n" + rows.join("\n") + "\n")),
    (e: unknown) =>
      e instanceof DelimitedError && e.row === 71 &&
      e.message === `File "input": row 71 has 3 fields, expected 2 as in the header`,
  );
  rows[70] = "70,3x5";
  assert.throws(
    () => readDelimited(enc.encode("a,b\n" + rows.join("\n") + "\n")),
    (e: unknown) =>
      e instanceof DelimitedError &&
      e.message.startsWith(`Column "b" is mostly numbers but row 71 has "3x5"`),
  );
});

Deno.test("readDelimited() reports progress through the fast lane, rising to 1", () => {
  const text = "x\n" + Array.from({ length: 200_000 }, (_, i) => String(i)).join("\n") + "\n";
  const seen: number[] = [];
  readDelimited(enc.encode(text), { onProgress: (f) => seen.push(f) });
  assert.ok(seen.length >= 3, `only ${seen.length} reports`);
  assert.ok(seen.every((f, i) => i === 0 || f >= seen[i - 1]));
  assert.equal(seen.at(-1), 1);
});

Deno.test("countLineFeeds() counts as a byte loop does, at every alignment and in shared memory", () => {
  // Source: the byte-by-byte count.
  const next = mulberry32Uint(5);
  const shared = new Uint8Array(new SharedArrayBuffer(600));
  for (let i = 0; i < shared.length; i++) shared[i] = [10, 13, 44, 48, 0x8a, 0x0a][next() % 6];
  const plain = shared.slice();
  for (const bytes of [shared, plain, plain.subarray(3), shared.subarray(1, 599)]) {
    for (let start = 0; start < 9; start++) {
      for (const end of [bytes.length, bytes.length - 1, bytes.length - 5, start, start + 3]) {
        let want = 0;
        for (let i = start; i < end; i++) if (bytes[i] === 10) want++;
        assert.equal(countLineFeeds(bytes, start, end), want, `${start}…${end}`);
      }
    }
  }
  assert.equal(recordBound(enc.encode("x\n1\n2\n\n\n"), 2), 2);
  assert.equal(recordBound(enc.encode("x\r1\r2\r"), 2), 2);
  assert.equal(recordBound(enc.encode("x\n\n"), 2), 0);
});
