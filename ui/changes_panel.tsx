/**
 * "Since the last data": what changed between the previous data revision and
 * the latest run (kernel/history's change report), in the live page and in
 * the static record. Shown only when there is something to say. The notable
 * sentences first; the others, the numbers behind each sentence and the
 * drift of the estimates behind disclosures (open in the record, which has
 * no script and is read on paper).
 *
 * ```
 *  ┌ Since the last data ───────────────── 18:55 → 19:02 UTC · data/batch7.csv 121 → 161 lines ┐
 *  │ • The preferred model of fade changed from root to root-linear: …          [numbers ▸]   │
 *  │ • root: a moved from 9.882 [9.828, 9.936] to 10.618 …                                    │
 *  │ ▸ 8 more changes                                                                          │
 *  │ ▸ Drift of the estimates over 3 revisions   [small chart per parameter]                   │
 *  └────────────────────────────────────────────────────────────────────────────────────────┘
 * ```
 *
 * @module
 */
import type { VNode } from "preact";
import type { Change } from "../kernel/contract/mod.ts";
import type { ChangeReport, Trend } from "../kernel/history/types.ts";
import { DriftChart } from "./drift_chart.tsx";

/** What the panel shows: the report (or none) and what the history could not do. */
export interface ChangesView {
  report: ChangeReport | null;
  notes: readonly string[];
}

/** `2026-12-04T18:55:02.123Z` → `2026-12-04 18:55 UTC`. */
export function utcMinute(iso: string): string {
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;
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

function Item(props: { change: Change }): VNode {
  return (
    <li class={`pl-change pl-change-${props.change.weight}`} data-code={props.change.code}>
      <span class="pl-change-text">{props.change.sentence}</span> <Numbers change={props.change} />
    </li>
  );
}

/** Notable changes shown before the disclosure (a phone's screen or two). */
const NOTABLE_SHOWN = 6;

/** The drawable series: fit parameters (or predictions) with two points or more. */
function drawable(trends: readonly Trend[]): Trend[] {
  return trends.filter((t) => t.points.length >= 2);
}

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
  const all = report ? report.cells.flatMap((x) => x.changes) : [];
  if (all.length === 0 && c.notes.length === 0) return null;
  // The report's own order: its sentences list leads with what decides the next step.
  const rank = new Map((report?.sentences ?? []).map((s, i) => [s, i]));
  const ordered = [...all].sort((a, b) =>
    (rank.get(a.sentence) ?? 0) - (rank.get(b.sentence) ?? 0)
  );
  // The first few notable changes in view; the rest (and the minor ones) one click away.
  const notable = ordered.filter((x) => x.weight === "notable").slice(0, NOTABLE_SHOWN);
  const minor = ordered.filter((x) => !notable.includes(x));
  const series = drawable(report?.trends ?? []);
  const revisions = new Set(series.flatMap((t) => t.points.map((p) => p.record))).size;
  return (
    <section class="pl-changes" aria-label="Since the last data" data-changes={all.length}>
      <header class="pl-changes-head">
        <h2>Since the last data</h2>
        {report && (
          <p class="pl-changes-when">
            {utcMinute(report.from.time)} → {utcMinute(report.to.time)}
            {report.baseline === "previous data revision" ? "" : ` (${report.baseline})`}
            {report.files.map((f) => (
              <span key={f.path} class="pl-changes-file">
                {" · "}
                {f.path}: {f.lines_before === null
                  ? `new, ${f.lines_after} lines`
                  : f.lines_after === null
                  ? "no longer read"
                  : `${f.lines_before} → ${f.lines_after} lines`}
              </span>
            ))}
          </p>
        )}
      </header>
      {c.notes.length > 0 && (
        <ul class="pl-changes-notes">
          {c.notes.map((n) => <li key={n}>{n}</li>)}
        </ul>
      )}
      {notable.length > 0 && (
        <ul class="pl-changes-list">
          {notable.map((x, i) => <Item key={`n${i}`} change={x} />)}
        </ul>
      )}
      {minor.length > 0 && (
        <details class="pl-changes-more" open={props.open || notable.length === 0}>
          <summary>
            {notable.length > 0
              ? `${minor.length} more ${minor.length === 1 ? "change" : "changes"}`
              : `${minor.length} ${minor.length === 1 ? "change" : "changes"}`}
          </summary>
          <ul class="pl-changes-list">
            {minor.map((x, i) => <Item key={`m${i}`} change={x} />)}
          </ul>
        </details>
      )}
      {series.length > 0 && (
        <details class="pl-drift" open={props.open}>
          <summary>Drift of the estimates over {revisions} revisions</summary>
          <div class="pl-drift-grid">
            {series.map((t) => <DriftChart key={`${t.cell}/${t.series}`} trend={t} />)}
          </div>
        </details>
      )}
    </section>
  );
}
