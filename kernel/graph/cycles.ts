/**
 * Cycle detection by Tarjan's strongly connected components (Tarjan 1972,
 * "Depth-first search and linear graph algorithms", SIAM J. Comput. 1(2)),
 * written iteratively so long chains do not exhaust the call stack.
 *
 * @module
 */

/** The minimum a node needs for cycle search. */
export interface CycleNode {
  name: string;
  deps: readonly string[];
}

/**
 * Finds every cycle (strongly connected component of two or more cells, or a
 * cell reading itself), each as a path in reference order.
 *
 * @param nodes Nodes to search.
 * @param byName Lookup for dependency names (names absent from `nodes` are ignored).
 * @returns Cycles as lists of names, e.g. `["a", "b", "c"]` for a → b → c → a.
 * @example
 * ```ts
 * import { findCycles } from "./cycles.ts";
 * const nodes = [{ name: "a", deps: ["b"] }, { name: "b", deps: ["a"] }];
 * const cycles = findCycles(nodes, new Map(nodes.map((n) => [n.name, n])));
 * if (cycles.length !== 1 || cycles[0].length !== 2) throw new Error();
 * ```
 */
export function findCycles<N extends CycleNode>(
  nodes: readonly N[],
  byName: ReadonlyMap<string, CycleNode>,
): string[][] {
  const inSet = new Set(nodes.map((n) => n.name));
  const index = new Map<string, number>();
  const low = new Map<string, number>();
  const onStack = new Set<string>();
  const stack: string[] = [];
  const cycles: string[][] = [];
  let counter = 0;

  // Each node's deps within the set, filtered once: a frame reads them once per step, and a
  // cell reading thousands of cells (a compare of 5,000 fits) would otherwise cost deg² a node.
  const within = new Map<string, string[]>();
  const depsOf = (name: string) => {
    let deps = within.get(name);
    if (deps === undefined) {
      deps = (byName.get(name)?.deps ?? []).filter((d) => inSet.has(d));
      within.set(name, deps);
    }
    return deps;
  };

  for (const root of nodes) {
    if (index.has(root.name)) continue;
    const work: [string, number][] = [[root.name, 0]];
    index.set(root.name, counter);
    low.set(root.name, counter++);
    stack.push(root.name);
    onStack.add(root.name);
    while (work.length > 0) {
      const frame = work[work.length - 1];
      const [v, i] = frame;
      const deps = depsOf(v);
      if (i < deps.length) {
        frame[1]++;
        const w = deps[i];
        if (!index.has(w)) {
          index.set(w, counter);
          low.set(w, counter++);
          stack.push(w);
          onStack.add(w);
          work.push([w, 0]);
        } else if (onStack.has(w)) {
          low.set(v, Math.min(low.get(v)!, index.get(w)!));
        }
        continue;
      }
      work.pop();
      if (work.length > 0) {
        const parent = work[work.length - 1][0];
        low.set(parent, Math.min(low.get(parent)!, low.get(v)!));
      }
      if (low.get(v) === index.get(v)) {
        const component: string[] = [];
        let w: string;
        do {
          w = stack.pop()!;
          onStack.delete(w);
          component.push(w);
        } while (w !== v);
        if (component.length > 1 || depsOf(v).includes(v)) {
          cycles.push(orderCycle(component, depsOf));
        }
      }
    }
  }
  return cycles;
}

/** Orders a component as a walk along references, starting from its first member in document order. */
function orderCycle(component: string[], depsOf: (n: string) => string[]): string[] {
  const members = new Set(component);
  const start = component[component.length - 1];
  const path = [start];
  const seen = new Set(path);
  let cur = start;
  for (;;) {
    const next = depsOf(cur).find((d) => members.has(d) && !seen.has(d));
    if (!next) break;
    path.push(next);
    seen.add(next);
    cur = next;
  }
  return path;
}
