/**
 * The documents of the side-by-side benchmark (issue 16), written beside
 * the data file:
 *
 * - the five-cell document: a `table` of the CSV, a ten-predictor `fit`,
 *   its `check`, a five-predictor `fit` and a `compare` of the two;
 * - the same `table` alone, and a document with no cell: the difference of
 *   their run times is the ingest (reading, hashing and parsing the file),
 *   start-up taken out.
 *
 * @module
 */
import { PREDICTORS } from "./generate.ts";

const F = "```";

function front(title: string): string {
  return `---\ntitle: ${title}\n---\n\n`;
}

function table(csv: string): string {
  return `${F}table data\nfrom: ${csv}\n${F}\n`;
}

function linear(k: number): string {
  return Array.from({ length: k }, (_, i) => `x${i + 1}`).join(", ");
}

/**
 * The five-cell document.
 *
 * @param csv The data file's name, relative to the document.
 * @param rows Its rows (for the title).
 * @returns The document's text.
 */
export function fiveCellDocument(csv: string, rows: number): string {
  return [
    front(`Ten predictors, ${rows} rows`),
    table(csv),
    `${F}fit all\non: data\nmodel: y = linear(${linear(PREDICTORS)})\n${F}\n`,
    `${F}check all-check\nfit: all\n${F}\n`,
    `${F}fit first-five\non: data\nmodel: y = linear(${linear(5)})\n${F}\n`,
    `${F}compare ten-or-five\nfits: [all, first-five]\n${F}\n`,
  ].join("\n");
}

/**
 * The table alone.
 *
 * @param csv The data file's name, relative to the document.
 * @returns The document's text.
 */
export function tableOnlyDocument(csv: string): string {
  return front("The table alone") + table(csv);
}

/** A document with no cell: what a run costs before it reads anything. */
export const EMPTY_DOCUMENT = front("No cells") + "Start-up only.\n";

/**
 * The command that runs a document as the benchmark does: `plumb run` with
 * the Deno running this, no npx, no task runner, no run history.
 *
 * @param root The root folder of the repository whose `plumb` runs.
 * @param doc The document's path (relative to the working folder the command gets).
 * @param extra Further arguments of `plumb run`, such as `--json`.
 * @returns The program and its arguments.
 */
export function plumbRunCommand(root: URL, doc: string, ...extra: string[]): string[] {
  return [
    Deno.execPath(),
    "run",
    `--config=${new URL("deno.json", root).pathname}`,
    "--allow-read",
    "--allow-env=LOG_TOKENS,LOG_STREAM",
    new URL("cells/main.ts", root).pathname,
    "run",
    doc,
    "--no-history",
    ...extra,
  ];
}
