import { equal, ok } from "node:assert/strict";
import {
  EMPTY_DOCUMENT,
  fiveCellDocument,
  plumbRunCommand,
  tableOnlyDocument,
} from "./documents.ts";
import { writeScaleCsv } from "./generate.ts";

const root = new URL("../../../", import.meta.url);

async function plumbRun(dir: string, doc: string, text: string) {
  await Deno.writeTextFile(`${dir}/${doc}`, text);
  const [deno, ...args] = plumbRunCommand(root, doc, "--json");
  const out = await new Deno.Command(deno, {
    args,
    cwd: dir,
    stdout: "piped",
    stderr: "piped",
  }).output();
  return JSON.parse(new TextDecoder().decode(out.stdout)) as {
    ok: boolean;
    cells: { name: string; kind: string; state: string; result?: Record<string, unknown> }[];
  };
}

Deno.test("the benchmark documents run on the benchmark data: five cells, the table alone, none", async () => {
  const dir = await Deno.makeTempDir({ prefix: "plumb-scale-docs-" });
  try {
    await writeScaleCsv(`${dir}/data.csv`, 300, 3);
    const five = await plumbRun(dir, "five.md", fiveCellDocument("data.csv", 300));
    ok(five.ok);
    equal(
      five.cells.map((c) => `${c.kind} ${c.name} ${c.state}`).join("; "),
      "table data current; fit all current; check all-check current; fit first-five current; " +
        "compare ten-or-five current",
    );
    // y depends on x6…x10 as well (generate.ts), with 300 rows clearly enough to prefer all ten.
    equal(five.cells[4].result?.preferred, "all");
    const table = await plumbRun(dir, "table.md", tableOnlyDocument("data.csv"));
    equal(table.cells.length, 1);
    equal(table.cells[0].state, "current");
    const empty = await plumbRun(dir, "empty.md", EMPTY_DOCUMENT);
    ok(empty.ok);
    equal(empty.cells.length, 0);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});
