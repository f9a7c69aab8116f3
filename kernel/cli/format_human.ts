/**
 * The human-readable summary of a run: one line a cell, the kind's further
 * lines below it (`details`: a fit's estimates with their uncertainty and
 * interval), errors with their line and column, warnings indented below.
 *
 * @module
 */
import type { RunReport } from "../session/session.ts";
import type { Registry } from "../contract/mod.ts";

/**
 * Formats a run report for a terminal.
 *
 * @param document The document path as given.
 * @param report The run's report.
 * @param registry The kinds, for their `details` lines (optional).
 * @returns Lines of text (no colour codes: the state is a word).
 */
export function formatHuman(
  document: string,
  report: RunReport,
  registry?: Registry,
): string {
  const out: string[] = [`${report.settings.title} (${document})`, ""];
  const wName = Math.max(4, ...report.cells.map((c) => c.name.length));
  const wKind = Math.max(4, ...report.cells.map((c) => c.kind.length));
  for (const c of report.cells) {
    const head = `${c.state.padEnd(9)} ${c.kind.padEnd(wKind)} ${c.name.padEnd(wName)}`;
    if (c.state === "current") {
      out.push(`${head}  ${c.summaryLine ?? ""}`);
      const details = registry?.get(c.kind)?.details?.(c.result as never) ?? [];
      for (const d of details) out.push(`${" ".repeat(10)}${d}`);
    } else if (c.error) {
      out.push(`${head}  line ${c.error.line}:${c.error.column}  ${c.error.message}`);
    } else out.push(head);
    for (const w of c.warnings) out.push(`${" ".repeat(10)}warning: ${w}`);
  }
  for (const e of report.errors) out.push(`document  line ${e.line}:${e.column}  ${e.message}`);
  const count = (s: string) => report.cells.filter((c) => c.state === s).length;
  out.push("", `${count("current")} current, ${count("failed")} failed, ${count("held")} held`);
  return out.join("\n");
}
