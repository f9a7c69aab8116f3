/**
 * The slim top bar: the document's title, one line on its data
 * ("batch7.csv · 120 rows · changed 2 min ago"), the overall state and the
 * connection when it is not open.
 *
 * @module
 */
import type { VNode } from "preact";
import type { DocumentMessage, LiveDataFile } from "../kernel/server/protocol.ts";
import { baseName, formatAge } from "./format.ts";
import { now } from "./clock.ts";
import { StateMark } from "./state_mark.tsx";
import { type LiveCell, type LiveStore, overall } from "./store.ts";

/**
 * One line on a data file.
 *
 * @param f The file as the server describes it.
 * @param at The current time in ms.
 * @returns E.g. "batch7.csv · 120 rows · changed 2 min ago".
 * @example
 * ```ts
 * import { dataLine } from "./top_bar.tsx";
 * const l = dataLine({ path: "data/b7.csv", rows: 120, bytes: 9, changed: "2026-01-01T00:00:00Z" },
 *   Date.parse("2026-01-01T00:02:00Z"));
 * if (l !== "b7.csv · 120 rows · changed 2 min ago") throw new Error(l);
 * ```
 */
export function dataLine(f: LiveDataFile, at: number): string {
  const rows = f.rows === null ? `${f.bytes} bytes` : `${f.rows} ${f.rows === 1 ? "row" : "rows"}`;
  return `${baseName(f.path)} · ${rows} · changed ${formatAge(f.changed, at)}`;
}

function overallLabel(
  cells: LiveCell[],
): { state: ReturnType<typeof overall>["state"]; label: string } {
  const o = overall(cells);
  const n = cells.length;
  const label = o.state === "current"
    ? `all ${n} current`
    : o.state === "computing"
    ? `computing · ${o.counts.current} of ${n} current`
    : o.state === "failed"
    ? `${o.counts.failed} failed · ${o.counts.current} of ${n} current`
    : o.state === "held"
    ? `${o.counts.held} held`
    : "no cells";
  return { state: o.state, label };
}

/**
 * Renders the top bar.
 *
 * @param props The document, its cells and the connection.
 * @returns The bar.
 */
export function TopBar(props: { doc: DocumentMessage | null; store: LiveStore }): VNode {
  const cells = props.store.cells();
  const connection = props.store.connection.value;
  const at = Math.floor(now.value / 10_000) * 10_000;
  const data = props.doc?.data ?? [];
  const { state, label } = overallLabel(cells);
  return (
    <header class="pl-top">
      <h1 class="pl-title">{props.doc?.title ?? "Plumb"}</h1>
      <p class="pl-data">
        {data.length === 0 ? "no data files" : dataLine(data[0], at)}
        {data.length > 1 && ` · and ${data.length - 1} more`}
      </p>
      <p class="pl-overall" data-overall={state}>
        <StateMark state={state} label={label} />
      </p>
      {connection !== "open" && (
        <p class="pl-conn" role="status">
          {connection === "connecting" ? "◌ connecting…" : "✕ disconnected: retrying"}
        </p>
      )}
    </header>
  );
}
