/**
 * Deep expressions through a document (issue 11 #8). Before: "Internal error
 * … Maximum call stack size exceeded" placed at the fence; now a located
 * message at the model naming the limit, and the other cells run.
 */
import { equal, match } from "node:assert/strict";
import { join } from "node:path";
import { registry } from "../../cells/mod.ts";
import { Session } from "../../kernel/session/session.ts";

const WORKER = new URL("../../cells/worker.ts", import.meta.url);

Deno.test("deep expressions: nested parentheses and a 3,000-term sum are refused at the model", async () => {
  const dir = await Deno.makeTempDir({ prefix: "plumb-deep-" });
  try {
    await Deno.writeTextFile(join(dir, "d.csv"), "x,y\n1,2.1\n2,3.9\n3,6.2\n4,7.8\n5,10.1\n");
    const parens = "(".repeat(2000) + "a*x" + ")".repeat(2000);
    const terms = Array.from({ length: 3000 }, (_, i) => `a${i}*x`).join(" + ");
    const doc = "```table t\nfrom: d.csv\n```\n\n" + //                  lines 1-3
      "```fit deep\non: t\nmodel: y = " + parens + "\n```\n\n" + //    lines 5-8, model on 7
      "```fit long\non: t\nmodel: y = " + terms + "\n```\n\n" + //     lines 10-13, model on 12
      "```fit fine\non: t\nmodel: y = a + b*x\n```\n";
    const session = new Session({ registry, workerUrl: WORKER, dir });
    try {
      const r = await session.run(doc);
      const cell = (n: string) => r.cells.find((c) => c.name === n)!;
      equal(cell("fine").state, "current");
      const deep = cell("deep");
      equal(deep.state, "failed");
      match(deep.error!.message, /more than 100 parentheses, calls or powers at column 105/);
      equal(deep.error!.line, 7);
      equal(deep.error!.column, "model: y = ".length + 100 + 1);
      const long = cell("long");
      equal(long.state, "failed");
      match(
        long.error!.message,
        /^.*Expression is more than 500 levels deep at column \d+: the limit is 500/,
      );
      equal(long.error!.line, 12);
      for (const c of [deep, long]) equal(/Internal|call stack/.test(c.error!.message), false);
    } finally {
      session.close();
    }
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});
