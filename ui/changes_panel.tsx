/**
 * "Since the last data": what changed between the previous data revision and
 * the latest run (kernel/history's change report), in the live page and in
 * the static record. Shown only when there is something to say: a sentence
 * of the report, or a note of what the history could not do. The notable
 * sentences in view, the others behind a disclosure; the numbers behind
 * each sentence on request; the drift of the estimates (ui/drift_section.tsx)
 * last. In the record (no script, read on paper too) the disclosures of the
 * other changes and of the drift stand open.
 *
 * ```
 *  ┃ Since the last data
 *  ┃ Runs compared   2026-12-04 08:00 → 09:30 UTC
 *  ┃ Data            data/batch7.csv 121 → 161 lines (+40)
 *  ┃ • The preferred model of fade changed from root to root-linear: …  numbers ▸
 *  ┃ • root: a moved from 9.882 [9.828, 9.936] to 10.618 …              numbers ▸
 *  ┃ ▸ 8 more changes
 *  ┃ ▸ How the estimates moved over 3 recorded revisions
 * ```
 *
 * @module
 */
import type { VNode } from "preact";
import type { Change } from "../kernel/contract/mod.ts";
import type { ChangeReport, FileChange } from "../kernel/history/types.ts";
import { DriftSection } from "./drift_section.tsx";

/** What the panel shows: the report (or none) and what the history could not do. */
export interface ChangesView {
  report: ChangeReport | null;
  notes: readonly string[];
}

/** One line of the list: a sentence, its weight, the change behind it when the report has one. */
export interface ChangeLine {
  sentence: string;
  weight: Change["weight"];
  change: Change | null;
}

/**
 * The report's sentences in its order (notable first), each with the change
 * it came from. A sentence no cell's change carries is notable when it sits
 * among the notable ones (the report puts them first).
 *
 * @param report The change report.
 * @returns One line per sentence.
 * @example
 * ```ts
 * import { changeLines } from "./changes_panel.tsx";
 * const change = { code: "x", weight: "minor" as const, sentence: "b", numbers: {} };
 * const lines = changeLines({
 *   sentences: ["a", "b"],
 *   cells: [{ name: "c", kind: "k", state_before: null, state_after: null, changes: [change] }],
 * });
 * if (lines[1].change !== change || lines[0].change !== null) throw new Error("matched by sentence");
 * ```
 */
export function changeLines(report: Pick<ChangeReport, "sentences" | "cells">): ChangeLine[] {
  const bySentence = new Map<string, Change[]>();
  for (const c of report.cells.flatMap((x) => x.changes)) {
    bySentence.set(c.sentence, [...bySentence.get(c.sentence) ?? [], c]);
  }
  let notable = true;
  return report.sentences.map((sentence) => {
    const change = bySentence.get(sentence)?.shift() ?? null;
    if (change) notable = change.weight === "notable";
    return { sentence, weight: notable ? "notable" : "minor", change };
  });
}

/**
 * The two runs' times, the date once when both fall on it and the seconds
 * only when both fall in the same minute.
 *
 * @param from The older record's time (ISO 8601, UTC).
 * @param to The newer record's time.
 * @returns Such as `2026-12-04 08:00 → 09:30 UTC`.
 * @example
 * ```ts
 * import { timeSpan } from "./changes_panel.tsx";
 * const s = timeSpan("2026-12-04T08:00:01.000Z", "2026-12-04T08:00:09.000Z");
 * if (s !== "2026-12-04 08:00:01 → 08:00:09 UTC") throw new Error(s);
 * ```
 */
export function timeSpan(from: string, to: string): string {
  const sameMinute = from.slice(0, 16) === to.slice(0, 16);
  const clock = (t: string) => t.slice(11, sameMinute ? 19 : 16);
  const end = from.slice(0, 10) === to.slice(0, 10) ? clock(to) : `${to.slice(0, 10)} ${clock(to)}`;
  return `${from.slice(0, 10)} ${clock(from)} → ${end} UTC`;
}

/** What happened to one data file, in words. */
function fileText(f: FileChange): string {
  if (f.lines_before === null) return `${f.path}: read for the first time, ${f.lines_after} lines`;
  if (f.lines_after === null) return `${f.path}: no longer read`;
  const d = f.lines_after - f.lines_before;
  return d === 0
    ? `${f.path}: same length (${f.lines_after} lines), content changed`
    : `${f.path}: ${f.lines_before} → ${f.lines_after} lines (${d > 0 ? "+" : "−"}${Math.abs(d)})`;
}

/** Which two runs are compared and what differs in their inputs. */
function Compared(props: { report: ChangeReport }): VNode {
  const r = props.report;
  const inputs = r.files.map(fileText);
  if (r.document_changed) inputs.push("the document was edited");
  if (inputs.length === 0) inputs.push("no data file changed");
  const why = r.baseline === "previous data revision" ? null : `(${r.baseline})`;
  return (
    <dl class="pl-changes-compared">
      <dt>Runs compared</dt>
      <dd>
        {timeSpan(r.from.time, r.to.time)} {why && <span class="pl-muted">{why}</span>}
      </dd>
      <dt>Inputs</dt>
      {inputs.map((t) => <dd key={t} class="pl-changes-file">{t}</dd>)}
    </dl>
  );
}

/** A number or small value of a change's `numbers`, as text. */
function valueText(v: unknown): string {
  if (v === null || v === undefined) return "—";
  if (typeof v === "number") return Number.isFinite(v) ? String(Number(v.toPrecision(6))) : "—";
  if (typeof v === "string" || typeof v === "boolean") return String(v);
  if (Array.isArray(v) && v.every((x) => typeof x !== "object" || x === null)) {
    return v.map(valueText).join(", ");
  }
  return JSON.stringify(v);
}

/** The numbers behind a sentence, as a two-column table behind a disclosure. */
function Numbers(props: { change: Change }): VNode | null {
  const entries = Object.entries(props.change.numbers ?? {}).filter(([, v]) => v !== undefined);
  if (entries.length === 0) return null;
  return (
    <details class="pl-change-numbers">
      <summary>numbers</summary>
      <table>
        <tbody>
          {entries.map(([k, v]) => (
            <tr key={k}>
              <th scope="row">{k.replaceAll("_", " ")}</th>
              <td>{valueText(v)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </details>
  );
}

function Line(props: { line: ChangeLine }): VNode {
  const { line } = props;
  return (
    <li class={`pl-change pl-change-${line.weight}`} data-code={line.change?.code}>
      <span class="pl-change-text">{line.sentence}</span>
      {line.change && <Numbers change={line.change} />}
    </li>
  );
}

/** Notable changes in view before the disclosure (about a phone's screen). */
const NOTABLE_SHOWN = 6;

/**
 * The panel, or nothing when there is nothing to say.
 *
 * @param props The report and notes; `open` opens the disclosures (the record).
 * @returns The panel.
 */
export function ChangesPanel(props: { changes: ChangesView | null; open?: boolean }): VNode | null {
  const c = props.changes;
  if (c === null) return null;
  const report = c.report;
  const lines = report ? changeLines(report) : [];
  if (lines.length === 0 && c.notes.length === 0) return null;
  const shown = lines.filter((x) => x.weight === "notable").slice(0, NOTABLE_SHOWN);
  const rest = lines.filter((x) => !shown.includes(x));
  const plural = (n: number) => (n === 1 ? "change" : "changes");
  return (
    <section class="pl-changes" aria-label="Since the last data" data-changes={lines.length}>
      <h2>
        {report?.baseline === "previous record" ? "Since the last run" : "Since the last data"}
      </h2>
      {report && <Compared report={report} />}
      {c.notes.length > 0 && (
        <ul class="pl-changes-notes">
          {c.notes.map((n) => <li key={n}>{n}</li>)}
        </ul>
      )}
      {shown.length > 0 && (
        <ul class="pl-changes-list">
          {shown.map((x, i) => <Line key={i} line={x} />)}
        </ul>
      )}
      {rest.length > 0 && (
        <details class="pl-changes-more" open={props.open || shown.length === 0}>
          <summary>
            {shown.length > 0
              ? `${rest.length} more ${plural(rest.length)}`
              : `${rest.length} minor ${plural(rest.length)}`}
          </summary>
          <ul class="pl-changes-list">
            {rest.map((x, i) => <Line key={i} line={x} />)}
          </ul>
        </details>
      )}
      {report && <DriftSection report={report} open={props.open} />}
    </section>
  );
}
