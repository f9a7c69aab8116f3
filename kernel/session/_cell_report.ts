/**
 * A cell's report as a run settles it, in one of three shapes:
 *
 * ```
 *  static error (parse, graph, file) ──▶ failedReport   state failed, located error
 *  an input not current              ──▶ heldReport     state held, which input and why
 *  an answer (computed or cached)    ──▶ answerReport   state current (result) or failed
 * ```
 *
 * @module
 */
import type { CellNode } from "../graph/build.ts";
import type { Outcome } from "./_run_parts.ts";
import type { CellReport } from "./types.ts";

type Position = { message: string; line: number; column: number };

/** The fields every report starts from: the cell's name, kind, line and parse warnings. */
function base(node: CellNode) {
  return {
    name: node.name,
    kind: node.kind,
    line: node.line,
    inputs: node.deps,
    warnings: [...node.warnings],
    result: null,
    summaryLine: null,
    ms: 0,
    cached: false,
  };
}

/**
 * The report of a cell that cannot run (its options, a reference, a file).
 *
 * @param node The cell.
 * @param error The located error.
 * @returns The failed report.
 */
export function failedReport(node: CellNode, error: Position): CellReport {
  return { ...base(node), state: "failed", error };
}

/**
 * The report of a cell held because an input is not current. The message
 * says why (`input "t" is failed`); the state says held, and each reader
 * (the page, the terminal) shows the word itself.
 *
 * @param node The cell.
 * @param why The reason.
 * @returns The held report, located at the cell's fence.
 */
export function heldReport(node: CellNode, why: string): CellReport {
  return { ...base(node), state: "held", error: { message: why, line: node.line, column: 1 } };
}

/**
 * The report of a cell's answer: current with its result, or failed with its
 * error located in the cell's options.
 *
 * @param node The cell.
 * @param key The cell's cache key.
 * @param outcome The answer and the shape of its page copy.
 * @param cached True when this run reused the answer.
 * @returns The report.
 */
export function answerReport(
  node: CellNode,
  key: string,
  outcome: Outcome,
  cached: boolean,
): CellReport {
  const d = outcome.done;
  const own = base(node);
  const warnings = [...own.warnings, ...d.warnings.filter((w) => !own.warnings.includes(w))];
  if (!d.ok) {
    const err = d.error!;
    const message = err.internal
      ? `Internal error in cell "${node.name}": ${err.message}`
      : err.message;
    const error = { message, ...node.locate(err.path ?? [], err.offset) };
    return { ...own, state: "failed", error, warnings, ms: d.ms, cached };
  }
  const report: CellReport = {
    ...own,
    state: "current",
    error: null,
    warnings,
    result: d.summary,
    summaryLine: d.line ?? null,
    ms: d.ms,
    cached,
    ...(d.omitted && d.omitted.length > 0 ? { omitted: d.omitted } : {}),
    ...(d.kept !== undefined ? { kept: d.kept } : {}),
  };
  if (d.summaryJson !== undefined) {
    const id = outcome.shape ? `${key}+${outcome.shape}` : key;
    withPageText(report, d.summaryJson, id);
  }
  return report;
}

/** Gives a report its page text, and a `result` parsed from that text when first read. */
function withPageText(report: CellReport, json: string, id: string): void {
  report.page = { json, id };
  let parsed: unknown;
  let read = false;
  Object.defineProperty(report, "result", {
    enumerable: true,
    get() {
      if (!read) [parsed, read] = [JSON.parse(json), true];
      return parsed;
    },
  });
}
