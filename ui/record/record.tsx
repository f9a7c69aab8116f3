/**
 * The static record: one self-contained HTML file of an analysis, drawn on
 * the server from the same page faces as the live page (DESIGN.md §8).
 *
 * ```
 *   title, run, caution
 *   banner: cells failed or not computed, document errors      (when any)
 *   the document in order: prose (math as MathML, inline values resolved)
 *                          and cells (state, options, warnings, the kind's view)
 *   provenance: document and data SHA-256, rows, software, time, conventions
 * ```
 *
 * No script, no event handler, nothing fetched: CSS inline, charts inline
 * SVG, math MathML (the browser's own typesetting). The bytes depend on the
 * input alone (no clock, no random ids here; the time is the input's), so
 * two records of the same run are identical.
 *
 * @module
 */
import type { ComponentChild, VNode } from "preact";
import { renderToString } from "preact-render-to-string";
import { STYLE } from "../style.ts";
import { ChangesPanel } from "../changes_panel.tsx";
import { Prose } from "../prose.tsx";
import { resolveValue } from "../inline_value.ts";
import type { ProseRef } from "../markdown.ts";
import { RecordCell } from "./record_cell.tsx";
import { Provenance } from "./provenance.tsx";
import { recordStyle } from "./record_style.ts";
import type { RecordInput } from "./types.ts";

/** The caution every record carries (DESIGN.md §9). */
export const CAUTION = "These results support, and do not replace, professional judgement. " +
  "Where they feed a decision that bears on safety, product release or compliance, follow the " +
  "applicable standards and your organisation's validated procedures.";

function inlineValue(input: RecordInput, ref: ProseRef, key: number): ComponentChild {
  const cell = input.cells.find((c) => c.name === ref.cell);
  if (cell === undefined) {
    return <span key={key} class="pl-ref pl-ref-error">✕ unknown cell “{ref.cell}”</span>;
  }
  if (cell.state !== "current") {
    return <span key={key} class="pl-ref pl-ref-error">✕ {ref.cell} {cell.state}</span>;
  }
  const r = resolveValue(cell.result, ref.cell, ref.path, ref.digits);
  return r.ok
    ? <span key={key} class="pl-ref" title={ref.text}>{r.text}</span>
    : <span key={key} class="pl-ref pl-ref-error">✕ {r.error}</span>;
}

function Banner({ input }: { input: RecordInput }): VNode | null {
  const bad = input.cells.filter((c) => c.state !== "current");
  if (bad.length === 0 && input.errors.length === 0) return null;
  return (
    <section class="pl-record-banner" role="alert" id="banner">
      <h2>Not everything was computed</h2>
      <ul>
        {bad.map((c) => (
          <li key={c.name}>
            <a href={`#cell-${c.name}`}>{c.kind} “{c.name}”</a>{" "}
            {c.state === "failed" ? "failed" : "was not computed (an input failed)"}
            {c.error ? `: ${c.error.message}` : ""}
          </li>
        ))}
        {input.errors.map((e, i) => (
          <li key={`e${i}`}>
            line {e.line}, column {e.column}: {e.message}
          </li>
        ))}
      </ul>
    </section>
  );
}

/**
 * The record as a Preact tree (the `<body>`'s content).
 *
 * @param props The record input.
 * @returns The record's body.
 */
export function Record({ input }: { input: RecordInput }): VNode {
  const reports = new Map(input.cells.map((c) => [c.name, c]));
  return (
    <main class="pl-record-main">
      <header class="pl-record-head">
        <h1>{input.title}</h1>
        <p>
          Record of <code>{input.document.path}</code>, run {input.run.utc} (UTC) with Plumb{" "}
          {input.versions.plumb}.
        </p>
      </header>
      <p class="pl-record-caution">{CAUTION}</p>
      <Banner input={input} />
      <ChangesPanel changes={input.changes ?? null} open />
      {input.blocks.map((b) =>
        b.type === "prose"
          ? (
            <div key={`p${b.line}`} class="pl-record-prose">
              <Prose text={b.text} line={b.line} refs={(r, k) => inlineValue(input, r, k)} />
            </div>
          )
          : <RecordCell key={b.name} block={b} report={reports.get(b.name)} />
      )}
      <Provenance input={input} />
    </main>
  );
}

function escapeHtml(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");
}

/**
 * Numbers the chart library's generated ids (`plot-clip-7`, counted across
 * the process) by their order in this record, each reference with its id,
 * so a record's bytes do not depend on what was drawn before it.
 *
 * @param html The markup.
 * @returns The markup with ids `plot-<kind>-1, 2, …` in document order.
 * @example
 * ```ts
 * import { renumberIds } from "./record.tsx";
 * const out = renumberIds('<clipPath id="plot-clip-9"/><g clip-path="url(#plot-clip-9)"/>');
 * if (out !== '<clipPath id="plot-clip-1"/><g clip-path="url(#plot-clip-1)"/>') throw new Error(out);
 * ```
 */
export function renumberIds(html: string): string {
  const ID = /\bplot-([a-z]+)-(\d+)(?!\d)/g;
  const seen = new Map<string, string>();
  const count = new Map<string, number>();
  return html.replace(ID, (whole, kind: string) => {
    let next = seen.get(whole);
    if (next === undefined) {
      const n = (count.get(kind) ?? 0) + 1;
      count.set(kind, n);
      next = `plot-${kind}-${n}`;
      seen.set(whole, next);
    }
    return next;
  });
}

/**
 * Renders the record to one self-contained HTML document.
 *
 * @param input What the record shows.
 * @param options `paper`: the page size to print on (default: the printer's).
 * @returns The HTML text (UTF-8 when written).
 */
export function renderRecord(
  input: RecordInput,
  options: { paper?: "a4" | "letter" } = {},
): string {
  const body = renumberIds(renderToString(<Record input={input} />));
  return "<!doctype html>\n" +
    `<html lang="en"><head><meta charset="utf-8">` +
    `<meta name="viewport" content="width=device-width, initial-scale=1">` +
    `<meta name="generator" content="Plumb ${escapeHtml(input.versions.plumb)}">` +
    `<title>${escapeHtml(input.title)} — record</title>` +
    `<style>${STYLE}${recordStyle(input.title, options.paper)}</style></head>` +
    `<body class="pl-record">${body}</body></html>\n`;
}
