/**
 * One cell in the static record: its kind and name, its state, its error
 * or why it was held, its warnings, its source (always, a reviewer reads
 * what was asked), and the kind's own view of its complete result — the
 * same page face the live page uses.
 *
 * @module
 */
import { h, type VNode } from "preact";
import { renderToString } from "preact-render-to-string";
import type { CellReport } from "../../kernel/session/types.ts";
import { pages } from "../../cells/pages.ts";
import { GenericView } from "../generic_view.tsx";
import type { RecordBlock } from "./types.ts";

type CellBlock = Extract<RecordBlock, { type: "cell" }>;

const STATE_WORDS: Record<string, string> = {
  current: "computed",
  failed: "failed",
  held: "held: an input failed",
};

/**
 * A cell of the record.
 *
 * @param props The cell's block and its report (undefined when the run never reached it).
 * @returns A `<section class="pl-cell pl-record-cell">`.
 */
export function RecordCell(props: { block: CellBlock; report: CellReport | undefined }): VNode {
  const { block, report } = props;
  const state = report?.state ?? "held";
  const View = pages.get(block.kind)?.view;
  return (
    <section
      class={`pl-cell pl-cell-${state} pl-record-cell`}
      id={`cell-${block.name}`}
      data-state={state}
    >
      <header class="pl-cell-head">
        <span class="pl-cell-kind">{block.kind}</span>
        <h3 class="pl-cell-name">{block.name}</h3>
        <span class="pl-record-state">{STATE_WORDS[state] ?? state}</span>
        <span class="pl-where">line {block.line}</span>
      </header>
      {state === "failed" && report?.error && (
        <p class="pl-error">
          ✕ {report.error.message}{" "}
          <span class="pl-where">(line {report.error.line}, column {report.error.column})</span>
        </p>
      )}
      {state === "held" && (
        <p class="pl-note">
          ‖ Not computed: {report?.error?.message ?? "an input of this cell failed"}
        </p>
      )}
      <pre class="pl-record-source" aria-label="Options as written"><code>{block.body}</code></pre>
      {report !== undefined && report.warnings.length > 0 && (
        <ul class="pl-warnings">
          {report.warnings.map((w, i) => <li key={i}>⚠ {w}</li>)}
        </ul>
      )}
      {state === "current" && report !== undefined && (
        <ResultOf View={View} name={block.name} report={report} />
      )}
      {state === "current" && (report?.omitted?.length ?? 0) > 0 && (
        <p class="pl-note pl-record-omitted">
          Per-row values not shown in this record: {report!.omitted!.join(", ")}{" "}
          (all are in the machine-readable result, <code>plumb run --json</code>).
        </p>
      )}
    </section>
  );
}

/**
 * The kind's view drawn on its own, so that a view that throws costs only
 * its own result (said in words) and not the whole record.
 */
function ResultOf(props: {
  View: ((p: { name: string; result: unknown }) => unknown) | undefined;
  name: string;
  report: CellReport;
}): VNode {
  const { View, name, report } = props;
  let html: string;
  try {
    html = View === undefined
      ? renderToString(h(GenericView, { result: report.result, summaryLine: report.summaryLine }))
      : renderToString(
        h(View as (p: { name: string; result: unknown }) => VNode, { name, result: report.result }),
      );
  } catch (err) {
    return (
      <p class="pl-error">
        ✕ This result could not be drawn in the record: {(err as Error).message}
      </p>
    );
  }
  return <div class="pl-result" dangerouslySetInnerHTML={{ __html: html }} />;
}
