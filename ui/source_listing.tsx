/**
 * A cell's source as numbered document lines, read-only, with the line of
 * an error marked (by a pointer shape and an underline, not colour alone)
 * and a caret under its column.
 *
 * @module
 */
import type { VNode } from "preact";
import type { LivePosition } from "../kernel/server/protocol.ts";

/**
 * Renders the fence, the body and the closing fence of one cell.
 *
 * @param props `kind`, `name`, `line` (of the opening fence), `body`, `error`.
 * @returns A numbered listing.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { SourceListing } from "./source_listing.tsx";
 * const html = renderToString(SourceListing({ kind: "fit", name: "f", line: 10,
 *   body: "on: t\nmodel: y = q*x\n", error: { message: "Unknown column", line: 12, column: 12 } }));
 * if (!html.includes('data-line="12" class="pl-src-line pl-src-error"')) throw new Error(html);
 * ```
 */
export function SourceListing(props: {
  kind: string;
  name: string;
  line: number;
  body: string;
  error: LivePosition | null;
}): VNode {
  const body = props.body.replace(/\r?\n$/, "").split(/\r?\n/);
  const lines = ["```" + `${props.kind} ${props.name}`, ...(props.body === "" ? [] : body), "```"];
  const err = props.error;
  return (
    <pre class="pl-src" aria-label={`Source of ${props.name}`}>
      {lines.map((text, i) => {
        const n = props.line + i;
        const bad = err !== null && err.line === n;
        return (
          <span key={n} data-line={n} class={bad ? "pl-src-line pl-src-error" : "pl-src-line"}>
            <span class="pl-src-no" aria-hidden="true">{bad ? "▶" : ""}{n}</span>
            <span class="pl-src-text">{text || " "}</span>
            {bad && (
              <span class="pl-src-caret" aria-hidden="true">
                {" ".repeat(Math.max(0, err.column - 1))}^
              </span>
            )}
            {"\n"}
          </span>
        );
      })}
    </pre>
  );
}
