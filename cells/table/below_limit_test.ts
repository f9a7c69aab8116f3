import assert from "node:assert/strict";
import { tableKind } from "./mod.ts";
import type { ParseContext, RunContext } from "../../kernel/contract/mod.ts";
import type { TableOutput } from "./run.ts";

const SETTINGS = {
  title: "t",
  confidence: 0.95,
  seed: 1,
  criterion: "aicc",
  maxFileBytes: 1 << 20,
  extra: {},
};
const parse = (options: Record<string, unknown>) =>
  tableKind.parse(
    { name: "w", kind: "table", options, body: "", settings: SETTINGS, warn() {} } as ParseContext,
  );
const run = (options: Record<string, unknown>) =>
  tableKind.run(parse(options), {
    name: "w",
    settings: SETTINGS,
    inputs: {},
    files: {},
    warn() {},
    progress() {},
  } as RunContext) as TableOutput;

Deno.test("below_limit: cells written <L become the limit L with a flag; measured numbers stay; the count is in the result", () => {
  const out = run({
    columns: ["day", "nitrate"],
    rows: [[1, "0.12"], [2, "<0.05"], [3, "< 5e-2"], [4, null], [5, "0.3"]],
    below_limit: ["nitrate"],
  });
  const c = out.columns.find((c) => c.name === "nitrate")!;
  assert.equal(c.type, "number");
  if (c.type !== "number") return;
  assert.deepEqual([...c.values].map((v) => (Number.isNaN(v) ? null : v)), [
    0.12,
    0.05,
    0.05,
    null,
    0.3,
  ]);
  assert.deepEqual([...c.below!], [0, 1, 1, 0, 0]);
  assert.equal(c.missing, 1);
  const r = tableKind.summary(out, parse({ columns: ["a"], rows: [[1]] }));
  assert.equal(r.columns.find((x) => x.name === "nitrate")!.below_limit, 2);
});

Deno.test("below_limit: a cell that is neither a number nor <L is refused at its row; an unknown column with a near miss", () => {
  assert.throws(
    () =>
      run({
        columns: ["day", "nitrate"],
        rows: [[1, "<0.05"], [2, "n.d."]],
        below_limit: "nitrate",
      }),
    /Column "nitrate" row 2 holds "n.d."/,
  );
  assert.throws(
    () => run({ columns: ["day", "nitrate"], rows: [[1, "<0.05"]], below_limit: ["nitrat"] }),
    /did you mean "nitrate"/,
  );
  assert.throws(
    () => parse({ database: "a.duckdb", query: "SELECT 1 AS x", below_limit: ["x"] }),
    /applies to files and inline rows/,
  );
});
