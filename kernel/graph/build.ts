/**
 * From a parsed document to a checked dependency graph, before anything runs.
 *
 * Every cell becomes a {@link CellNode}. The checks, in order, each leaving a
 * located error on the cell it concerns (and never stopping the others):
 *
 * 1. the fence itself (unclosed fence, from the document layer);
 * 2. unknown kind (pointing at the kind word, nearest kind suggested);
 * 3. duplicate name (the later cell fails; references go to the first);
 * 4. YAML options, then the kind's own `parse`;
 * 5. references: unknown cell (nearest name suggested), wrong output type;
 * 6. cycles (each member fails with the whole path).
 *
 * @module
 */
import type { DocSettings, FileRef, InputRef } from "../contract/mod.ts";
import type { CellBlock, ParsedDocument } from "../document/mod.ts";
import { lineColumnAt } from "../document/mod.ts";
import { OptionsCache } from "./options_cache.ts";
import { CellError, LocatedError, type OptionPath, type SourcePos } from "../errors.ts";
import type { AnyKind, Registry } from "../contract/mod.ts";
import { didYouMean } from "../suggest.ts";
import { canonicalJson } from "../hash.ts";
import { findCycles } from "./cycles.ts";

/** One cell of the graph. */
export interface CellNode {
  /** Position among the document's cells. */
  index: number;
  name: string;
  kind: string;
  /** Line of the opening fence. */
  line: number;
  block: CellBlock;
  plugin: AnyKind | null;
  /** The kind's spec, when parse succeeded. */
  spec: unknown;
  /** Canonical JSON of `spec` (what the cache key hashes). */
  specJson: string;
  /** References found by the kind's `inputs`. */
  refs: InputRef[];
  /** Names of the cells read, deduplicated, in reference order. */
  deps: string[];
  files: FileRef[];
  /** A static error: the cell fails without running. */
  error: LocatedError | null;
  /** Warnings raised while parsing. */
  warnings: string[];
  /** Maps an option path (and offset into its text) to a document position. */
  locate(path: OptionPath, offset?: number): SourcePos;
}

/** The checked graph of a document. */
export interface Graph {
  nodes: CellNode[];
  byName: Map<string, CellNode>;
  /** Nodes in an order where every cell comes after the cells it reads (cycle members last). */
  order: CellNode[];
}

/**
 * Resolves a {@link CellError} (or any error) thrown by cell code into a located error.
 *
 * @param node The cell the error belongs to.
 * @param err What was thrown.
 * @returns A located error whose message is the original message.
 */
export function locateError(node: Pick<CellNode, "name" | "locate">, err: unknown): LocatedError {
  if (err instanceof LocatedError) return err;
  if (err instanceof CellError) {
    return new LocatedError(err.message, node.locate(err.path, err.offset));
  }
  const message = err instanceof Error ? err.message : String(err);
  return new LocatedError(`Internal error in cell "${node.name}": ${message}`, node.locate([]));
}

function fencePos(block: CellBlock): SourcePos {
  return { line: block.line, column: block.column };
}

function newNode(block: CellBlock, index: number): CellNode {
  return {
    index,
    name: block.name,
    kind: block.kind,
    line: block.line,
    block,
    plugin: null,
    spec: null,
    specJson: "null",
    refs: [],
    deps: [],
    files: [],
    error: block.error,
    warnings: [],
    locate: () => fencePos(block),
  };
}

function parseNode(
  node: CellNode,
  doc: ParsedDocument,
  registry: Registry,
  settings: DocSettings,
  cache: OptionsCache,
): void {
  const plugin = registry.get(node.kind);
  if (!plugin) {
    node.error = new LocatedError(
      `Unknown cell kind "${node.kind}"${didYouMean(node.kind, registry.keys())}` +
        ` (kinds: ${[...registry.keys()].join(", ")})`,
      lineColumnAt(doc, node.block.kindStart),
    );
    return;
  }
  node.plugin = plugin;
  let options: Record<string, unknown> = {};
  if (plugin.body === "yaml") {
    const parsed = cache.get(node.block, doc);
    node.locate = parsed.locate;
    if (parsed.errors.length > 0) {
      node.error = parsed.errors[0];
      return;
    }
    options = parsed.options;
  } else {
    // A code body: an error's offset is into the body text.
    const block = node.block;
    node.locate = (_path, offset) =>
      offset === undefined ? fencePos(block) : lineColumnAt(doc, block.bodyStart + offset);
  }
  try {
    node.spec = plugin.parse({
      name: node.name,
      kind: node.kind,
      options,
      body: node.block.body,
      settings,
      warn: (m) => {
        if (!node.warnings.includes(m)) node.warnings.push(m);
      },
    });
    node.specJson = canonicalJson(node.spec);
    node.refs = plugin.inputs(node.spec);
    node.files = plugin.files?.(node.spec) ?? [];
  } catch (err) {
    node.error = locateError(node, err);
  }
}

function checkRefs(node: CellNode, byName: Map<string, CellNode>): void {
  const deps = new Set(node.deps); // a Set: a cell may read thousands of cells
  for (const ref of node.refs) {
    const target = byName.get(ref.name);
    if (!target) {
      node.error = new LocatedError(
        `Unknown cell "${ref.name}" in "${node.name}"${didYouMean(ref.name, byName.keys())}`,
        node.locate(ref.path, ref.offset),
      );
      return;
    }
    const output = target.plugin && target.spec !== null
      ? target.plugin.outputOf?.(target.spec) ?? target.plugin.output
      : target.plugin?.output;
    if (output && !ref.accepts.includes(output)) {
      const want = ref.accepts.map((t) => t.toLowerCase()).join(" or ");
      node.error = new LocatedError(
        `"${ref.path.join(".")}" of "${node.name}" must name a ${want} cell, ` +
          `but "${ref.name}" is a ${target.kind} cell (gives ${output.toLowerCase()})`,
        node.locate(ref.path, ref.offset),
      );
      return;
    }
    if (ref.name === node.name) {
      node.error = new LocatedError(
        `Cell "${node.name}" reads itself`,
        node.locate(ref.path, ref.offset),
      );
      return;
    }
    if (!deps.has(ref.name)) {
      deps.add(ref.name);
      node.deps.push(ref.name);
    }
  }
}

/**
 * Builds and checks the dependency graph of a parsed document.
 *
 * @param doc The parsed document.
 * @param registry The cell kinds.
 * @param settings Document settings (from the front matter).
 * @param cache Parsed options from earlier documents (a session keeps one).
 * @returns The graph; errors sit on the nodes they concern.
 */
export function buildGraph(
  doc: ParsedDocument,
  registry: Registry,
  settings: DocSettings,
  cache: OptionsCache = new OptionsCache(),
): Graph {
  const nodes: CellNode[] = [];
  const byName = new Map<string, CellNode>();
  for (const block of doc.blocks) {
    if (block.type !== "cell") continue;
    const node = newNode(block, nodes.length);
    nodes.push(node);
    const first = byName.get(node.name);
    if (first) {
      node.error ??= new LocatedError(
        `Duplicate cell name "${node.name}": already used by the ${first.kind} cell at line ${first.line}`,
        lineColumnAt(doc, block.nameStart),
      );
    } else byName.set(node.name, node);
  }
  for (const node of nodes) if (!node.error) parseNode(node, doc, registry, settings, cache);
  cache.sweep();
  for (const node of nodes) if (!node.error) checkRefs(node, byName);
  for (const cycle of findCycles(nodes.filter((n) => !n.error), byName)) {
    const path = cyclePath(cycle);
    const members = new Set(cycle);
    for (const name of cycle) {
      const node = byName.get(name)!;
      const ref = node.refs.find((r) => members.has(r.name));
      node.error = new LocatedError(`Cycle: ${path}`, node.locate(ref?.path ?? []));
    }
  }
  return { nodes, byName, order: topologicalOrder(nodes, byName) };
}

/** Cells of a cycle shown in its message; a longer one is shortened (each member carries it). */
const CYCLE_SHOWN = 12;

/** `a → b → c → a`; past {@link CYCLE_SHOWN} cells, the first few, `…`, the last and the count. */
function cyclePath(cycle: string[]): string {
  if (cycle.length <= CYCLE_SHOWN) return [...cycle, cycle[0]].join(" → ");
  const head = cycle.slice(0, CYCLE_SHOWN - 2);
  const n = cycle.length.toLocaleString("en");
  return [...head, "…", cycle[cycle.length - 1], cycle[0]].join(" → ") + ` (${n} cells)`;
}

/** Depth-first post-order from each node in document order; a cycle member is emitted once. */
function topologicalOrder(nodes: CellNode[], byName: Map<string, CellNode>): CellNode[] {
  const order: CellNode[] = [];
  const mark = new Map<CellNode, 1 | 2>();
  const visit = (start: CellNode) => {
    // Iterative, so a 10,000-cell chain does not overflow the stack.
    const stack: [CellNode, number][] = [[start, 0]];
    mark.set(start, 1);
    while (stack.length > 0) {
      const top = stack[stack.length - 1];
      const [node, i] = top;
      if (i < node.deps.length) {
        top[1]++;
        const dep = byName.get(node.deps[i]);
        if (dep && dep !== node && !mark.has(dep)) {
          mark.set(dep, 1);
          stack.push([dep, 0]);
        }
      } else {
        stack.pop();
        mark.set(node, 2);
        order.push(node);
      }
    }
  };
  for (const n of nodes) if (!mark.has(n)) visit(n);
  return order;
}
