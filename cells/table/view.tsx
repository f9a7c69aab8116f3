/**
 * The `table` block: where the data came from, its columns (type, unit,
 * missing values) and the excluded rows with their reasons. The same
 * component renders in the live page and in the static record (no scripts,
 * no state).
 *
 * @module
 */
import type { VNode } from "preact";
import type { PageFace, ViewProps } from "../../kernel/contract/mod.ts";
import { tableLine, type TableResult } from "./summary.ts";

function Source({ r }: { r: TableResult }): VNode {
  const d = r.database;
  if (d !== undefined) {
    // The record keeps the query and the result's fingerprint: a database has no file to hash.
    return (
      <div class="plumb-table-source">
        <p>
          {d.engine === "duckdb"
            ? (
              <>
                DuckDB file <code>{d.file}</code>
              </>
            )
            : (
              <>
                PostgreSQL at the URL in <code>{d.url_from}</code>
              </>
            )}
          {d.kept && " · rows kept in the database"}
          <span class="plumb-sha plumb-table-fingerprint" title={`rows:hash ${d.fingerprint}`}>
            fingerprint {d.fingerprint.slice(0, 24)}
            {d.fingerprint.length > 24 ? "…" : ""}
          </span>
        </p>
        <pre class="plumb-table-query"><code>{d.query}</code></pre>
      </div>
    );
  }
  if (r.source === null) return <p class="plumb-table-source">Inline rows</p>;
  return (
    <p class="plumb-table-source">
      <code>{r.source}</code>
      {r.sha256 !== null && (
        <span class="plumb-sha" title={`SHA-256 ${r.sha256}`}>sha256 {r.sha256.slice(0, 12)}…</span>
      )}
    </p>
  );
}

function Columns({ r }: { r: TableResult }): VNode {
  return (
    <table class="plumb-table-columns">
      <thead>
        <tr>
          <th scope="col">Column</th>
          <th scope="col">Type</th>
          <th scope="col">Unit</th>
          <th scope="col">Missing</th>
        </tr>
      </thead>
      <tbody>
        {r.columns.map((c) => (
          <tr key={c.name}>
            <td>
              <code>{c.name}</code>
            </td>
            <td>{c.type}</td>
            <td>{c.unit ?? "—"}</td>
            <td class="plumb-num">{c.missing}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

/** Groups exclusions by reason so that "rows 41, 42: probe loose" reads as one line. */
function byReason(excluded: TableResult["excluded"]): { why: string; rows: number[] }[] {
  const groups = new Map<string, number[]>();
  for (const e of excluded) groups.set(e.why, [...(groups.get(e.why) ?? []), e.row]);
  return [...groups].map(([why, rows]) => ({ why, rows }));
}

function Exclusions({ r }: { r: TableResult }): VNode | null {
  if (r.excluded.length === 0) return null;
  return (
    <section class="plumb-table-excluded">
      <h4>Excluded rows</h4>
      <ul>
        {byReason(r.excluded).map((g) => (
          <li key={g.why}>
            <strong>{g.rows.length === 1 ? "Row" : "Rows"} {g.rows.join(", ")}</strong>: {g.why}
          </li>
        ))}
      </ul>
    </section>
  );
}

/**
 * The table cell's view.
 *
 * @param props The cell's name and its {@link TableResult}.
 * @returns The block's content.
 * @example
 * ```ts
 * import { renderToString } from "preact-render-to-string";
 * import { TableView } from "./view.tsx";
 * const html = renderToString(TableView({ name: "cycles", result: {
 *   rows_read: 2, rows_used: 1, rows_filtered: 0, rows_missing: [], source: "b7.csv", sha256: null,
 *   excluded: [{ row: 2, why: "probe loose" }],
 *   columns: [{ name: "cycle", type: "number", unit: "cycles", missing: 0 }] } }));
 * if (!html.includes("probe loose")) throw new Error("reason not shown");
 * ```
 */
export function TableView(props: ViewProps<TableResult>): VNode {
  const r = props.result;
  return (
    <div class="plumb-table" data-cell={props.name}>
      <Source r={r} />
      <p class="plumb-table-line">{tableLine(r)}</p>
      <Columns r={r} />
      <Exclusions r={r} />
    </div>
  );
}

/** The `table` kind's page face: its view, for the live page and the record. */
export const tablePage: PageFace<TableResult, VNode> = { kind: "table", view: TableView };
