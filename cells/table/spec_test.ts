import assert from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { tableKind } from "./mod.ts";
import { parseCtx } from "./_testing.ts";

function parseFails(
  options: Record<string, unknown>,
  message: string | RegExp,
  path: unknown[],
  offset?: number,
) {
  let caught: unknown;
  try {
    tableKind.parse(parseCtx(options));
  } catch (e) {
    caught = e;
  }
  assert.ok(caught instanceof CellError, `expected CellError, got ${caught}`);
  if (typeof message === "string") assert.equal(caught.message, message);
  else assert.match(caught.message, message);
  assert.deepEqual(caught.path, path);
  if (offset !== undefined) assert.equal(caught.offset, offset);
}

Deno.test("tableKind.parse() normalises a file table and declares the file", () => {
  const spec = tableKind.parse(parseCtx({
    from: "data/b7.csv",
    units: { cycle: "cycles" },
    exclude: [{ rows: [41, 42], why: " probe came loose " }, { rows: 7, why: "typo" }],
    missing: ["-", -999],
    types: { batch: "text" },
  }));
  assert.equal(spec.from, "data/b7.csv");
  assert.deepEqual(spec.exclude, [{ rows: [41, 42], why: "probe came loose" }, {
    rows: [7],
    why: "typo",
  }]);
  assert.deepEqual(spec.missing, ["-", "-999"]);
  assert.deepEqual(tableKind.files!(spec), [{ path: "data/b7.csv", option: ["from"] }]);
  assert.deepEqual(tableKind.inputs(spec), []);
  assert.deepEqual(JSON.parse(JSON.stringify(spec)), spec, "spec is plain JSON");
});

Deno.test("tableKind.parse() refuses an unknown option with a suggestion", () => {
  parseFails({ form: "a.csv" }, `Unknown option "form" in table "t": did you mean "from"?`, [
    "form",
  ]);
});

Deno.test("tableKind.parse() refuses absolute paths and paths escaping the document folder", () => {
  const msg = (p: string) =>
    `File "${p}" is outside the document's folder: data files must sit beside the document or below it`;
  parseFails({ from: "/etc/passwd" }, msg("/etc/passwd"), ["from"]);
  parseFails({ from: "../x.csv" }, msg("../x.csv"), ["from"]);
  parseFails({ from: "data/../../x.csv" }, msg("data/../../x.csv"), ["from"]);
  parseFails({ from: "C:\\data\\x.csv" }, msg("C:\\data\\x.csv"), ["from"]);
  assert.equal(tableKind.parse(parseCtx({ from: "data/../x.csv" })).from, "data/../x.csv");
});

Deno.test("tableKind.parse() needs exactly one of from and rows", () => {
  parseFails(
    {},
    `Table "t" needs data: name a file with from, give columns and rows inline, or query a database`,
    [],
  );
  parseFails(
    { from: "a.csv", columns: ["x"], rows: [[1]] },
    `Table "t" has both from and rows: read a file or give rows inline, not both`,
    ["rows"],
  );
  parseFails(
    { columns: ["x"], rows: [[1]], decimal: "comma" },
    `Option "decimal" applies to files: inline rows need none`,
    [
      "decimal",
    ],
  );
});

Deno.test("tableKind.parse() requires a non-empty why for every exclusion", () => {
  parseFails(
    { from: "a.csv", exclude: [{ rows: [3] }] },
    `Exclusion 1 needs a reason: write why the rows are left out`,
    [
      "exclude",
      0,
    ],
  );
  parseFails(
    { from: "a.csv", exclude: [{ rows: [3], why: "ok" }, { rows: [4], why: "  " }] },
    `Exclusion 2 needs a reason: write why the rows are left out`,
    ["exclude", 1, "why"],
  );
});

Deno.test("tableKind.parse() refuses bad exclusion rows, naming the entry", () => {
  parseFails(
    { from: "a.csv", exclude: [{ rows: [3, 0], why: "x" }] },
    `Row 0 cannot be excluded: rows are whole numbers from 1 (the header is not a row)`,
    ["exclude", 0, "rows", 1],
  );
  parseFails(
    { from: "a.csv", exclude: [{ rows: [3], why: "x" }, { rows: [5, 3], why: "y" }] },
    `Row 3 is excluded twice: also in exclusion 1`,
    ["exclude", 1, "rows", 1],
  );
  parseFails(
    { from: "a.csv", exclude: [{ row: [3], why: "x" }] },
    `Exclusion 1 has an unknown key "row": did you mean "rows"?`,
    ["exclude", 0, "row"],
  );
  parseFails({ from: "a.csv", exclude: { rows: [3], why: "x" } }, /must be a list of entries/, [
    "exclude",
  ]);
});

Deno.test("tableKind.parse() refuses unknown types with a suggestion", () => {
  parseFails(
    { from: "a.csv", types: { v: "numbr" } },
    `Type "numbr" of column "v" is not known: did you mean "number"?`,
    [
      "types",
      "v",
    ],
  );
});

Deno.test("tableKind.parse() reads delimiter words and refuses a comma with a decimal comma", () => {
  assert.equal(tableKind.parse(parseCtx({ from: "a.txt", delimiter: "tab" })).delimiter, "\t");
  assert.equal(tableKind.parse(parseCtx({ from: "a.txt", delimiter: "\\t" })).delimiter, "\t");
  parseFails(
    { from: "a.csv", decimal: "comma", delimiter: "," },
    `Delimiter "," cannot be used with a decimal comma: use ";" or tab between fields`,
    ["delimiter"],
  );
  parseFails({ from: "a.csv", delimiter: "::" }, /^Delimiter "::" cannot be used/, ["delimiter"]);
  parseFails(
    { from: "a.csv", decimal: "dot" },
    `Decimal separator "dot" is not known: use point or comma`,
    [
      "decimal",
    ],
  );
});

Deno.test("tableKind.parse() checks inline rows: one value per column, readable values", () => {
  parseFails(
    { columns: ["x", "y"], rows: [[1, 2], [3]] },
    `Row 2 has 1 value, expected 2 (one per column)`,
    ["rows", 1],
  );
  parseFails(
    { columns: ["x"], rows: [[true]] },
    `Value true in row 1 cannot be read: use a number, a text or leave it empty`,
    ["rows", 0, 0],
  );
  parseFails(
    { rows: [[1]] },
    `Inline rows need columns: a list of column names such as [cycle, capacity]`,
    ["rows"],
  );
  parseFails({ columns: ["x", "x"], rows: [] }, `Columns 1 and 2 are both named "x"`, [
    "columns",
    1,
  ]);
});

Deno.test("tableKind.parse() places derive syntax errors at the offset inside the expression", () => {
  parseFails({ from: "a.csv", derive: { y2: "y * (2 +" } }, /./, ["derive", "y2"], 8);
  parseFails(
    { from: "a.csv", derive: { "2y": "y" } },
    `Derived column name "2y" cannot be used in expressions: use letters, digits and _, starting with a letter`,
    ["derive", "2y"],
  );
});

Deno.test("tableKind.parse() checks a where filter's comparisons", () => {
  assert.equal(
    tableKind.parse(parseCtx({ from: "a.csv", where: "t >= 2 and v < 3" })).where,
    "t >= 2 and v < 3",
  );
  parseFails(
    { from: "a.csv", where: "t + 2" },
    `Comparison "t + 2" has no operator: use <, <=, >, >=, == or !=`,
    [
      "where",
    ],
    0,
  );
  parseFails({ from: "a.csv", where: "t = 2" }, `Comparison uses "=": write == to test equality`, [
    "where",
  ], 2);
  parseFails({ from: "a.csv", where: "t > 1 and v < (2" }, /./, ["where"]);
});
