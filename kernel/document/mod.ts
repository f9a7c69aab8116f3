/**
 * The analysis document layer: parse a Markdown analysis document into front
 * matter, prose and cells; write it back byte for byte; edit one cell with
 * minimal changes; read cell options and document settings with positions;
 * find inline references in prose. Pure functions: no disk, no network.
 *
 * ```
 *  text ──parseDocument──▶ ParsedDocument ──writeDocument──▶ same text
 *                            │   ├─ replaceCellBody / insertCell / removeCell ──▶ new text
 *                            │   ├─ parseOptions(cell) ──▶ options + locate(path)
 *                            │   ├─ readSettings ──▶ DocSettings
 *                            │   └─ findInlineRefs(prose) ──▶ @(cell.field, digits)
 *                            └─ lineColumnAt(offset) ──▶ line, column
 * ```
 *
 * @example
 * ```ts
 * import { parseDocument, parseOptions, writeDocument } from "./mod.ts";
 * const src = "---\ntitle: Fade\n---\n\n~~~fit line\non: cycles\nmodel: capacity = q0 + a*cycle\n~~~\n";
 * const doc = parseDocument(src);
 * if (writeDocument(doc) !== src) throw new Error("not lossless");
 * const cell = doc.blocks.find((b) => b.type === "cell");
 * if (cell?.type !== "cell") throw new Error("no cell");
 * const { options, locate } = parseOptions(cell, doc);
 * if (options.on !== "cycles" || locate(["model"]).line !== 7) throw new Error("unexpected");
 * ```
 *
 * @module
 */
export type {
  CellBlock,
  Fence,
  FrontMatter,
  ParsedDocument,
  ProseBlock,
  ProseFence,
  SourcePos,
} from "./types.ts";
export { parseDocument } from "./parse_document.ts";
export { writeDocument } from "./write_document.ts";
export { lineColumnAt } from "./line_column.ts";
export { cellsOf } from "./cells_of.ts";
export { replaceCellBody } from "./replace_cell_body.ts";
export { type InsertAt, insertCell } from "./insert_cell.ts";
export { removeCell } from "./remove_cell.ts";
export { type CellOptions, parseOptions } from "./parse_options.ts";
export { DEFAULT_SETTINGS, readSettings, type SettingsResult } from "./read_settings.ts";
export { findInlineRefs, type InlineRef } from "./inline_refs.ts";
export { formatValue, type Resolved, resolveValue } from "./inline_value.ts";
export { nearMissFences } from "./near_miss_fences.ts";
