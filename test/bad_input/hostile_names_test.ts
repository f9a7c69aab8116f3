/**
 * Names that are built-in properties of every plain object (issue 11, #5).
 * Before: a column named `constructor`, `toString`, `valueOf` or
 * `hasOwnProperty` without a unit put `Object.prototype`'s function into the
 * table (`units[name]`), the compute worker stopped on it ("DataCloneError:
 * function Object() could not be cloned") and 3 cells failed and 8 were held
 * with it; a delimiter word `constructor` threw a TypeError. Now every cell of
 * a document using the name everywhere runs, and the one misused option is a
 * located error.
 */
import { deepEqual, equal, ok } from "node:assert/strict";
import { join } from "node:path";
import { registry } from "../../cells/mod.ts";
import { parseDelimiter } from "../../cells/table/_parse_source.ts";
import { byteSize } from "../../kernel/document/_byte_size.ts";
import { CellError } from "../../kernel/errors.ts";
import { type RunReport, Session } from "../../kernel/session/session.ts";
import { hostileDocument, hostileFiles } from "./_hostile_document.ts";

const WORKER = new URL("../../cells/worker.ts", import.meta.url);
const NAMES = ["constructor", "__proto__", "toString", "valueOf", "hasOwnProperty"];

async function runHostile(n: string): Promise<{ report: RunReport; doc: string }> {
  const dir = await Deno.makeTempDir({ prefix: "plumb-hostile-" });
  try {
    for (const [file, text] of Object.entries(hostileFiles(n))) {
      await Deno.writeTextFile(join(dir, file), text);
    }
    const doc = hostileDocument(n);
    const session = new Session({ registry, workerUrl: WORKER, dir });
    try {
      return { report: await session.run(doc), doc };
    } finally {
      session.close();
    }
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

// deno-lint-ignore no-explicit-any
type Result = any;

for (const n of NAMES) {
  Deno.test(`hostile names: "${n}" as column, unit, cell and parameter runs in every kind`, async () => {
    const { report, doc } = await runHostile(n);
    const cell = (name: string) => report.cells.find((c) => c.name === name)!;
    for (const c of report.cells) {
      if (c.name === "unk") continue;
      equal(c.state, "current", `${c.kind} ${c.name}: ${c.error?.message}`);
    }
    ok(report.cells.length >= 27, `${report.cells.length} cells`);
    const unk = cell("unk");
    equal(unk.state, "failed");
    ok(unk.error!.message.startsWith(`Unknown option "${n}" in fit "unk"`), unk.error!.message);
    const line = doc.split("\n").findIndex((l) => l.startsWith(`${n}: 3`)) + 1;
    deepEqual([unk.error!.line, unk.error!.column], [line, n.length + 3], "at the value");

    const columns = (name: string) => (cell(name).result as Result).columns as Result[];
    deepEqual(columns("inl").map((c) => c.unit), [null, null], "no unit was given");
    deepEqual(columns("data").map((c) => [c.name, c.unit]).slice(0, 3), [
      ["x", "s"],
      [n, "m"],
      ["y", "kg"],
    ]);
    equal(columns("plain")[0].unit, n, "a unit may be the name too");
    const parfit = cell("parfit").result as Result;
    deepEqual(parfit.parameters.map((p: Result) => p.name), [n, "k"]);
    ok(Math.abs(parfit.parameters[0].estimate - 3.934) < 1e-3, "the same fit as with any name");
    ok(Object.hasOwn((cell("chk5").result as Result).vif, n));
    deepEqual(Object.keys((cell("pr").result as Result).at[0].x), [n]);
    equal((cell("cmp").result as Result).rows.length, 3);
  });
}

Deno.test("parseDelimiter() refuses a built-in property name as a word, in words", () => {
  for (const n of ["constructor", "toString", "__proto__"]) {
    try {
      parseDelimiter(n, ".");
      throw new Error("accepted");
    } catch (e) {
      ok(e instanceof CellError, String(e));
      ok(e.message.startsWith(`Delimiter "${n}" cannot be used`), e.message);
    }
  }
});

Deno.test("byteSize() reads no unit from Object.prototype", () => {
  equal(byteSize("1 constructor"), null);
  equal(byteSize("2 kB"), 2000);
});

Deno.test("option values of the wrong shape are shown in words, never as [object Object]", async () => {
  // Before: Option "model" of fit "f1" is "[object Object]" (fuzz target run, seed 11).
  const cells = [
    ["fit", "m", "on: t\nmodel: [{}]"],
    ["fit", "s", "on: t\nmodel: y = a*exp(b*x)\nstart: { a: { b: 1 }, b: 1 }"],
    ["fit", "cv", "on: t\nmodel: y = a + b*x\ncount_variance: { a: 1 }"],
    ["compare", "c1", "fits: { a: 1 }"],
    ["compare", "c2", "fits: [{ a: 1 }]"],
    ["compare", "c3", "fits: [s, m]\nby: { a: 1 }"],
    ["chart", "g1", "on: t\nx: x\ny: y\nband: [{}]"],
    ["chart", "g2", "on: t\nx: x\ny: y\ntitle: { a: 1 }"],
    ["chart", "g3", "on: t\nx: x\ny: y\nlog: [x]"],
    ["predict", "p1", "fit: m\nat: { x: [{ a: 1 }] }"],
  ];
  const doc = "```table t\ncolumns: [x, y]\nrows: [[1, 2], [2, 4.1], [3, 5.9]]\n```\n\n" +
    cells.map(([k, n, body]) => "```" + `${k} ${n}\n${body}\n` + "```\n").join("\n");
  const dir = await Deno.makeTempDir({ prefix: "plumb-shapes-" });
  const session = new Session({ registry, workerUrl: WORKER, dir });
  try {
    const report = await session.run(doc);
    for (const [, n] of cells) {
      const c = report.cells.find((c) => c.name === n)!;
      equal(c.state, "failed", n);
      ok(!/object Object|\[object/.test(c.error!.message), `${n}: ${c.error!.message}`);
    }
  } finally {
    session.close();
    await Deno.remove(dir, { recursive: true });
  }
});
