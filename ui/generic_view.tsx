/**
 * The view of a kind the page has no component for: its one-line summary
 * and the result's top-level numbers and words as a compact list, with the
 * whole result under a disclosure.
 *
 * @module
 */
import type { VNode } from "preact";
import { formatValue } from "./inline_value.ts";

/**
 * Renders any result.
 *
 * @param props `result` and the cell's `summaryLine`.
 * @returns A definition list of the scalar fields.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { GenericView } from "./generic_view.tsx";
 * const html = renderToString(GenericView({ result: { marks: 3 }, summaryLine: "3 marks" }));
 * if (!html.includes("marks") || !html.includes("3 marks")) throw new Error(html);
 * ```
 */
export function GenericView(props: { result: unknown; summaryLine: string | null }): VNode {
  const r = props.result;
  const fields = r !== null && typeof r === "object" && !Array.isArray(r)
    ? Object.entries(r).filter(([, v]) => v === null || typeof v !== "object")
    : [];
  return (
    <div class="pl-generic">
      {props.summaryLine && <p>{props.summaryLine}</p>}
      {fields.length > 0 && (
        <dl class="pl-generic-fields">
          {fields.map(([k, v]) => [
            <dt key={`t${k}`}>{k}</dt>,
            <dd key={`d${k}`}>{typeof v === "number" ? formatValue(v, null) : String(v)}</dd>,
          ])}
        </dl>
      )}
      <details>
        <summary>Result as JSON</summary>
        <pre>{JSON.stringify(r, null, 2)?.slice(0, 20000)}</pre>
      </details>
    </div>
  );
}
