/**
 * The slim top bar: the document's title, one line on its data
 * ("batch7.csv · 120 rows · changed 2 min ago"), the overall state, which
 * follows the cells while the page is live and says "not live" (never a
 * stale "all current") when the connection is lost, the undo notice, and
 * under 62rem a link down to the rail. Printed, it carries the date of
 * printing instead of the live parts (ui/print_style.ts). Its height is
 * kept in `--pl-top-h` so the rail sticks just under it.
 *
 * @module
 */
import type { VNode } from "preact";
import { useLayoutEffect, useRef } from "preact/hooks";
import type { DocumentMessage, LiveDataFile } from "../kernel/server/protocol.ts";
import { baseName, formatAge } from "./format.ts";
import { now } from "./clock.ts";
import { StateMark } from "./state_mark.tsx";
import {
  type Connection,
  type LiveCell,
  type LiveStore,
  overall,
  type OverallState,
} from "./store.ts";
import { UndoNotice } from "./undo_notice.tsx";

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
  return `${dataName(f)} · changed ${formatAge(f.changed, at)}`;
}

function dataName(f: LiveDataFile): string {
  const rows = f.rows === null ? `${f.bytes} bytes` : `${f.rows} ${f.rows === 1 ? "row" : "rows"}`;
  return `${baseName(f.path)} · ${rows}`;
}

/**
 * The page's state in one mark: the cells' states folded while the page is
 * connected; "not live" while it is not, since the states shown may no
 * longer be those on disk.
 *
 * @param cells The document's cells.
 * @param connection The live connection.
 * @returns The state and its words.
 * @example
 * ```ts
 * import { overallLabel } from "./top_bar.tsx";
 * const c = [{ state: "current" as const }];
 * if (overallLabel(c, "open").label !== "all 1 current") throw new Error("open");
 * const off = overallLabel(c, "closed");
 * if (off.state !== "offline" || off.label.includes("all 1 current")) throw new Error(off.label);
 * ```
 */
export function overallLabel(
  cells: readonly { state: LiveCell["state"] }[],
  connection: Connection,
): { state: OverallState; label: string } {
  if (connection === "closed") {
    return {
      state: "offline",
      label: "not live: disconnected, retrying · the states shown are as last received",
    };
  }
  const o = overall(cells);
  const n = cells.length;
  const label = o.state === "current"
    ? `all ${n} current`
    : o.state === "computing"
    ? `computing · ${o.counts.current} of ${n} current`
    : o.state === "failed"
    ? `${o.counts.failed} failed · ${o.counts.current} of ${n} current`
    : o.state === "held"
    ? `${o.counts.held} held · ${o.counts.current} of ${n} current`
    : connection === "connecting"
    ? "connecting…"
    : "no cells";
  return { state: o.state, label };
}

/**
 * The date and time of printing, as a reader of paper wants it.
 *
 * @param at Local time in ms.
 * @returns E.g. "Printed 2026-03-12 14:05 (UTC+01:00)".
 * @example
 * ```ts
 * import { printedLine } from "./top_bar.tsx";
 * if (!/^Printed \d{4}-\d\d-\d\d \d\d:\d\d \(UTC[+-]\d\d:\d\d\)$/.test(printedLine(0))) throw new Error();
 * ```
 */
export function printedLine(at: number): string {
  const d = new Date(at);
  const p = (n: number) => String(Math.abs(n)).padStart(2, "0");
  const off = -d.getTimezoneOffset();
  const zone = `UTC${off < 0 ? "-" : "+"}${p(Math.trunc(off / 60))}:${p(off % 60)}`;
  return `Printed ${d.getFullYear()}-${p(d.getMonth() + 1)}-${p(d.getDate())} ${p(d.getHours())}:${
    p(d.getMinutes())
  } (${zone})`;
}

/** Keeps `--pl-top-h` at the bar's height (it wraps to more lines on narrow screens). */
function useHeightVariable(ref: { current: HTMLElement | null }): void {
  useLayoutEffect(() => {
    const el = ref.current;
    if (el === null || typeof globalThis.ResizeObserver !== "function") return;
    const root = el.ownerDocument.documentElement;
    const ro = new ResizeObserver(() =>
      root.style.setProperty("--pl-top-h", `${el.offsetHeight}px`)
    );
    ro.observe(el);
    return () => ro.disconnect();
  }, []);
}

/**
 * Renders the top bar.
 *
 * @param props The document, its cells and the connection.
 * @returns The bar.
 */
export function TopBar(props: { doc: DocumentMessage | null; store: LiveStore }): VNode {
  const bar = useRef<HTMLElement>(null);
  useHeightVariable(bar);
  const cells = props.store.cells();
  const connection = props.store.connection.value;
  const at = Math.floor(now.value / 10_000) * 10_000;
  const data = props.doc?.data ?? [];
  const { state, label } = overallLabel(cells, connection);
  return (
    <header
      ref={bar}
      class={connection === "closed" ? "pl-top pl-offline" : "pl-top"}
      data-connection={connection}
    >
      <h1 class="pl-title">{props.doc?.title ?? "Plumb"}</h1>
      <p class="pl-data">
        {data.length === 0 ? "no data files" : dataName(data[0])}
        {data.length > 0 && (
          <span class="pl-live-only">{` · changed ${formatAge(data[0].changed, at)}`}</span>
        )}
        {data.length > 1 && ` · and ${data.length - 1} more`}
      </p>
      <p class="pl-top-tools pl-live-only">
        <a class="pl-to-rail" href="#rail">ledger and outline ↓</a>{" "}
        <a
          class="pl-record-link"
          href="/record"
          download
          title="Save the static record of what the page shows: one HTML file, no scripts"
        >
          save record
        </a>
      </p>
      <p class="pl-overall" data-overall={state} role="status">
        <StateMark state={state} label={label} />
      </p>
      <p class="pl-printed">{printedLine(now.value)}</p>
      <UndoNotice />
    </header>
  );
}
