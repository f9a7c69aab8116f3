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

/** One cell with `n` keys (issue 11 #7: 50,000 took 23 s with the package's `uniqueKeys`). */
function manyKeys(n: number): string {
  const keys = Array.from({ length: n }, (_, i) => `  k${i}: m\n`).join("");
  return `${F}table t\nfrom: t.csv\nunits:\n${keys}${F}\n`;
}

const keys9k = parseDocument(manyKeys(9_000));
const keys100k = parseDocument(manyKeys(100_000));

Deno.bench("parseOptions() on one cell of 9,000 keys", { group: "keys" }, () => {
  parseOptions(cellsOf(keys9k)[0], keys9k);
});

Deno.bench("parseOptions() refusing one cell of 100,000 keys", { group: "keys" }, () => {
  parseOptions(cellsOf(keys100k)[0], keys100k);
});
