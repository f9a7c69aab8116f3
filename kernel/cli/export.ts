/**
 * `plumb export <document.md> [-o <file>] [--pdf] [--paper a4|letter]`: runs
 * the document and writes its static record, one self-contained HTML file
 * (DESIGN.md §8), or that record printed to PDF by headless Chromium.
 *
 * The record is drawn by the product's record module (`Product.recordUrl`,
 * ui/record: the kinds' page faces), loaded only by this command, so the
 * kernel stays free of UI code and `plumb run` of any UI library.
 *
 * Least privilege, as `new`: the `plumb` command may not write; `export`
 * relaunches itself allowed to read, to write the output's folder only,
 * to read `SOURCE_DATE_EPOCH`, and with `--pdf` to run the browser:
 *
 * ```
 *  plumb export notes/leak.md -o out/leak.html
 *     │ relaunches:
 *     ▼
 *  deno run --no-prompt --allow-read --allow-write=<out> --allow-env=SOURCE_DATE_EPOCH,…
 *           --allow-run=<deno>[,<chromium>] main.ts export … --narrowed
 * ```
 *
 * Exit status: 0 with every cell current, 1 when the record lists a failed
 * or held cell (it is written all the same), 2 when nothing was written.
 *
 * @module
 */
import { basename, dirname, join } from "node:path";
import { Session } from "../session/session.ts";
import { documentTrouble, fileTrouble, fromCaller } from "./caller.ts";
import type { Product } from "./product.ts";
import { recordHere } from "./run.ts";
import { historyPath, historyTempPath } from "../history/mod.ts";
import { mayRelaunch, relaunch } from "./relaunch.ts";
import { findChromium, printToPdf } from "./print_pdf.ts";
import type { RecordModule } from "../server/record_route.ts";

const USAGE = "Usage: plumb export <document.md> [-o <record.html>] [--pdf] [--paper a4|letter]";

interface ExportArgs {
  doc: string;
  out: string | null;
  pdf: boolean;
  paper: "a4" | "letter" | undefined;
  narrowed: boolean;
}

function parseArgs(args: string[]): ExportArgs | string {
  const a: ExportArgs = { doc: "", out: null, pdf: false, paper: undefined, narrowed: false };
  const docs: string[] = [];
  for (let i = 0; i < args.length; i++) {
    const x = args[i];
    if (x === "--pdf") a.pdf = true;
    else if (x === "--narrowed") a.narrowed = true;
    else if (x === "-o" || x === "--output") {
      if (args[i + 1] === undefined) return `Option "${x}" needs a file name`;
      a.out = args[++i];
    } else if (x === "--paper") {
      const p = args[++i]?.toLowerCase();
      if (p !== "a4" && p !== "letter") return `Option "--paper" takes a4 or letter: got "${p}"`;
      a.paper = p;
    } else if (x.startsWith("-")) return `Unknown option "${x}" (${USAGE.toLowerCase()})`;
    else docs.push(x);
  }
  if (docs.length !== 1) return USAGE;
  a.doc = docs[0];
  return a;
}

/**
 * Runs `plumb export`.
 *
 * @param args Arguments after `export`.
 * @param product The kinds, the worker, the entry module and the record module.
 * @returns The exit status.
 */
export async function exportCommand(args: string[], product: Product): Promise<number> {
  const a = parseArgs(args);
  if (typeof a === "string") {
    console.error(a);
    return 2;
  }
  const doc = fromCaller(a.doc);
  const trouble = await documentTrouble(a.doc, doc);
  if (trouble) {
    console.error(trouble);
    return 2;
  }
  const ext = a.pdf ? ".pdf" : ".html";
  const out = a.out === null
    ? join(dirname(doc), `${basename(doc).replace(/\.[^.]*$/, "")}.record${ext}`)
    : fromCaller(a.out);
  const chromium = a.pdf ? findChromium() : null;
  if (a.pdf && chromium === null) {
    console.error(
      "Cannot print to PDF: no Chromium found (apt-get install -y chromium on Debian); " +
        "plumb export without --pdf writes the HTML record, which any browser prints",
    );
    return 2;
  }
  const mayWrite =
    Deno.permissions.querySync({ name: "write", path: dirname(out) }).state === "granted";
  const hist = historyPath(doc);
  const mayWriteHistory =
    Deno.permissions.querySync({ name: "write", path: hist }).state === "granted";
  if (!mayWrite || (!mayWriteHistory && !a.narrowed && mayRelaunch())) {
    return await relaunchToWrite(
      args,
      product,
      [dirname(out), hist, historyTempPath(hist)],
      chromium,
      a.narrowed,
    );
  }
  return await writeRecord(a, doc, out, chromium, product);
}

async function relaunchToWrite(
  args: string[],
  product: Product,
  folders: string[],
  chromium: string | null,
  narrowed: boolean,
): Promise<number> {
  const folder = folders[0];
  if (narrowed || !mayRelaunch()) {
    console.error(
      `Cannot write the record: Plumb was not given permission to write to "${folder}"`,
    );
    return 2;
  }
  return await relaunch(product, [
    "--allow-read",
    `--allow-write=${folders.join(",")}`,
    "--allow-env=SOURCE_DATE_EPOCH,LOG_TOKENS,LOG_STREAM,INIT_CWD",
    // calc cells run in child processes of this Deno (kernel/sandbox); Chromium prints the PDF.
    `--allow-run=${[Deno.execPath(), ...(chromium === null ? [] : [chromium])].join(",")}`,
  ], ["export", ...args, "--narrowed"]);
}

async function writeRecord(
  a: ExportArgs,
  doc: string,
  out: string,
  chromium: string | null,
  product: Product,
): Promise<number> {
  const bytes = await Deno.readFile(doc);
  let source: string;
  try {
    source = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    console.error(`Cannot read document "${a.doc}": not valid UTF-8`);
    return 2;
  }
  // Loading the record's modules (Markdown, math, charts: about half a second) overlaps the
  // run, which computes on the worker's thread.
  const loading = import(product.recordUrl.href) as Promise<RecordModule>;
  loading.catch(() => {}); // awaited below; an early failure is not unhandled meanwhile
  const session = new Session({
    registry: product.registry,
    workerUrl: product.workerUrl,
    dir: dirname(doc),
    page: true,
    history: true,
  });
  let html: string, ok: boolean;
  try {
    const started = Date.now();
    const report = await session.run(source);
    const hist = historyPath(doc);
    const mayWrite = Deno.permissions.querySync({ name: "write", path: hist }).state === "granted";
    const recorded = await recordHere(doc, bytes, report, product, mayWrite);
    const record = await loading;
    const input = await record.gatherRecord({
      path: a.doc,
      bytes,
      source,
      report,
      startedMs: started,
      durationMs: Date.now() - started,
      sourceDateEpoch: envEpoch(),
      changes: recorded ? { report: recorded.report, notes: recorded.notes } : null,
    });
    html = record.renderRecord(input, { paper: a.paper ?? (a.pdf ? "a4" : undefined) });
    ok = report.cells.every((c) => c.state === "current");
  } finally {
    session.close();
  }
  try {
    if (chromium === null) await Deno.writeTextFile(out, html);
    else await printToPdf(chromium, html, out);
  } catch (err) {
    console.error(`Cannot write the record "${a.out ?? basename(out)}": ${fileTrouble(err)}`);
    return 2;
  }
  console.log(`Wrote ${a.out ?? out}${ok ? "" : " (not every cell computed: see its banner)"}`);
  return ok ? 0 : 1;
}

function envEpoch(): string | undefined {
  const allowed = Deno.permissions.querySync({ name: "env", variable: "SOURCE_DATE_EPOCH" });
  return allowed.state === "granted" ? Deno.env.get("SOURCE_DATE_EPOCH") : undefined;
}
