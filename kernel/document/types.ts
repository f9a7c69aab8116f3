/**
 * The shapes the document layer hands to the kernel: a parsed analysis
 * document is its source plus a partition of that source into front matter,
 * prose and cells.
 *
 * ```
 *  source ─┬─ BOM (optional, 1 code unit)
 *          ├─ front matter  [start, end)   ---\n yaml \n---\n
 *          └─ blocks        contiguous, covering the rest up to source.length
 *               prose [start, end)                 Markdown text, may hold non-cell fences
 *               cell  [start, end)                 ~~~fit line\n … \n~~~\n
 *                     └─ body [bodyStart, bodyEnd) the YAML (or code) between the fences
 * ```
 *
 * All offsets are UTF-16 code unit indexes into `source`; lines and columns
 * are 1-based (see {@link SourcePos}).
 *
 * @module
 */
import type { LocatedError, SourcePos } from "../errors.ts";

export type { SourcePos };

/** How a fenced block was opened. */
export interface Fence {
  /** The fence character. */
  char: "`" | "~";
  /** Number of fence characters in the opening fence (at least 3). */
  length: number;
  /** Spaces before the opening fence (0 to 3). */
  indent: number;
}

/** A fenced block whose info string is `<kind> <name>`: one analysis cell. */
export interface CellBlock {
  type: "cell";
  /** First word of the info string, e.g. `fit`. Not checked against known kinds. */
  kind: string;
  /** Second word of the info string, e.g. `line`. */
  name: string;
  /** Line of the opening fence. */
  line: number;
  /** Column of the first fence character. */
  column: number;
  /** Line of the first body line (the line after the opening fence). */
  bodyLine: number;
  /** Offset of the opening fence line's first character (its indentation included). */
  start: number;
  /** Offset just past the closing fence line and its line ending. */
  end: number;
  /** Offset of the first body character. */
  bodyStart: number;
  /** Offset just past the body (the start of the closing fence line). */
  bodyEnd: number;
  /** `source.slice(bodyStart, bodyEnd)`, exactly as written (indentation and line endings kept). */
  body: string;
  fence: Fence;
  /** Offset of the kind word in the opening fence line. */
  kindStart: number;
  /** Offset of the name word in the opening fence line. */
  nameStart: number;
  /** Set when the cell is damaged (an unclosed fence); the kernel shows it on the cell. */
  error: LocatedError | null;
}

/** A fenced block inside prose that is not a cell (```python, a bare ```, …). */
export interface ProseFence {
  /** Line of the opening fence. */
  line: number;
  /** Offset of the opening fence line. */
  start: number;
  /** Offset just past the closing fence line (or where an unclosed fence was cut). */
  end: number;
  /** The trimmed info string ("" when none). */
  info: string;
  fence: Fence;
}

/** A run of Markdown between cells (or between the front matter and a cell, or the end). */
export interface ProseBlock {
  type: "prose";
  /** Line of the block's first character. */
  line: number;
  start: number;
  end: number;
  /** `source.slice(start, end)`. */
  text: string;
  /** Non-cell fenced blocks inside this prose, in order; inline references skip them. */
  fences: ProseFence[];
}

/** The YAML front matter: a first line `---`, YAML, then a line `---` (or `...`). */
export interface FrontMatter {
  /** Always 1: front matter opens the document. */
  line: number;
  /** Offset of the opening `---` (just after a BOM, if any). */
  start: number;
  /** Offset just past the closing fence line. */
  end: number;
  /** Offset of the first YAML character. */
  bodyStart: number;
  /** Offset just past the YAML (the start of the closing fence line). */
  bodyEnd: number;
  /** `source.slice(bodyStart, bodyEnd)`: the YAML text. */
  raw: string;
}

/** A document split into its parts; `writeDocument` joins them back byte for byte. */
export interface ParsedDocument {
  source: string;
  /** Whether `source` starts with U+FEFF. */
  bom: boolean;
  frontMatter: FrontMatter | null;
  /** Prose and cells in document order, contiguous, covering everything after the front matter. */
  blocks: (ProseBlock | CellBlock)[];
  /** Structural errors (unclosed fences, unclosed front matter), in document order. */
  errors: LocatedError[];
}
