/**
 * Parsing a generated 200-cell document, and reading every cell's options.
 * The document is deterministic: the same cells and bodies on every run.
 */
import { cellsOf, parseDocument, parseOptions, writeDocument } from "./mod.ts";

const F = "`".repeat(3);

function generate(cells: number): string {
  const parts = ["---\ntitle: Benchmark analysis\nconfidence: 0.95\n---\n\n"];
  for (let i = 0; i < cells; i++) {
    parts.push(
      `Paragraph ${i} says the fit explains @(fit${i}.r2, 3) of the variance, with \`code\`.\n\n`,
      `${F}fit fit${i}\non: table${i % 7}\nmodel: y = a + b*x^${(i % 3) + 1}\n` +
        `start: { a: ${i}, b: 0.5 }\nexclude:\n  - rows: [${i}, ${
          i + 1
        }]\n    why: seeded note ${i}\n${F}\n\n`,
    );
  }
  return parts.join("");
}

const source = generate(200);
const doc = parseDocument(source);
if (cellsOf(doc).length !== 200) throw new Error("expected 200 cells");

Deno.bench("parseDocument() on a 200-cell document", { group: "document", baseline: true }, () => {
  parseDocument(source);
});

Deno.bench("writeDocument() on a 200-cell document", { group: "document" }, () => {
  writeDocument(doc);
});

Deno.bench("parseOptions() on all 200 cells", { group: "document" }, () => {
  for (const cell of cellsOf(doc)) parseOptions(cell, doc);
});
