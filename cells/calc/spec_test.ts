import { deepEqual, equal, throws } from "node:assert/strict";
import { CellError } from "../../kernel/errors.ts";
import { DEFAULT_SETTINGS } from "../../kernel/document/mod.ts";
import { parseCalcSpec } from "./spec.ts";

const parse = (body: string) =>
  parseCalcSpec({
    name: "c",
    kind: "calc",
    body,
    options: {},
    settings: DEFAULT_SETTINGS,
    warn() {},
  });

/** The CellError `body` throws, with its message and offset. */
function refused(body: string): CellError {
  try {
    parse(body);
  } catch (e) {
    if (e instanceof CellError) return e;
    throw e;
  }
  throw new Error("accepted");
}

Deno.test("parseCalcSpec() reads the header and keeps the code after ---", () => {
  const body = "reads: power, end-of-life as life  # two cells\ngives: table\ntime: 2.5 s\n" +
    "memory: 64 MB\n---\nreturn { columns: { x: [1] } };\n";
  const spec = parse(body);
  deepEqual(spec.reads, [
    { cell: "power", as: "power", offset: 7 },
    { cell: "end-of-life", as: "life", offset: 14 },
  ]);
  equal(spec.gives, "table");
  equal(spec.seconds, 2.5);
  equal(spec.memoryMb, 64);
  equal(spec.code, "return { columns: { x: [1] } };\n");
  equal(body.slice(spec.codeOffset, spec.codeOffset + 6), "return");
});

Deno.test("parseCalcSpec() takes a body without --- as code that reads nothing, with the defaults", () => {
  const spec = parse("return 42;\n");
  deepEqual(spec.reads, []);
  equal(spec.gives, "value");
  equal(spec.seconds, 10);
  equal(spec.memoryMb, 256);
  equal(spec.codeOffset, 0);
});

Deno.test("parseCalcSpec() refuses an unknown header key at its place, naming the nearest", () => {
  const e = refused("reads: a\ngivs: value\n---\nreturn 1;\n");
  equal(e.message, 'Unknown option "givs" in calc "c": did you mean "gives"?');
  equal(e.offset, "reads: a\n".length);
});

Deno.test("parseCalcSpec() refuses a name code cannot use, suggesting an alias", () => {
  const e = refused("reads: end-of-life\n---\nreturn 1;\n");
  equal(e.message, '"end-of-life" is not a name code can use: write "end-of-life as end_of_life"');
  equal(e.offset, "reads: ".length);
  throws(
    () => parse("reads: a as class\n---\nreturn 1;\n"),
    /a word TypeScript or the sandbox takes/,
  );
  throws(() => parse("reads: a, b as a\n---\nreturn 1;\n"), /"a" is read twice/);
});

Deno.test("parseCalcSpec() refuses a limit out of range and a gives it does not know", () => {
  throws(
    () => parse("time: 0 s\n---\nreturn 1;\n"),
    /time must be a number above 0 and at most 600 s/,
  );
  throws(() => parse("memory: lots\n---\nreturn 1;\n"), /memory must be a number above 0/);
  throws(
    () => parse("gives: tabel\n---\nreturn 1;\n"),
    /"gives" is value or table, not "tabel": did you mean "table"\?/,
  );
});

Deno.test("parseCalcSpec() refuses the word import anywhere in the code, at its place", () => {
  const body = "---\nconst x = 1;\nconst m = await import('file:///etc/passwd');\n";
  const e = refused(body);
  equal(
    e.message,
    "calc cells cannot import modules: everything the code reads comes through `reads`",
  );
  equal(body.slice(e.offset!, e.offset! + 6), "import");
  throws(() => parse("reads: a\n---\n   \n"), /has no code/);
});

Deno.test("parseCalcSpec() refuses the word export, at its place: code that closes its function cannot re-export a module", () => {
  const body = "---\nreturn 1;\n}\nexport * from 'file:///etc/hosts';\n";
  const e = refused(body);
  equal(e.message, "calc cells cannot export: the code's answer is what it returns");
  equal(body.slice(e.offset!, e.offset! + 6), "export");
});
