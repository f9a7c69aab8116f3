/**
 * The `calc` block: the value the code returned (named numbers as a small
 * table, other data as indented JSON), or the table it gave, and what the
 * code printed. The same component renders in the live page and in the
 * static record (no scripts, no state).
 *
 * @module
 */
import type { VNode } from "preact";
import type { PageFace, ViewProps } from "../../kernel/contract/mod.ts";
import { TableView } from "../table/view.tsx";
import type { CalcResult } from "./result.ts";

/** Longest JSON shown whole on the page (characters); longer values are cut with a note. */
const SHOW_CHARS = 20_000;

/** The value's fields when it is a flat record of numbers (what inline values show). */
function namedNumbers(v: unknown): [string, number][] | null {
  if (v === null || typeof v !== "object" || Array.isArray(v)) return null;
  const entries = Object.entries(v as Record<string, unknown>);
  if (entries.length === 0 || entries.length > 40) return null;
  return entries.every(([, x]) => typeof x === "number") ? entries as [string, number][] : null;
}

function Value({ r, name }: { r: CalcResult; name: string }): VNode {
  const named = namedNumbers(r.value);
  if (named !== null) {
    return (
      <table class="plumb-calc-numbers">
        <thead>
          <tr>
            <th scope="col">Name</th>
            <th scope="col">Value</th>
            <th scope="col">Inline as</th>
          </tr>
        </thead>
        <tbody>
          {named.map(([k, x]) => (
            <tr key={k}>
              <td>
                <code>{k}</code>
              </td>
              <td class="plumb-num">{String(x)}</td>
              <td>
                <code>@({name}.value.{k})</code>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    );
  }
  const text = JSON.stringify(r.value, null, 2) ?? "null";
  const cut = text.length > SHOW_CHARS;
  return (
    <div class="plumb-calc-value">
      <pre>{cut ? text.slice(0, SHOW_CHARS) : text}</pre>
      {cut && (
        <p class="plumb-note">
          Shown in part: {text.length.toLocaleString("en")} characters in all
        </p>
      )}
    </div>
  );
}

function Console({ r }: { r: CalcResult }): VNode | null {
  if (r.console === "" && r.console_cut === 0) return null;
  return (
    <details class="plumb-calc-console">
      <summary>Printed by the code</summary>
      <pre>{r.console}</pre>
      {r.console_cut > 0 && (
        <p class="plumb-note">{r.console_cut.toLocaleString("en")} more lines not kept</p>
      )}
    </details>
  );
}

/**
 * The calc cell's view.
 *
 * @param props The cell's name and its {@link CalcResult}.
 * @returns The block's content.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { CalcView } from "./view.tsx";
 * const html = renderToString(CalcView({ name: "eol", result: {
 *   value: { cycle: 812 }, gives: "value", table: null, console: "hello\n", console_cut: 0, run_ms: 40 } }));
 * if (!html.includes("@(eol.value.cycle)") || !html.includes("hello")) throw new Error(html);
 * ```
 */
export function CalcView(props: ViewProps<CalcResult>): VNode {
  const r = props.result;
  return (
    <div class="plumb-calc" data-cell={props.name}>
      {r.table !== null
        ? <TableView name={props.name} result={r.table} />
        : <Value r={r} name={props.name} />}
      <Console r={r} />
    </div>
  );
}

/** The `calc` kind's page face: its view, for the live page and the record. */
export const calcPage: PageFace<CalcResult, VNode> = { kind: "calc", view: CalcView };
