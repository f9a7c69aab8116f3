import assert from "node:assert/strict";
import { makeNumericCsv } from "./make_numeric_csv.ts";
import { readDelimited } from "./read_delimited.ts";

Deno.test("readDelimited() loads a 200 MB numeric file into Float64Array columns", () => {
  // Generated in memory (seeded), about 92 bytes per row of 11 columns.
  const rows = 2_200_000;
  const bytes = makeNumericCsv(rows, 11, 4);
  assert.ok(bytes.length >= 200e6, `generated only ${bytes.length} bytes`);
  const data = readDelimited(bytes, { name: "big.csv" });
  assert.equal(data.rowCount, rows);
  assert.equal(data.columns.length, 11);
  for (const c of data.columns) {
    assert.equal(c.type, "number");
    assert.ok(c.values instanceof Float64Array && c.values.length === rows);
    assert.equal(c.missing, 0);
    // rows × 11 columns is over the 4,000,000 limit: no corrections kept.
    assert.equal((c as { lo: unknown }).lo, null);
  }
  const index = data.columns[0].values as Float64Array;
  for (let i = 0; i < rows; i++) {
    if (index[i] !== i + 1) assert.fail(`row ${i + 1}: c0 is ${index[i]}`);
  }
  for (const c of data.columns) {
    const v = c.values as Float64Array;
    for (let i = 0; i < rows; i++) {
      if (!Number.isFinite(v[i])) assert.fail(`${c.name} row ${i + 1}: ${v[i]}`);
    }
  }
});

Deno.test("makeNumericCsv() is deterministic for a seed and parses back to Number() of each field", () => {
  const a = makeNumericCsv(500, 6, 99), b = makeNumericCsv(500, 6, 99);
  assert.deepEqual(a, b);
  assert.notDeepEqual(a, makeNumericCsv(500, 6, 100));
  const text = new TextDecoder().decode(a);
  const lines = text.trimEnd().split("\n").slice(1);
  const data = readDelimited(a);
  lines.forEach((line, r) => {
    line.split(",").forEach((field, c) => {
      const v = (data.columns[c].values as Float64Array)[r];
      if (!Object.is(v, Number(field))) {
        assert.fail(`row ${r + 1} col ${c}: "${field}" read as ${v}`);
      }
    });
  });
});
