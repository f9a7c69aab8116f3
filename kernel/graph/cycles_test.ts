import { deepEqual } from "node:assert/strict";
import { findCycles } from "./cycles.ts";

const graph = (edges: Record<string, string[]>) => {
  const nodes = Object.entries(edges).map(([name, deps]) => ({ name, deps }));
  return [nodes, new Map(nodes.map((n) => [n.name, n]))] as const;
};

// a → b → c → a, and d → a outside the cycle
Deno.test("findCycles() returns one three-cell cycle in reference order, not its reader", () => {
  const [nodes, byName] = graph({ a: ["b"], b: ["c"], c: ["a"], d: ["a"] });
  deepEqual(findCycles(nodes, byName), [["a", "b", "c"]]);
});

Deno.test("findCycles() reports a self-reference and finds nothing in a diamond", () => {
  let [nodes, byName] = graph({ s: ["s"] });
  deepEqual(findCycles(nodes, byName), [["s"]]);
  [nodes, byName] = graph({ a: [], b: ["a"], c: ["a"], d: ["b", "c"] });
  deepEqual(findCycles(nodes, byName), []);
});

Deno.test("findCycles() handles a 20,000-cell chain without overflowing the stack", () => {
  const edges: Record<string, string[]> = { c0: [] };
  for (let i = 1; i < 20000; i++) edges[`c${i}`] = [`c${i - 1}`];
  const [nodes, byName] = graph(edges);
  deepEqual(findCycles(nodes, byName), []);
});
