import assert from "node:assert/strict";
import { LocatedError } from "../errors.ts";
import { cellsOf, parseDocument, parseOptions, readSettings } from "./mod.ts";
import { MAX_KEYS, pastKeyLimit } from "./_key_limit.ts";

const F = "`".repeat(3);

function optionsOf(src: string) {
  const doc = parseDocument(src);
  return parseOptions(cellsOf(doc)[0], doc);
}

const keys = (n: number, indent = "") =>
  Array.from({ length: n }, (_, i) => `${indent}k${i}: ${i}\n`).join("");

Deno.test("parseOptions() refuses 100,000 keys at the key past the bound, in words", () => {
  // Before: 50,000 keys took 23 s in plumb run and 100,000 did not finish in
  // 120 s (the yaml package compared every key with every earlier one).
  const { options, errors } = optionsOf(`${F}fit f\non: t\n${keys(100_000)}${F}\n`);
  assert.deepEqual(options, {});
  assert.equal(errors.length, 1);
  assert.ok(errors[0] instanceof LocatedError);
  assert.equal(
    errors[0].message,
    'Options of cell "f" have more than 10,000 keys: put large data in a file beside the document',
  );
  // Line 1 is the fence, line 2 "on", so key k9999 (the 10,001st) is on line 10,002.
  assert.deepEqual(errors[0].pos, { line: MAX_KEYS + 2, column: 6 });
});

Deno.test("parseOptions() reads 9,000 nested keys and finds a repeat among them", () => {
  const body = `from: t.csv\nunits:\n${keys(9_000, "  ")}  k4500: s\n`;
  const { errors } = optionsOf(`${F}table t\n${body}${F}\n`);
  assert.equal(errors.length, 1);
  assert.equal(
    errors[0].message,
    'Options of cell "t" repeat key "k4500": each key may appear once',
  );
  assert.deepEqual(errors[0].pos, { line: 9_004, column: 3 });
  const fine = optionsOf(`${F}table t\nfrom: t.csv\nunits:\n${keys(9_000, "  ")}${F}\n`);
  assert.deepEqual(fine.errors, []);
  assert.equal(Object.keys(fine.options.units as object).length, 9_000);
});

Deno.test('parseOptions() reports keys the plain data would merge (1 and "1") as repeated', () => {
  const { errors } = optionsOf(`${F}fit f\nstart: { 1: 2, "1": 3 }\n${F}\n`);
  assert.equal(errors.length, 1);
  assert.match(errors[0].message, /repeat key "1"/);
  assert.deepEqual(errors[0].pos, { line: 2, column: 16 });
});

Deno.test("readSettings() refuses front matter of more than 10,000 keys at the key", () => {
  const doc = parseDocument(`---\n${keys(20_000)}---\n`);
  const { errors } = readSettings(doc);
  assert.equal(errors.length, 1);
  assert.equal(
    errors[0].message,
    "Front matter has more than 10,000 keys: it holds a few document settings",
  );
  assert.deepEqual(errors[0].pos, { line: MAX_KEYS + 2, column: 7 });
});

Deno.test("pastKeyLimit() counts block keys, flow keys and quoted flow keys", () => {
  assert.equal(pastKeyLimit('a: 1\nb:\n  - { c: 2, "d":3 }\n', 3), 23);
  assert.equal(pastKeyLimit('a: 1\nb:\n  - { c: 2, "d":3 }\n', 4), -1);
  assert.equal(pastKeyLimit("model: y = a + b*x\n", 0), 5, "the first key's colon");
});
