/**
 * The analysis document parser: front matter, prose and cells, found by
 * scanning lines and tracking every fenced code block by CommonMark rules
 * (see `_fence.ts`), so a fence shown inside a longer fence is body text.
 *
 * Unclosed fences. A forgotten closing fence is usually noticed only later,
 * when the next cell's opening line is swallowed as body and that cell's
 * closing fence closes the wrong block. So a fenced block is taken as
 * unclosed when, before its closing fence, a line opens a cell fence of the
 * same character and at least the same length: such a fence cannot be nested
 * (its own closing fence would close the outer block), so the author must
 * have forgotten to close. To show a cell inside a block, fence the block
 * with a longer fence (four backticks around three) or with tildes. A block still open at the end of the document is also unclosed.
 * An unclosed block ends just before the next line that opens a cell fence
 * (`<kind> <name>`), so later cells still exist and run; an error is recorded
 * at its opening fence (and on the cell, if it is one).
 *
 * @module
 */
import { LocatedError } from "../errors.ts";
import type { CellBlock, FrontMatter, ParsedDocument, ProseBlock, ProseFence } from "./types.ts";
import { type Line, scanLines } from "./_lines.ts";
import { type CellWords, cellWords, isClosing, matchOpening, type Opening } from "./_fence.ts";
import { lineColumnAt } from "./line_column.ts";

const FM_OPEN = /^---[ \t]*$/;
const FM_CLOSE = /^(---|\.\.\.)[ \t]*$/;
const NO_FENCE: Opening = { char: "`", length: 0, indent: 0, info: "", infoStart: 0 };

function text(source: string, line: Line): string {
  return source.slice(line.start, line.contentEnd);
}

function readFrontMatter(doc: ParsedDocument, lines: Line[]): number {
  const { source } = doc;
  if (lines.length === 0 || !FM_OPEN.test(text(source, lines[0]))) return 0;
  for (let j = 1; j < lines.length; j++) {
    if (!FM_CLOSE.test(text(source, lines[j]))) continue;
    const fm: FrontMatter = {
      line: 1,
      start: lines[0].start,
      end: lines[j].end,
      bodyStart: lines[1].start,
      bodyEnd: lines[j].start,
      raw: source.slice(lines[1].start, lines[j].start),
    };
    doc.frontMatter = fm;
    return j + 1;
  }
  doc.errors.push(
    new LocatedError(
      "Unclosed front matter: the `---` on line 1 has no closing `---` line",
      lineColumnAt(doc, lines[0].start),
    ),
  );
  return 0;
}

/** Whether line `j` opens a cell fence that cannot be nested inside `open`. */
function forgotClose(source: string, line: Line, open: Opening): boolean {
  const o = matchOpening(source, line);
  return o !== null && o.char === open.char && o.length >= open.length && cellWords(o) !== null;
}

/** Where a fenced block that opens on line `i` ends: body end, block end, next line index. */
function blockExtent(source: string, lines: Line[], i: number, open: Opening) {
  let k = lines.length;
  for (let j = i + 1; j < lines.length; j++) {
    if (isClosing(source, lines[j], open)) {
      return { closed: true, bodyEnd: lines[j].start, end: lines[j].end, next: j + 1 };
    }
    if (forgotClose(source, lines[j], open)) {
      k = j;
      break;
    }
  }
  if (k === lines.length) {
    k = i + 1;
    while (k < lines.length && cellWords(matchOpening(source, lines[k]) ?? NO_FENCE) === null) k++;
  }
  const bodyEnd = k < lines.length ? lines[k].start : source.length;
  return { closed: false, bodyEnd, end: bodyEnd, next: k };
}

function unclosed(doc: ParsedDocument, open: Opening, what: string, at: number): LocatedError {
  const pos = lineColumnAt(doc, at);
  const close = open.char.repeat(open.length);
  return new LocatedError(
    `Unclosed fence: ${what} opened at line ${pos.line} has no closing ${close}`,
    pos,
  );
}

type Extent = ReturnType<typeof blockExtent>;

function makeCell(doc: ParsedDocument, line: Line, open: Opening, words: CellWords, ext: Extent) {
  const at = line.start + open.indent;
  const pos = lineColumnAt(doc, at);
  const error = ext.closed ? null : unclosed(doc, open, `cell "${words.kind} ${words.name}"`, at);
  if (error !== null) doc.errors.push(error);
  const cell: CellBlock = {
    type: "cell",
    kind: words.kind,
    name: words.name,
    line: pos.line,
    column: pos.column,
    bodyLine: pos.line + 1,
    start: line.start,
    end: ext.end,
    bodyStart: line.end,
    bodyEnd: ext.bodyEnd,
    body: doc.source.slice(line.end, ext.bodyEnd),
    fence: { char: open.char, length: open.length, indent: open.indent },
    kindStart: words.kindStart,
    nameStart: words.nameStart,
    error,
  };
  return cell;
}

/**
 * Parses an analysis document: optional YAML front matter (first line `---`,
 * after an optional BOM, closed by `---` or `...`), then prose and cells. A
 * cell is a fenced block whose info string is exactly `<kind> <name>` (kind
 * `/^[a-z][a-z0-9_-]*$/`, name `/^[A-Za-z_][A-Za-z0-9_-]*$/`); every other
 * fenced block stays in the prose. Kinds are not checked and duplicate names
 * are not reported: the kernel does both.
 *
 * @param source The document text, any line endings.
 * @returns The parts, contiguous and lossless; structural problems in `errors`
 *   (never thrown).
 * @example
 * ```ts
 * import { parseDocument } from "./mod.ts";
 * const doc = parseDocument("Intro\n\n~~~fit line\non: cycles\n~~~\n");
 * const cell = doc.blocks[1];
 * if (cell.type !== "cell" || cell.name !== "line" || cell.body !== "on: cycles\n") {
 *   throw new Error("expected the fit cell");
 * }
 * ```
 */
export function parseDocument(source: string): ParsedDocument {
  const bom = source.charCodeAt(0) === 0xfeff;
  const doc: ParsedDocument = { source, bom, frontMatter: null, blocks: [], errors: [] };
  const lines = scanLines(source, bom ? 1 : 0);
  let i = readFrontMatter(doc, lines);
  let proseStart = i < lines.length ? lines[i].start : source.length;
  let fences: ProseFence[] = [];
  const flush = (upTo: number) => {
    if (upTo > proseStart) {
      const prose: ProseBlock = {
        type: "prose",
        line: lineColumnAt(doc, proseStart).line,
        start: proseStart,
        end: upTo,
        text: source.slice(proseStart, upTo),
        fences,
      };
      doc.blocks.push(prose);
    }
    fences = [];
  };
  while (i < lines.length) {
    const line = lines[i];
    const open = matchOpening(source, line);
    if (open === null) {
      i++;
      continue;
    }
    const ext = blockExtent(source, lines, i, open);
    const words = cellWords(open);
    const fence = { char: open.char, length: open.length, indent: open.indent };
    const at = line.start + open.indent;
    if (words === null) {
      fences.push({
        line: lineColumnAt(doc, at).line,
        start: line.start,
        end: ext.end,
        info: open.info,
        fence,
      });
      if (!ext.closed) doc.errors.push(unclosed(doc, open, "code block", at));
    } else {
      flush(line.start);
      doc.blocks.push(makeCell(doc, line, open, words, ext));
      proseStart = ext.end;
    }
    i = ext.next;
  }
  flush(source.length);
  return doc;
}
