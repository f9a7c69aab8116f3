/**
 * The fast lane in WebAssembly (`_plain_wasm.ts`, `plain_lane.wat`): its
 * committed bytes are what its text assembles to, and whatever a file holds,
 * a read through it gives what the JavaScript lane alone gives (rows, every
 * value bit for bit, missing counts, messages), in one thread or in halves.
 *
 * @module
 */
import assert from "node:assert/strict";
import { mulberry32Uint } from "../random.ts";
import { buildWasm, SOURCES } from "../wasm/build.ts";
import { PLAIN_LANE_WASM } from "./_plain_lane_bytes.ts";
import { laneForTests, wasmTaken } from "./_plain_wasm.ts";
import { halvesForTests, stopHalvesHelper } from "./_halves.ts";
import { type DelimitedData, readDelimited, type ReadDelimitedOptions } from "./read_delimited.ts";

const enc = new TextEncoder();

Deno.test("_plain_lane_bytes.ts is what plain_lane.wat assembles to", async () => {
  const source = SOURCES.find((s) => s.name === "PLAIN_LANE_WASM")!;
  assert.equal(
    await buildWasm(source.wat),
    PLAIN_LANE_WASM,
    "run kernel/wasm/build.ts after editing",
  );
});

/** Fields for the module's every turn: what it reads, and what it leaves to the JavaScript lane. */
const FIELDS = [
  "1",
  "-2.5",
  "+7",
  "-0",
  ".5",
  "5.",
  "0.000123456789",
  "123456789012345", // 15 digits: the module's last
  "1234567890123456", // 16: the JavaScript lane's
  "0.30000000000000004",
  "12345678.87654321",
  "4.5e-22",
  "1E+05",
  "6.02214076e23", // k = 23 − 8 = 15: taken
  "1e23", // k = 23: the JavaScript lane's
  "1e-22",
  "2.5e00001", // five exponent digits: the JavaScript lane's
  "1e",
  "1.2.3",
  "-",
  ".",
  "",
  "NA",
  "NaN",
  " 3.25",
  '"8.5"',
  "x7",
  "7x",
  "é",
];

/** A %.10g-like number, as the benchmark's data prints them. */
function plainNumber(next: () => number): string {
  const digits = String(1_000_000_000 + (next() % 9_000_000_000)).slice(0, 1 + (next() % 10));
  const point = next() % (digits.length + 1);
  const sign = next() % 2 ? "-" : "";
  const body = point === digits.length
    ? digits
    : `${digits.slice(0, point) || "0"}.${digits.slice(point)}`;
  return next() % 9 === 0 ? `${sign}${digits[0]}.${digits.slice(1)}e-0${next() % 10}` : sign + body;
}

function randomFile(next: () => number, rows: number, ncols: number): string {
  const lines = [Array.from({ length: ncols }, (_, c) => `c${c}`).join(",")];
  for (let r = 0; r < rows; r++) {
    const odd = next() % 8 === 0;
    lines.push(
      Array.from(
        { length: ncols },
        () => odd && next() % 3 === 0 ? FIELDS[next() % FIELDS.length] : plainNumber(next),
      ).join(","),
    );
    if (next() % 40 === 0) lines.push(""); // a blank line
    if (next() % 60 === 0) lines.push(lines[1].split(",").slice(1).join(",")); // a field short
  }
  const eol = ["\n", "\r\n", "\n"][next() % 3];
  return lines.join(eol) + (next() % 4 ? eol : "");
}

/** The read, or its error's message. */
function read(bytes: Uint8Array, options: ReadDelimitedOptions): DelimitedData | string {
  try {
    return readDelimited(bytes, options);
  } catch (e) {
    return (e as Error).message;
  }
}

/** Records the module read in this thread, over every {@link agree}. */
let taken = 0;

/** Reads with and without the module; asserts they agree (exact: the JavaScript lane is the reference). */
function agree(bytes: Uint8Array, options: ReadDelimitedOptions = {}): DelimitedData | string {
  options = { loLimit: 0, ...options }; // the module keeps no decimal corrections
  const was = { ...laneForTests };
  try {
    laneForTests.wasm = false;
    const js = read(bytes, options);
    laneForTests.wasm = true;
    laneForTests.wasmFrom = 0;
    const before = wasmTaken();
    const wasm = read(bytes, options);
    taken += wasmTaken() - before;
    if (typeof js === "string" || typeof wasm === "string") {
      assert.equal(wasm, js);
      return wasm;
    }
    assert.equal(wasm.rowCount, js.rowCount);
    wasm.columns.forEach((c, j) => {
      const o = js.columns[j];
      assert.equal(c.type, o.type, c.name);
      assert.equal(c.missing, o.missing, c.name);
      for (let i = 0; i < c.values.length; i++) {
        if (!Object.is(c.values[i], o.values[i])) {
          assert.fail(`column ${c.name} row ${i + 1}: ${c.values[i]}, want ${o.values[i]}`);
        }
      }
    });
    return wasm;
  } finally {
    Object.assign(laneForTests, was);
  }
}

Deno.test("the WebAssembly lane reads what the JavaScript lane reads, record for record", () => {
  const next = mulberry32Uint(20261205);
  let errors = 0;
  for (let k = 0; k < 60; k++) {
    const ncols = 1 + (next() % 6);
    const text = randomFile(next, 1 + (next() % 400), ncols);
    if (typeof agree(enc.encode(text)) === "string") errors++;
  }
  assert.ok(errors > 0 && errors < 60, `${errors} of 60 files refused: both kinds are wanted`);
  assert.ok(taken > 2000, `the module read only ${taken} records`);
});

Deno.test("the WebAssembly lane agrees on plain files, declared text columns, a decimal comma", () => {
  const next = mulberry32Uint(7);
  const rows = Array.from({ length: 3000 }, () => [0, 1, 2].map(() => plainNumber(next)));
  const before = taken;
  const plain = agree(enc.encode("a,b,c\n" + rows.map((r) => r.join(",")).join("\n") + "\n"));
  assert.ok(typeof plain !== "string" && plain.rowCount === 3000);
  assert.equal(taken - before, 3000, "every record through the module");
  // Exact: "0.1" is the double nearest 1/10 (ECMAScript's Number(), correctly rounded).
  const tenth = agree(enc.encode("a,b\n0.1,-0\n"));
  assert.ok(typeof tenth !== "string");
  assert.equal(tenth.columns[0].values[0], 0.1);
  assert.ok(Object.is(tenth.columns[1].values[0], -0), "-0 stays negative zero");
  // A declared text column between numbers: skipped by the module, read by the scanner.
  const named = rows.map((r, i) => `${r[0]},site ${i % 5},${r[2]}`).join("\n");
  const withText = agree(enc.encode("a,t,c\n" + named + "\n"), { types: { t: "text" } });
  assert.ok(typeof withText !== "string" && withText.columns[1].type === "text");
  const comma = rows.map((r) => r.map((x) => x.replace(".", ",")).join(";")).join("\n");
  agree(enc.encode("a;b;c\n" + comma + "\n"), { delimiter: ";", decimal: "," });
});

Deno.test("the WebAssembly lane hands over a record longer than its block, and reads on", () => {
  const long = "1" + "0".repeat(1_200_000); // 1.2 MB of digits: one number, 10^1200000
  const rows = [
    "1,2",
    `3,${long}`,
    "5,6",
    ...Array.from({ length: 500 }, (_, i) => `${i},${i / 8}`),
  ];
  const d = agree(enc.encode("a,b\n" + rows.join("\n") + "\n"));
  assert.ok(typeof d !== "string" && d.rowCount === rows.length);
  assert.equal(d.columns[1].values[1], Infinity); // 10^1200000 overflows (IEEE 754, round to nearest)
});

Deno.test({
  name: "the WebAssembly lane agrees in halves, the helper thread reading through it too",
  sanitizeResources: false,
  fn() {
    halvesForTests.waitForHelper = true;
    const taken = halvesForTests.taken;
    try {
      const next = mulberry32Uint(11);
      const rows = Array.from({ length: 20_000 }, () => [0, 1, 2].map(() => plainNumber(next)));
      const text = "a,b,c\n" + rows.map((r) => r.join(",")).join("\n") + "\n";
      agree(enc.encode(text), { halvesFrom: 0 });
      assert.equal(halvesForTests.taken, taken + 2, "the helper's rows were taken, both times");
      const odd = [...rows.map((r) => r.join(","))];
      odd[15_000] = "NA,,1";
      odd[16_000] = "1e23,2,3";
      odd[17_000] = "";
      agree(enc.encode("a,b,c\n" + odd.join("\n") + "\n"), { halvesFrom: 0 });
    } finally {
      halvesForTests.waitForHelper = false;
      stopHalvesHelper();
    }
  },
});
