/**
 * Finds one cell's body in a document source without the kernel's parser
 * (the page gets a whole source in a conflict answer and shows the disk's
 * side of that one cell). A fence opens with 3+ backticks or tildes after at
 * most 3 spaces and the info string `<kind> <name>`; it closes with the same
 * character, at least as many, and nothing else on the line (CommonMark
 * §4.5).
 *
 * @module
 */

/**
 * The body of the cell named `name`, exactly as written.
 *
 * @param source A document's text.
 * @param name The cell's name.
 * @returns The body (the lines between the fences, with their line ends), or
 *   null when no such cell is in the source.
 * @example
 * ```ts
 * import { cellBody } from "./cell_body.ts";
 * const src = "# A\n\n~~~fit line\non: t\nmodel: y = a*x\n~~~\n";
 * if (cellBody(src, "line") !== "on: t\nmodel: y = a*x\n") throw new Error("body");
 * if (cellBody(src, "root") !== null) throw new Error("not there");
 * ```
 */
export function cellBody(source: string, name: string): string | null {
  const lines = source.split(/(?<=\n)/);
  for (let i = 0; i < lines.length; i++) {
    const open = /^ {0,3}(`{3,}|~{3,})[ \t]*([A-Za-z_][\w-]*)[ \t]+([A-Za-z_][\w-]*)[ \t]*\r?\n?$/
      .exec(lines[i]);
    if (open === null) {
      const fence = /^ {0,3}(`{3,}|~{3,})/.exec(lines[i]);
      if (fence !== null) i = closeOf(lines, i, fence[1]);
      continue;
    }
    const end = closeOf(lines, i, open[1]);
    if (open[3] === name) return lines.slice(i + 1, end).join("");
    i = end;
  }
  return null;
}

/** Index of the closing fence line for the fence opened at `i` (lines.length when unclosed). */
function closeOf(lines: string[], i: number, fence: string): number {
  const close = new RegExp(
    `^ {0,3}${fence[0] === "`" ? "`" : "~"}{${fence.length},}[ \\t]*\\r?\\n?$`,
  );
  for (let j = i + 1; j < lines.length; j++) if (close.test(lines[j])) return j;
  return lines.length;
}
