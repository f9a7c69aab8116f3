/**
 * The waiting list of a run (issue 11, defect 9): a change marks only the
 * cells it concerns, so a run of n cells looks at each cell a bounded number
 * of times instead of every waiting cell after every change (n² checks and
 * promise reactions: 10,000 cells took 67-99 s and 2.7-3.8 GB).
 *
 * @module
 */
import { deepEqual, equal } from "node:assert/strict";
import type { CellNode } from "../graph/build.ts";
import { Session } from "./session.ts";
import { fakeRegistry } from "./testdata/fake_kinds.ts";
import { Waiting } from "./_waiting.ts";

function nodes(edges: Record<string, string[]>): [CellNode[], Map<string, CellNode>] {
  const list = Object.entries(edges).map(([name, deps]) => ({ name, deps }) as CellNode);
  return [list, new Map(list.map((n) => [n.name, n]))];
}
const names = (l: readonly CellNode[]) => l.map((n) => n.name);

//   a ──▶ b ──▶ d        c (alone)
//   └───────▶ d
Deno.test("Waiting.take() gives every cell first, then only the readers of a change", () => {
  const [list, byName] = nodes({ a: [], b: ["a"], c: [], d: ["a", "b"] });
  const w = new Waiting(list, byName);
  deepEqual(names(w.take()), ["a", "b", "c", "d"]);
  deepEqual(names(w.take()), []); // nothing changed
  w.remove(byName.get("a")!);
  w.remove(byName.get("c")!);
  w.changed(byName.get("a")!);
  deepEqual(names(w.take()), ["b", "d"]);
  w.remove(byName.get("b")!);
  w.changed(byName.get("b")!);
  deepEqual(names(w.take()), ["d"]);
  w.changed(byName.get("c")!); // no readers
  deepEqual(names(w.take()), []);
  equal(w.size, 1);
  deepEqual(names(w.inputsOf(byName.get("d")!)), ["a", "b"]);
});

Deno.test("Waiting.placeFreed() marks the cells parked for a place in a worker's queue", () => {
  const [list, byName] = nodes({ a: [], b: ["a"], c: ["a"] });
  const w = new Waiting(list, byName);
  w.take();
  w.park(byName.get("c")!);
  deepEqual(names(w.take()), []);
  w.placeFreed();
  deepEqual(names(w.take()), ["c"]);
  w.placeFreed(); // unparked once marked
  deepEqual(names(w.take()), []);
  deepEqual(names(w.drain()), ["a", "b", "c"]);
  equal(w.size, 0);
});

const cell = (kind: string, name: string, body: string) =>
  "```" + `${kind} ${name}\n${body}\n` + "```\n";

// 5,000 pairs: v_i (num) ◀── s_i (sum of v_i and, every 10th, the previous s)
Deno.test("Session.run() computes 10,000 cells, each once, with the right values", async () => {
  const parts: string[] = [];
  for (let i = 0; i < 5000; i++) {
    parts.push(cell("num", `v${i}`, `value: ${i}`));
    const of = i % 10 === 0 && i > 0 ? `[v${i}, s${i - 1}]` : `[v${i}]`;
    parts.push(cell("sum", `s${i}`, `of: ${of}`));
  }
  const s = new Session({
    registry: fakeRegistry,
    workerUrl: new URL("./testdata/fake_worker.ts", import.meta.url),
    dir: ".",
  });
  try {
    const r = await s.run(parts.join("\n"));
    equal(r.cells.length, 10_000);
    equal(r.cells.filter((c) => c.state === "current").length, 10_000);
    equal(r.ran.length, 10_000);
    equal(new Set(r.ran).size, 10_000);
    const value = (n: string) =>
      (r.cells.find((c) => c.name === n)!.result as { value: number }).value;
    equal(value("s9"), 9);
    equal(value("s10"), 10 + 9);
    equal(value("s20"), 20 + 19);
    equal(value("s4999"), 4999);
    // Nothing reruns when nothing changed.
    deepEqual((await s.run(parts.join("\n"))).ran, []);
  } finally {
    s.close();
  }
});
