/**
 * `plumb changes <document.md> [--json] [--since …] [--until …]`: what changed
 * between two records of the document's run history (kernel/history),
 * printed as sentences (notable first) or as the report's JSON
 * (docs/run-json.md, "plumb changes --json"). Reads only: the history is
 * written by `plumb run`, `plumb serve` and `plumb export`.
 *
 * @module
 */
import { basename } from "node:path";
import { parseDocument, readSettings } from "../document/mod.ts";
import { buildGraph } from "../graph/build.ts";
import { ChoiceError, type ReportChoice, reportOf } from "../history/mod.ts";
import type { ChangeReport } from "../history/types.ts";
import { plainDeep } from "../arrays.ts";
import { documentTrouble, fromCaller } from "./caller.ts";
import { humanTime } from "./run.ts";
import type { Product } from "./product.ts";

const USAGE = "Usage: plumb changes <document.md> [--json] [--since <time|record|hash>] " +
  "[--until <time|record|hash>]";

interface ChangesArgs {
  doc: string;
  json: boolean;
  choice: ReportChoice;
}

function parseChangesArgs(args: string[]): ChangesArgs | string {
  const a: ChangesArgs = { doc: "", json: false, choice: {} };
  const docs: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const x = args[i];
    if (x === "--json") a.json = true;
    else if (x === "--since" || x === "--until") {
      const v = args[++i];
      if (v === undefined || v.startsWith("--")) return `${x} needs a time, a record or a hash`;
      a.choice[x === "--since" ? "since" : "until"] = v;
    } else if (x.startsWith("-")) return `Unknown option "${x}"\n${USAGE}`;
    else docs.push(x);
  }
  if (docs.length !== 1) return USAGE;
  a.doc = docs[0];
  return a;
}

/**
 * Runs `plumb changes`.
 *
 * @param args Arguments after `changes`.
 * @param product The kinds (their history faces).
 * @returns 0 with a report or nothing to compare yet; 2 for a usage error,
 *   an unreadable document or a record that does not exist.
 */
export async function changesCommand(args: string[], product: Product): Promise<number> {
  const a = parseChangesArgs(args);
  if (typeof a === "string") {
    console.error(a);
    return 2;
  }
  const file = fromCaller(a.doc);
  const trouble = await documentTrouble(a.doc, file);
  if (trouble) {
    console.error(trouble);
    return 2;
  }
  let inputsOf: ((cell: string) => readonly string[]) | undefined;
  let title = basename(file);
  try {
    const doc = parseDocument(await Deno.readTextFile(file));
    const { settings } = readSettings(doc);
    title = settings.title;
    const graph = buildGraph(doc, product.registry, settings);
    inputsOf = (cell) => graph.byName.get(cell)?.deps ?? [];
  } catch {
    inputsOf = undefined; // the report still reads: every table's rows count for every cell
  }
  let r;
  try {
    r = await reportOf(file, product.registry, a.choice, inputsOf);
  } catch (err) {
    if (err instanceof ChoiceError) {
      console.error(err.message);
      return 2;
    }
    throw err;
  }
  if (a.json) {
    const out = {
      plumb_changes: 1,
      document: a.doc,
      history: r.path,
      records: r.records,
      notes: r.notes,
      report: r.report,
    };
    const bytes = new TextEncoder().encode(JSON.stringify(plainDeep(out), null, 2) + "\n");
    for (let at = 0; at < bytes.length;) at += await Deno.stdout.write(bytes.subarray(at));
    return 0;
  }
  console.log(formatChanges(title, a.doc, r.records, r.report, r.notes).join("\n"));
  return 0;
}

/**
 * The report for a terminal: which records, the data files that changed, the
 * notable sentences, then the rest.
 *
 * @param title The document's title.
 * @param document The document path as given.
 * @param records Records in the history.
 * @param report The report, or null.
 * @param notes What could not be read.
 * @returns Lines of text.
 */
export function formatChanges(
  title: string,
  document: string,
  records: number,
  report: ChangeReport | null,
  notes: readonly string[],
): string[] {
  const out = [`${title} (${document})`, ""];
  for (const n of notes) out.push(`note: ${n}`);
  if (report === null) {
    out.push(
      records === 0
        ? "The run history is empty: plumb run or plumb serve records each run whose inputs changed."
        : "The run history holds one record: there is nothing to compare yet.",
    );
    return out;
  }
  out.push(
    `From ${humanTime(report.from.time)} (${report.baseline}) to ${humanTime(report.to.time)}; ` +
      `${records} records in ${basename(report.history.path)}.`,
  );
  for (const f of report.files) {
    const lines = f.lines_before === null
      ? `new, ${f.lines_after} lines`
      : f.lines_after === null
      ? "no longer read"
      : `${f.lines_before} → ${f.lines_after} lines`;
    out.push(`data      ${f.path}: ${lines}`);
  }
  if (report.document_changed) out.push("document  its text changed");
  const all = report.cells.flatMap((c) => c.changes);
  const notable = all.filter((c) => c.weight === "notable");
  const minor = all.filter((c) => c.weight !== "notable");
  if (all.length === 0) out.push("", "No cell's results changed.");
  if (notable.length > 0) out.push("", "Notable:", ...notable.map((c) => `  - ${c.sentence}`));
  if (minor.length > 0) out.push("", "Also:", ...minor.map((c) => `  - ${c.sentence}`));
  return out;
}
