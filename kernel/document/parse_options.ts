/**
 * A cell's YAML options with a source map: option paths (and offsets inside
 * text values) to document lines and columns.
 *
 * @module
 */
import { isAlias, isMap, isPair, isScalar, isSeq, type Node } from "yaml";
import type { LocatedError, OptionPath, SourcePos } from "../errors.ts";
import type { CellBlock, ParsedDocument } from "./types.ts";
import { parseYamlRegion, type YamlRegion } from "./_yaml.ts";
import { scalarOffset } from "./_scalar_offset.ts";
import { lineColumnAt } from "./line_column.ts";

/** A cell's options, the problems found reading them, and their positions. */
export interface CellOptions {
  /** The body as plain data; `{}` for an empty body or when there are errors. */
  options: Record<string, unknown>;
  /** YAML syntax errors, repeated keys, a body that is not a mapping. */
  errors: LocatedError[];
  /**
   * The document position of the option at `path`.
   *
   * @param path Keys and list indexes, e.g. `["exclude", 0, "why"]`; `[]` is the fence.
   * @param offset Character offset inside a text value (see `_scalar_offset.ts`).
   * @returns The value's position; the key's when the value is empty; the
   *   nearest existing ancestor's when the path does not exist.
   */
  locate(path: OptionPath, offset?: number): SourcePos;
}

/** A parsed node's `[start, valueEnd]` (parsed nodes always carry a range). */
function span(node: unknown): [number, number] {
  const r = (node as Node | null)?.range;
  return r ? [r[0], r[1]] : [-1, -1];
}

/** Where a path leads: the deepest node reached and whether the whole path was found. */
function walk(region: YamlRegion, path: OptionPath): { at: number; node: Node | null } {
  let node: unknown = region.yaml.contents;
  let at = -1;
  for (const step of path) {
    if (isAlias(node)) node = node.resolve(region.yaml);
    let next: unknown = undefined;
    if (isMap(node)) {
      const pair = node.items.find((p) =>
        isPair(p) && isScalar(p.key) && String(p.key.value) === String(step)
      );
      if (pair === undefined) return { at, node: null };
      const v = pair.value;
      if (v === null || isScalar(v) && v.value === null && span(v)[0] === span(v)[1]) {
        return { at: span(pair.key)[0], node: null };
      }
      next = v;
    } else if (isSeq(node) && typeof step === "number") next = node.items[step];
    if (next === undefined || next === null) return { at, node: null };
    node = next;
    at = span(node)[0];
  }
  return { at, node: path.length === 0 ? null : node as Node };
}

/**
 * Parses a cell's body as YAML options. An empty (or comments-only) body
 * gives `{}`; a body that is not a mapping, a repeated key or a YAML syntax
 * error is reported in `errors` at its document line and column (never thrown).
 *
 * @param cell A cell of `doc`.
 * @param doc The parsed document the cell belongs to.
 * @returns Options, errors and a `locate` source map.
 * @example
 * ```ts
 * import { parseDocument, parseOptions } from "./mod.ts";
 * const doc = parseDocument("~~~table t\nexclude:\n  - rows: [4]\n    why: loose probe\n~~~\n");
 * const cell = doc.blocks[0];
 * if (cell.type !== "cell") throw new Error("expected a cell");
 * const { locate } = parseOptions(cell, doc);
 * const pos = locate(["exclude", 0, "why"], 6);
 * if (pos.line !== 4 || pos.column !== 16) throw new Error(JSON.stringify(pos));
 * ```
 */
export function parseOptions(cell: CellBlock, doc: ParsedDocument): CellOptions {
  const region = parseYamlRegion(doc, cell.bodyStart, cell.bodyEnd, {
    invalid: (d) => `Options of cell "${cell.name}" are not valid YAML: ${d}`,
    repeat: (k) => `Options of cell "${cell.name}" repeat key "${k}": each key may appear once`,
    notMapping: `Options of cell "${cell.name}" must be a YAML mapping of key: value`,
    tooMany: (limit) =>
      `Options of cell "${cell.name}" have more than ${limit} keys: put large data in a file beside the document`,
  });
  const fencePos = { line: cell.line, column: cell.column };
  const locate = (path: OptionPath, offset?: number): SourcePos => {
    const { at, node } = walk(region, path);
    if (at < 0) return fencePos;
    let local = at;
    const [from, to] = span(node);
    if (offset !== undefined && isScalar(node) && to > from) {
      const raw = region.text.slice(from, to);
      local = at + scalarOffset(raw, node.type, Math.max(0, offset));
    }
    return lineColumnAt(doc, region.toSource(local));
  };
  return { options: region.data, errors: region.errors, locate };
}
