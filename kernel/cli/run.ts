/**
 * `plumb run`: one headless run of a document, printed for people or as RUN-JSON.
 *
 * @module
 */
import { basename, dirname } from "node:path";
import { VERSION } from "../version.ts";
import { writeJson as writeJsonStream } from "./json_stream.ts";
import { type RunReport, Session } from "../session/session.ts";
import {
  findInlineRefs,
  nearMissFences,
  type ParsedDocument,
  parseDocument,
  readSettings,
  resolveValue,
} from "../document/mod.ts";
import { fileTrouble, fromCaller } from "./caller.ts";
import { sha256Hex } from "../hash.ts";
import { historyPath, type Recorded, recordRun } from "../history/mod.ts";
import { relaunch } from "./relaunch.ts";
import { historyPermissions, mayWrite, parseRunArgs, relaunchesForHistory } from "./run_args.ts";
import { formatHuman } from "./format_human.ts";
import { progressOnStderr } from "./progress.ts";
import type { Product } from "./product.ts";

/**
 * The RUN-JSON object of a run (../shared/RUN-JSON.md).
 *
 * @param document The document path as given.
 * @param report The session's report.
 * @returns Plain JSON data.
 */
export function runJson(
  document: string,
  report: RunReport,
  warnings: readonly Located[] = [],
): Record<string, unknown> {
  return {
    plumb: VERSION,
    document,
    ok: succeeded(report),
    cells: report.cells.map((c) => ({
      name: c.name,
      kind: c.kind,
      state: c.state,
      line: c.line,
      error: c.error,
      warnings: c.warnings,
      result: c.state === "current" ? c.result : null,
      ...(c.state === "current" && c.omitted ? { omitted: c.omitted } : {}),
    })),
    document_errors: report.errors,
    document_warnings: warnings,
  };
}

/** A message placed in the document. */
type Located = { message: string; line: number; column: number };

/** Every cell current and no error outside cells (front matter, inline references). */
function succeeded(report: RunReport): boolean {
  return report.errors.length === 0 && report.cells.every((c) => c.state === "current");
}

/**
 * Inline values the page could not show, as document errors: each
 * `@(cell.field)` of a computed cell is resolved as the page and the record
 * resolve it (an unknown field, a list, a name that is both a field and a
 * parameter); a reference to a failed or held cell is that cell's error.
 */
export function inlineValueErrors(doc: ParsedDocument, report: RunReport): Located[] {
  const cells = new Map(report.cells.map((c) => [c.name, c]));
  const out: Located[] = [];
  for (const block of doc.blocks) {
    if (block.type !== "prose") continue;
    for (const ref of findInlineRefs(block).refs) {
      const cell = cells.get(ref.cell);
      if (cell?.state !== "current") continue;
      const r = resolveValue(cell.result, ref.cell, ref.path, ref.digits ?? null);
      if (!r.ok) {
        const written = doc.source.slice(ref.start, ref.end);
        out.push({
          message: `Inline value ${written}: ${r.error}`,
          line: ref.line,
          column: ref.column,
        });
      }
    }
  }
  return out;
}

/** Code blocks that were almost cells (`Fit power`, `fit` with no name), as warnings. */
function fenceWarnings(doc: ParsedDocument, product: Product): Located[] {
  const kinds = [...product.registry.keys()];
  return nearMissFences(doc, kinds).map((w) => ({
    message: w.message,
    line: w.pos.line,
    column: w.pos.column,
  }));
}

/**
 * Writes RUN-JSON to standard output as it is walked (json_stream.ts: the
 * text of `JSON.stringify(value, null, 2)`, per-row arrays written number by
 * number into one reused buffer, never one string of the whole result).
 * Non-finite numbers become null (JSON has neither).
 */
async function writeJson(value: unknown): Promise<void> {
  await writeJsonStream(value, Deno.stdout);
}

/**
 * Runs `plumb run` with its arguments. The run history is written beside the
 * document: a process that may not write there relaunches itself allowed to
 * write the history file (and its temporary twin) only; one that may not
 * relaunch either runs without writing and says so.
 *
 * @param args Arguments after `run`.
 * @param product The kinds and the worker entry.
 * @returns The exit status.
 */
export async function runCommand(args: string[], product: Product): Promise<number> {
  const a = parseRunArgs(args);
  if (typeof a === "string") {
    console.error(a);
    return 2;
  }
  const path = a.path;
  const file = fromCaller(path);
  let bytes: Uint8Array;
  let source: string;
  try {
    bytes = await Deno.readFile(file);
    source = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch (err) {
    const why = err instanceof TypeError ? "not valid UTF-8" : fileTrouble(err);
    console.error(`Cannot read document "${path}": ${why}`);
    return 2;
  }
  const hist = historyPath(file);
  const wantHistory = a.history && (readSettings(parseDocument(source)).settings.history ?? 1) > 0;
  if (wantHistory && relaunchesForHistory(a, hist)) {
    return await relaunch(product, historyPermissions(hist), ["run", ...args, "--narrowed"]);
  }
  const session = new Session({
    registry: product.registry,
    workerUrl: product.workerUrl,
    dir: dirname(file),
    history: wantHistory,
    // The summary shows no per-row values: they never leave the compute worker.
    lean: !a.json || a.withoutRows,
    // One run: each data file's bytes are let go once the cells reading it have settled.
    once: true,
    // Long cells (a search of many candidates) say how far they are, on standard error.
    onEvent: progressOnStderr(),
  });
  try {
    const report = await session.run(source);
    // One parse of the text for both checks made after the run (the session keeps its own).
    const doc = parseDocument(source);
    report.errors.push(...inlineValueErrors(doc, report));
    const warnings = fenceWarnings(doc, product);
    const recorded = wantHistory
      ? await recordHere(file, bytes, report, product, mayWrite(hist))
      : null;
    if (a.json) {
      const out = runJson(path, report, warnings);
      if (recorded) out.history = historyJson(recorded);
      await writeJson(out);
    } else {
      // Before the blank line and the counts that end the summary.
      const human = formatHuman(path, report, product.registry).split("\n");
      const lines = warnings.map((w) => `warning   line ${w.line}:${w.column}  ${w.message}`);
      if (recorded) lines.push(...historyLines(recorded, path));
      human.splice(human.length - 2, 0, ...lines);
      console.log(human.join("\n"));
    }
    return succeeded(report) ? 0 : 1;
  } finally {
    session.close();
  }
}

/**
 * Records a run in the document's history, or, without leave to write there,
 * reports against the history as it is (the run held in memory) and says so.
 *
 * @param file The document's file.
 * @param bytes Its bytes as run.
 * @param report The run's report (made with the session's `history: true`).
 * @param product The kinds.
 * @param mayWrite Whether this process may write the history file.
 * @returns What was recorded and reported; null when the document says `history: off`.
 */
export async function recordHere(
  file: string,
  bytes: Uint8Array,
  report: RunReport,
  product: Product,
  mayWrite: boolean,
): Promise<Recorded | null> {
  const inputs = new Map(report.cells.map((c) => [c.name, c.inputs ?? []]));
  const opts = {
    document: file,
    documentSha256: await sha256Hex(bytes),
    report,
    registry: product.registry,
    inputsOf: (cell: string) => inputs.get(cell) ?? [],
  };
  if (mayWrite) return await recordRun(opts);
  const r = await recordRun({ ...opts, dryRun: true });
  if (r) {
    r.notes.unshift(
      `The run history ${
        basename(r.path)
      } was not written: Plumb may not write beside the document`,
    );
  }
  return r;
}

/** The run history's part of RUN-JSON (`history`). */
function historyJson(r: Recorded): Record<string, unknown> {
  return {
    path: r.path,
    written: r.written,
    records: r.records,
    notes: r.notes,
    changes: r.report === null ? null : {
      from: r.report.from,
      to: r.report.to,
      baseline: r.report.baseline,
      sentences: r.report.sentences,
    },
  };
}

/** The run history's lines in the summary: what changed since the previous data revision. */
export function historyLines(r: Recorded, document: string, most = 8): string[] {
  const out: string[] = [];
  for (const n of r.notes) out.push(`history   ${n}`);
  const rep = r.report;
  if (rep === null || rep.sentences.length === 0) return out;
  out.push(
    `changes   since ${
      rep.baseline === "previous data revision" ? "the last data" : "the last run"
    }, ${humanTime(rep.from.time)} (plumb changes ${document}):`,
  );
  for (const s of rep.sentences.slice(0, most)) out.push(`${" ".repeat(10)}${s}`);
  if (rep.sentences.length > most) {
    out.push(`${" ".repeat(10)}and ${rep.sentences.length - most} more`);
  }
  return out;
}

/** `2026-12-04T18:55:02.123Z` as `2026-12-04 18:55 UTC`. */
export function humanTime(iso: string): string {
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;
}
