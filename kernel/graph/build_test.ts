/**
 * buildGraph() at scale (issue 11, defect 9: 10,000 cells took 99 s): a
 * 10,000-cell cycle, a cell reading 10,000 cells and a 10,000-cell chain
 * are checked and ordered correctly, and a long cycle's message stays short
 * (every member carries it: 10,000 names in each of 10,000 messages was
 * about a gigabyte of RUN-JSON). Their time is the bench's `many_cells`
 * figure, never asserted here.
 *
 * @module
 */
import { deepEqual, equal, ok } from "node:assert/strict";
import { parseDocument, readSettings } from "../document/mod.ts";
import { fakeRegistry } from "../session/testdata/fake_kinds.ts";
import { buildGraph } from "./build.ts";

const F = "```";
const cell = (kind: string, name: string, body: string) => `${F}${kind} ${name}\n${body}\n${F}\n`;

function graphOf(cells: string[]) {
  const doc = parseDocument(cells.join("\n"));
  return buildGraph(doc, fakeRegistry, readSettings(doc).settings);
}

// c0 → c1 → … → c9999 → c0
Deno.test("buildGraph() reports a 10,000-cell cycle on every member with a short message", () => {
  const n = 10_000;
  const g = graphOf(
    Array.from({ length: n }, (_, i) => cell("sum", `c${i}`, `of: [c${(i + 1) % n}]`)),
  );
  const message = "Cycle: c0 → c1 → c2 → c3 → c4 → c5 → c6 → c7 → c8 → c9 → … → c9999 → c0 " +
    "(10,000 cells)";
  equal(g.nodes.filter((x) => x.error?.message === message).length, n);
  equal(g.order.length, n);
});

Deno.test("buildGraph() keeps a short cycle's whole path", () => {
  const g = graphOf([cell("sum", "a", "of: [b]"), cell("sum", "b", "of: [a]")]);
  equal(g.byName.get("a")!.error!.message, "Cycle: a → b → a");
});

// n0 … n9999 ─▶ total (one cell reading 10,000 cells, one of them twice)
Deno.test("buildGraph() orders one cell reading 10,000 cells after all of them, each once", () => {
  const n = 10_000;
  const names = Array.from({ length: n }, (_, i) => `n${i}`);
  const cells = names.map((x, i) => cell("num", x, `value: ${i}`));
  cells.push(cell("sum", "total", `of: [${names.join(", ")}, n0]`));
  const g = graphOf(cells);
  const total = g.byName.get("total")!;
  equal(total.error, null);
  deepEqual(total.deps, names);
  equal(g.order[g.order.length - 1], total);
});

// k0 ◀─ k1 ◀─ … ◀─ k9999, written last first
Deno.test("buildGraph() orders a 10,000-cell chain written in reverse, inputs first", () => {
  const n = 10_000;
  const cells = [cell("num", "k0", "value: 1")];
  for (let i = 1; i < n; i++) cells.push(cell("sum", `k${i}`, `of: [k${i - 1}]`));
  const g = graphOf(cells.reverse());
  ok(g.nodes.every((x) => x.error === null));
  deepEqual(g.order.map((x) => x.name), Array.from({ length: n }, (_, i) => `k${i}`));
});
