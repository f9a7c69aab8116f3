import { tablePage } from "./view.tsx";
import assert from "node:assert/strict";
import { renderToString } from "preact-render-to-string";
import { CellError } from "../../kernel/errors.ts";
import type { NumberColumn, TextColumn } from "../../kernel/contract/mod.ts";
import { tableKind, type TableOutput } from "./mod.ts";
import { parseCtx, runCtx } from "./_testing.ts";

const FADE = "cycle,capacity,site\n1,2500.5,A\n2,2498.1,A\n3,2496.0,B\n4,NA,B\n5,2491.7,A\n";

async function run(
  options: Record<string, unknown>,
  files: Record<string, string | Uint8Array> = {},
  settings = {},
) {
  const spec = tableKind.parse(parseCtx(options));
  const ctx = runCtx(files, settings);
  const out = await tableKind.run(spec, ctx);
  return { spec, out, ctx, result: tableKind.summary(out, spec) };
}

async function runFails(
  options: Record<string, unknown>,
  files: Record<string, string | Uint8Array>,
  message: string | RegExp,
  path: unknown[],
  offset?: number,
  settings = {},
) {
  let caught: unknown;
  try {
    await run(options, files, settings);
  } catch (e) {
    caught = e;
  }
  assert.ok(caught instanceof CellError, `expected CellError, got ${caught}`);
  if (typeof message === "string") assert.equal(caught.message, message);
  else assert.match(caught.message, message);
  assert.deepEqual(caught.path, path);
  if (offset !== undefined) assert.equal(caught.offset, offset);
}

const col = (out: TableOutput, name: string) => out.columns.find((c) => c.name === name)!;

Deno.test("tableKind.run() reads a file with units and exclusions into the RUN-JSON shape", async () => {
  const { out, result } = await run(
    {
      from: "d.csv",
      units: { capacity: "mAh" },
      exclude: [{ rows: [2], why: "probe came loose" }],
    },
    { "d.csv": FADE },
  );
  assert.deepEqual(Array.from(out.rows), [1, 3, 4, 5]);
  assert.deepEqual(result, {
    rows_read: 5,
    rows_used: 4,
    excluded: [{ row: 2, why: "probe came loose" }],
    columns: [
      { name: "cycle", type: "number", unit: null, missing: 0 },
      { name: "capacity", type: "number", unit: "mAh", missing: 1 },
      { name: "site", type: "text", unit: null, missing: 0 },
    ],
    sha256: "sha-of-d.csv",
    source: "d.csv",
    rows_filtered: 0,
    // Row 4 carries the missing capacity ("NA") and is kept.
    rows_missing: [4],
  });
  assert.deepEqual(Array.from((col(out, "capacity") as NumberColumn).values).map(String), [
    "2500.5",
    "2496",
    "NaN",
    "2491.7",
  ]);
  assert.deepEqual((col(out, "site") as TextColumn).values, ["A", "B", "B", "A"]);
  assert.equal(tableKind.line(result), "4 of 5 rows · 3 columns · 1 excluded · 1 missing");
});

Deno.test("tableKind.run() keeps decimal corrections of the kept rows", async () => {
  const { out } = await run({ from: "d.csv", exclude: [{ rows: [1], why: "warm-up" }] }, {
    "d.csv": "x\n0.5\n0.1\n",
  });
  const x = col(out, "x") as NumberColumn;
  assert.equal(x.values[0], 0.1);
  // The double 0.1 exceeds 1/10 by about 5.55e-18 (IEEE 754 binary64; common practice, no source).
  assert.ok(x.lo !== null && x.lo[0] < -5.5e-18 && x.lo[0] > -5.6e-18);
});

Deno.test("tableKind.run() refuses an excluded row beyond the data, pointing at the entry", async () => {
  await runFails(
    { from: "d.csv", exclude: [{ rows: [2], why: "a" }, { rows: [4, 9], why: "b" }] },
    { "d.csv": FADE },
    `Row 9 cannot be excluded: the table has 5 rows`,
    ["exclude", 1, "rows", 1],
  );
});

Deno.test("tableKind.run() refuses units of unknown columns with a suggestion", async () => {
  await runFails(
    { from: "d.csv", units: { capcity: "mAh" } },
    { "d.csv": FADE },
    `Column "capcity" in units is not in the table: did you mean "capacity"?`,
    ["units", "capcity"],
  );
});

Deno.test("tableKind.run() rechecks the file size against max_file_size", async () => {
  await runFails(
    { from: "big.csv" },
    { "big.csv": new Uint8Array(2_500_000) },
    `File "big.csv" is 2.4 MiB, over the limit of 1.9 MiB (set max_file_size in the front matter to raise it)`,
    ["from"],
    undefined,
    { maxFileBytes: 2_000_000 },
  );
});

Deno.test("tableKind.run() places data errors on from with row, column and value", async () => {
  await runFails(
    { from: "d.csv" },
    { "d.csv": "a,b\n1,2\n3\n" },
    `File "d.csv": row 2 has 1 field, expected 2 as in the header`,
    ["from"],
  );
  const rows = Array.from({ length: 12 }, (_, i) => `${i + 1},${i}.5`);
  rows[10] = "11,1O.5";
  await runFails(
    { from: "d.csv" },
    { "d.csv": "cycle,capacity\n" + rows.join("\n") },
    `Column "capacity" is mostly numbers but row 11 has "1O.5": correct the value, list it under missing, ` +
      `or declare types: { capacity: text }`,
    ["from"],
  );
  await runFails(
    { from: "d.csv", types: { site: "number" } },
    { "d.csv": FADE },
    /^Column "site" is declared number but row 1 has "A"/,
    ["types", "site"],
  );
  await runFails(
    { from: "d.csv" },
    { "d.csv": "" },
    `File "d.csv" is empty: expected a header row of column names`,
    [
      "from",
    ],
  );
});

Deno.test("tableKind.run() reads semicolons with a decimal comma", async () => {
  const { out } = await run({ from: "d.csv", decimal: "comma" }, {
    "d.csv": "t;U\n1;0,25\n2;1,5\n",
  });
  assert.deepEqual(Array.from((col(out, "U") as NumberColumn).values), [0.25, 1.5]);
});

Deno.test("tableKind.run() reads inline rows like a file, with NA and empty values missing", async () => {
  const { out, result } = await run({
    columns: ["dose", "response", "lab"],
    rows: [[0, 0.12, "north"], [1.5, null, "south"], [3, "NA", "north"], [4.5, 0.98, null]],
    units: { dose: "mg/L" },
  });
  assert.equal(result.sha256, null);
  assert.equal(result.source, null);
  const r = col(out, "response") as NumberColumn;
  assert.equal(r.type, "number");
  assert.equal(r.missing, 2);
  assert.deepEqual((col(out, "lab") as TextColumn).values, ["north", "south", "north", null]);
  // 0.12 has ≤ 15 significant digits, so its shortest round-trip form is the decimal as written.
  assert.ok(r.lo !== null && r.lo[0] !== 0);
  assert.equal(tableKind.line(result), "4 rows · 3 columns · 3 missing");
});

Deno.test("tableKind.run() places inline typing errors on the row", async () => {
  const rows: unknown[][] = Array.from({ length: 10 }, (_, i) => [i, i * 2]);
  rows[6][1] = "12x";
  await runFails(
    { columns: ["x", "y"], rows },
    {},
    /^Column "y" is mostly numbers but row 7 has "12x"/,
    ["rows", 6],
  );
});

Deno.test("tableKind.run() derives columns by expression over kept rows", async () => {
  const { out, result, ctx } = await run(
    {
      from: "d.csv",
      derive: { fade: "2500.5 - capacity", lc: "log(fade)" },
      units: { fade: "mAh" },
    },
    { "d.csv": FADE },
  );
  const fade = col(out, "fade") as NumberColumn;
  assert.deepEqual(Array.from(fade.values).map((v) => Number.isNaN(v) ? "NaN" : v.toFixed(1)), [
    "0.0",
    "2.4",
    "4.5",
    "NaN",
    "8.8",
  ]);
  assert.equal(fade.lo, null);
  assert.equal(result.columns[3].unit, "mAh");
  // log(0) is -Infinity in row 1: made missing, with a warning naming the row (row 4 was already missing).
  assert.deepEqual(ctx.warnings, [
    `Derived column "lc" has no finite value in row 1: those rows are missing`,
  ]);
  assert.equal((col(out, "lc") as NumberColumn).missing, 2);
});

Deno.test("tableKind.run() places derive errors at the column name inside the expression", async () => {
  await runFails(
    { from: "d.csv", derive: { f: "2 * capcity" } },
    { "d.csv": FADE },
    `Unknown column "capcity": did you mean "capacity"?`,
    ["derive", "f"],
    4,
  );
  await runFails(
    { from: "d.csv", derive: { f: "cycle + site" } },
    { "d.csv": FADE },
    `Column "site" is text: a derived column can use only number columns`,
    ["derive", "f"],
    8,
  );
  await runFails(
    { from: "d.csv", derive: { cycle: "cycle * 2" } },
    { "d.csv": FADE },
    `Column "cycle" already exists: choose another name for the derived column`,
    ["derive", "cycle"],
  );
});

Deno.test("tableKind.run() filters rows with where, keeping source row numbers", async () => {
  const { out, result } = await run(
    {
      from: "d.csv",
      where: "cycle >= 2 and capacity < 2497",
      exclude: [{ rows: [5], why: "late" }],
    },
    { "d.csv": FADE },
  );
  assert.deepEqual(Array.from(out.rows), [3]);
  assert.equal(result.rows_filtered, 3);
  assert.equal(tableKind.line(result), "1 of 5 rows · 3 columns · 1 excluded · 3 filtered out");
  await runFails(
    { from: "d.csv", where: "cycle > 1 and site == 2" },
    { "d.csv": FADE },
    `Column "site" is text: a filter can compare only number columns`,
    ["where"],
    14,
  );
});

Deno.test("tableKind.run() reads a header-only file as zero rows", async () => {
  const { result } = await run({ from: "d.csv" }, { "d.csv": "cycle,capacity\n" });
  assert.equal(result.rows_read, 0);
  assert.equal(tableKind.line(result), "0 rows · 2 columns");
});

Deno.test("tableKind.view() shows columns with type, unit, missing and exclusions with reasons", async () => {
  const { result } = await run(
    {
      from: "d.csv",
      units: { capacity: "mAh" },
      exclude: [{ rows: [2, 3], why: "probe came loose" }],
    },
    { "d.csv": FADE },
  );
  const html = renderToString(tablePage.view({ name: "cycles", result }));
  assert.match(
    html,
    /<td><code>capacity<\/code><\/td><td>number<\/td><td>mAh<\/td><td class="plumb-num">1<\/td>/,
  );
  assert.match(html, /<strong>Rows 2, 3<\/strong>: probe came loose/);
  assert.match(html, /3 of 5 rows · 3 columns · 2 excluded/);
});
