/**
 * Reading in halves (`_halves.ts`): whatever the second half holds, or
 * wherever the cut falls, the result is that of reading in one.
 *
 * @module
 */
import assert from "node:assert/strict";
import { mulberry32Uint } from "../random.ts";
import { DelimitedError } from "./delimited_error.ts";
import { cutInHalves, halvesForTests, releaseCut, stopHalvesHelper } from "./_halves.ts";
import { countLineFeeds, recordBound, recordsEnd } from "./line_feeds.ts";
import { type DelimitedData, readDelimited, type ReadDelimitedOptions } from "./read_delimited.ts";

const enc = new TextEncoder();

function plainRows(rows: number, seed: number): string[] {
  const next = mulberry32Uint(seed);
  return Array.from(
    { length: rows },
    (_, i) => `${i},${(next() % 2_000_000) / 1000},${-(next() % 99_999) / 10 ** (next() % 6)}`,
  );
}

/** Both reads agree: rows, every value bit for bit, missing counts, shared columns in halves. */
function sameAsInOne(text: string, options: ReadDelimitedOptions = {}): DelimitedData {
  options = { loLimit: 0, ...options }; // a file read in halves keeps no corrections
  const bytes = enc.encode(text);
  const one = readDelimited(bytes, options);
  const two = readDelimited(bytes, { ...options, halvesFrom: 0 });
  assert.equal(two.rowCount, one.rowCount);
  two.columns.forEach((c, j) => {
    const a = c.values as Float64Array, b = one.columns[j].values as Float64Array;
    assert.equal(a.length, b.length);
    for (let i = 0; i < a.length; i++) {
      if (!Object.is(a[i], b[i])) assert.fail(`column ${c.name} row ${i + 1}: ${a[i]} vs ${b[i]}`);
    }
    assert.equal(c.missing, one.columns[j].missing);
  });
  return two;
}

Deno.test({
  name: "readDelimited() in halves gives what it gives in one, for plain and awkward second halves",
  sanitizeResources: false, // the helper thread is kept for later reads; stopped at the end
  fn() {
    halvesForTests.waitForHelper = true;
    const taken = halvesForTests.taken;
    try {
      const rows = plainRows(20_000, 3);
      const header = "i,x,y\n";
      const plain = sameAsInOne(header + rows.join("\n") + "\n");
      const x = plain.columns[1].values as Float64Array;
      assert.ok(x.buffer instanceof SharedArrayBuffer, "read in halves");
      assert.equal(halvesForTests.taken, taken + 1, "the helper's rows were taken");
      // The second half with a quoted number, a 17-digit number, a marker and a stray value.
      const awkward = [...rows];
      awkward[15_000] = `15000,"2.5",1`;
      awkward[16_000] = "16000,0.30000000000000004,NA";
      awkward[17_000] = "17000,,7";
      sameAsInOne(header + awkward.join("\n") + "\n");
      // A blank line and a quoted line break in the first half: the helper's rows are not taken.
      const blank = [...rows];
      blank[100] = "100,1,2\n";
      sameAsInOne(header + blank.join("\n") + "\n");
      const quoted = [...rows];
      quoted[200] = `200,1,"3"`;
      sameAsInOne('i,x,"y\nz"\n' + quoted.join("\n")); // no final line feed either
      // CRLF line ends; a text column.
      sameAsInOne(header + rows.slice(0, 500).join("\r\n") + "\r\n");
      sameAsInOne("i,t,y\n" + rows.map((r, k) => r.replace(/,.*,/, `,t${k % 7},`)).join("\n"));
    } finally {
      halvesForTests.waitForHelper = false;
      stopHalvesHelper();
    }
  },
});

Deno.test({
  name: "readDelimited() in halves names the row of a bad record in either half",
  sanitizeResources: false,
  fn() {
    halvesForTests.waitForHelper = true;
    try {
      const rows = plainRows(20_000, 4);
      for (const at of [3_000, 17_000]) {
        const bad = [...rows];
        bad[at] = `${at},1`;
        assert.throws(
          () =>
            readDelimited(enc.encode("i,x,y\n" + bad.join("\n") + "\n"), {
              halvesFrom: 0,
              loLimit: 0,
            }),
          (e: unknown) =>
            e instanceof DelimitedError && e.row === at + 1 &&
            e.message === `File "input": row ${at + 1} has 2 fields, expected 3 as in the header`,
        );
      }
    } finally {
      halvesForTests.waitForHelper = false;
      stopHalvesHelper();
    }
  },
});

Deno.test({
  name: "cutInHalves() counts both sides' line feeds as recordBound does, helper or not",
  sanitizeResources: false,
  fn() {
    const rows = plainRows(5_000, 5);
    // Exact: the two sides' line feeds add up to recordBound's count (exact counting, no source).
    for (const tail of ["\n", "\n\n\r\n", ""]) {
      const bytes = enc.encode("i,x,y\n" + rows.join("\n") + tail);
      const dataStart = 6;
      for (const wait of [true, false]) {
        halvesForTests.waitForHelper = wait;
        try {
          const cut = cutInHalves(bytes, dataStart, recordsEnd(bytes));
          assert.ok(cut !== null);
          assert.equal(cut.feeds + 1, recordBound(bytes, dataStart));
          assert.equal(cut.firstRows, countLineFeeds(bytes, dataStart, cut.mid));
          assert.equal(bytes[cut.mid - 1], 0x0a, "cut after a line feed");
          if (wait) assert.ok(cut.helper !== null, "the helper counted the second half");
          releaseCut(cut);
          releaseCut(cut); // twice: nothing more happens
        } finally {
          halvesForTests.waitForHelper = false;
          stopHalvesHelper();
        }
      }
    }
    // A file whose second half is only line ends is not cut.
    const short = enc.encode("i,x,y\n1,2,3\n" + "\n".repeat(40));
    assert.equal(cutInHalves(short, 6, recordsEnd(short)), null);
  },
});
