/**
 * The body a new cell starts with when added from the page: the kind's own
 * `template`, given the document's cells as they stand (their kinds, output
 * types, the cells they read, the columns they offer and their last
 * results), so the new cell names real tables, columns and fits and runs at
 * once. The kernel knows no kind: what a template writes is the kind's.
 *
 * @module
 */
import type { ColumnInfo, Registry, TemplateCell } from "../contract/mod.ts";
import { type ParsedDocument, readSettings } from "../document/mod.ts";
import { buildGraph } from "../graph/build.ts";

/**
 * The template body of a new cell of a kind.
 *
 * @param kind The kind word.
 * @param registry The known kinds.
 * @param doc The document the cell goes into.
 * @param resultOf The last result (page copy) of a cell by name, or null.
 * @returns The body text (empty for a kind the registry does not know).
 * @example
 * ```ts
 * import { templateFor } from "./templates.ts";
 * import { parseDocument } from "../document/mod.ts";
 * const doc = parseDocument("~~~table runs\nfrom: a.csv\n~~~\n");
 * if (templateFor("fit", new Map(), doc, () => null) !== "") throw new Error("no kinds, no template");
 * ```
 */
export function templateFor(
  kind: string,
  registry: Registry,
  doc: ParsedDocument,
  resultOf: (name: string) => unknown,
): string {
  const own = registry.get(kind);
  if (!own) return "";
  const graph = buildGraph(doc, registry, readSettings(doc).settings);
  const cells: TemplateCell[] = graph.nodes.map((n) => {
    const result = resultOf(n.name) ?? null;
    let columns: ColumnInfo[] = [];
    try {
      if (result !== null && n.plugin?.columns) columns = n.plugin.columns(result);
    } catch { /* a result of another shape (an older run): no columns */ }
    return {
      name: n.name,
      kind: n.kind,
      output: n.plugin ? (n.spec !== null && n.plugin.outputOf?.(n.spec)) || n.plugin.output : null,
      inputs: n.refs.map((r) => r.name),
      columns,
      result,
    };
  });
  return own.template({ cells });
}
