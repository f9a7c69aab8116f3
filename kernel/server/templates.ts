/**
 * The body a new cell starts with when added from the page: the kind's own
 * `template` when it has one, else a default by kind below, naming the
 * document's nearest cells of the right kind so the new cell can run at once
 * or fails with a message that says what to fill in.
 *
 * @module
 */
import type { CellBlock, ParsedDocument } from "../document/mod.ts";
import type { Registry } from "../registry.ts";

const namesOf = (doc: ParsedDocument, kind: string): string[] =>
  doc.blocks
    .filter((b): b is CellBlock => b.type === "cell" && b.kind === kind)
    .map((b) => b.name);

/** Defaults by kind; `t` is the last table's name, `f` the fits' names. */
const DEFAULTS: Record<string, (t: string, f: string[]) => string> = {
  table: () => "from: data.csv\n",
  fit: (t) => `on: ${t}\nmodel: y = a + b*x\n`,
  compare: (_t, f) => `fits: [${(f.length >= 2 ? f : ["fit1", "fit2"]).join(", ")}]\n`,
  check: (_t, f) => `fit: ${f.at(-1) ?? "fit1"}\n`,
  predict: (_t, f) => `fit: ${f.at(-1) ?? "fit1"}\nat: { x: [1, 2, 3] }\n`,
  chart: (t, f) => `on: ${t}\nx: x\ny: y\n` + (f.length > 0 ? `fits: [${f.at(-1)}]\n` : ""),
};

/**
 * The template body of a new cell of a kind.
 *
 * @param kind The kind word.
 * @param registry The known kinds (a kind's `template` wins).
 * @param doc The document the cell goes into (for names of existing cells).
 * @returns The body text (possibly empty, for a kind with neither template nor default).
 * @example
 * ```ts
 * import { templateFor } from "./templates.ts";
 * import { parseDocument } from "../document/mod.ts";
 * const doc = parseDocument("~~~table runs\nfrom: a.csv\n~~~\n");
 * if (templateFor("fit", new Map(), doc) !== "on: runs\nmodel: y = a + b*x\n") throw new Error();
 * ```
 */
export function templateFor(kind: string, registry: Registry, doc: ParsedDocument): string {
  const own = registry.get(kind)?.template;
  if (own !== undefined) return own;
  const make = DEFAULTS[kind];
  if (!make) return "";
  return make(namesOf(doc, "table").at(-1) ?? "table1", namesOf(doc, "fit"));
}
