import { deepEqual, equal, ok } from "node:assert/strict";
import { join } from "node:path";
import { registry } from "../../cells/mod.ts";
import { Session } from "../../kernel/session/session.ts";

const WORKER = new URL("../../cells/worker.ts", import.meta.url);

const fence = (info: string, body: string) => "```" + info + "\n" + body + "\n```\n";

// Invented rows; the numbers do not matter here, only which fields travel.
const DOC = fence(
  "table t",
  "columns: [x, y]\nrows:\n  - [1, 2.1]\n  - [2, 3.9]\n  - [3, 6.2]\n  - [4, 7.8]",
) +
  "\n" + fence("fit f", "on: t\nmodel: y = a + b*x");

async function withSession(page: boolean, fn: (s: Session) => Promise<void>) {
  const dir = await Deno.makeTempDir({ prefix: "plumb-page-" });
  const s = new Session({ registry, workerUrl: WORKER, dir: join(dir), page });
  try {
    await fn(s);
  } finally {
    s.close();
    await Deno.remove(dir, { recursive: true });
  }
}

const fitOf = (r: Awaited<ReturnType<Session["run"]>>) => r.cells.find((c) => c.name === "f")!;

Deno.test("Session with page: true gets a fit's result without its per-row arrays, named in omitted", async () => {
  await withSession(true, async (s) => {
    const f = fitOf(await s.run(DOC));
    equal(f.state, "current");
    const result = f.result as Record<string, unknown>;
    ok(!("residuals" in result) && !("fitted" in result) && !("rows" in result));
    deepEqual(f.omitted, ["fitted", "residuals", "rows", "rows_missing"]);
    ok(typeof result.r2 === "number");
  });
  await withSession(false, async (s) => {
    const f = fitOf(await s.run(DOC));
    equal((f.result as { residuals: number[] }).residuals.length, 4);
    equal(f.omitted, undefined);
  });
});

Deno.test("Session with page: true keeps a field an inline value names, without recomputing the cell", async () => {
  await withSession(true, async (s) => {
    await s.run(DOC);
    const named = `First residual @(f.residuals[0], 3).\n\n${DOC}`;
    let r = await s.run(named);
    deepEqual(r.ran, []);
    let f = fitOf(r);
    equal((f.result as { residuals: number[] }).residuals.length, 4);
    deepEqual(f.omitted, ["fitted", "rows", "rows_missing"]);
    equal(s.runs.get("f"), 1);
    r = await s.run(DOC);
    deepEqual(r.ran, []);
    f = fitOf(r);
    ok(!("residuals" in (f.result as object)));
  });
});
