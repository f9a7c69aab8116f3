/**
 * The "Since the last data" panel rendered to a string from a hand-made
 * report (invented numbers): nothing when there is nothing to say; the
 * notable changes first and shown, the others behind a disclosure; notes;
 * drift charts only for series with two points or more; the store keeps the
 * latest `changes` message.
 */
import { equal, ok } from "node:assert/strict";
import { renderToString } from "preact-render-to-string";
import type { ChangeReport } from "../kernel/history/types.ts";
import { ChangesPanel } from "./changes_panel.tsx";
import { LiveStore } from "./store.ts";

const T0 = "2026-12-04T08:00:00.000Z", T1 = "2026-12-04T09:30:00.000Z";

function report(): ChangeReport {
  return {
    from: { record: `${T0}-aaaaaaaa`, time: T0 },
    to: { record: `${T1}-bbbbbbbb`, time: T1 },
    baseline: "previous data revision",
    document_changed: false,
    files: [{ path: "data/a.csv", before: "1", after: "2", lines_before: 11, lines_after: 15 }],
    sentences: [
      "The preferred model of c changed from p to q.",
      "f: k moved.",
      "f: fitted to 14 rows (was 10).",
    ],
    cells: [
      {
        name: "f",
        kind: "fit",
        state_before: "current",
        state_after: "current",
        changes: [
          {
            code: "parameter-moved",
            weight: "notable",
            sentence: "f: k moved.",
            numbers: { z: 4.2, before_ci: [1, 2] },
          },
          {
            code: "rows-used-changed",
            weight: "minor",
            sentence: "f: fitted to 14 rows (was 10).",
            numbers: {},
          },
        ],
      },
      {
        name: "c",
        kind: "compare",
        state_before: "current",
        state_after: "current",
        changes: [{
          code: "preferred-changed",
          weight: "notable",
          sentence: "The preferred model of c changed from p to q.",
          numbers: { before: "p", after: "q" },
        }],
      },
    ],
    cells_added: [],
    cells_removed: [],
    trends: [
      {
        cell: "f",
        series: "k",
        unit: "1/s",
        points: [
          { record: "r1", time: T0, n: 10, value: 1.5, lower: 1, upper: 2 },
          { record: "r2", time: T1, n: 14, value: 2.6, lower: 2.3, upper: 2.9 },
        ],
      },
      {
        cell: "f",
        series: "only-once",
        unit: null,
        points: [{ record: "r2", time: T1, n: 14, value: 1, lower: null, upper: null }],
      },
    ],
    history: { path: "a.history.jsonl", records: 2, problems: [] },
  };
}

Deno.test("the panel says nothing when there is nothing to say", () => {
  equal(renderToString(<ChangesPanel changes={null} />), "");
  equal(renderToString(<ChangesPanel changes={{ report: null, notes: [] }} />), "");
  const quiet = { ...report(), sentences: [], cells: [], trends: [] };
  equal(renderToString(<ChangesPanel changes={{ report: quiet, notes: [] }} />), "");
});

Deno.test("the panel: notable first, the rest behind a disclosure, the numbers, a drift chart a drawable series", () => {
  const html = renderToString(<ChangesPanel changes={{ report: report(), notes: [] }} />);
  ok(html.includes("Since the last data"));
  ok(html.includes("2026-12-04 08:00 UTC → 2026-12-04 09:30 UTC"));
  ok(html.includes("data/a.csv: 11 → 15 lines"));
  const pref = html.indexOf("The preferred model of c"), moved = html.indexOf("f: k moved.");
  ok(pref > 0 && moved > pref, "the report's order: the preferred model first");
  const more = html.indexOf("1 more change");
  ok(
    more > moved && html.indexOf("fitted to 14 rows") > more,
    "minor changes behind the disclosure",
  );
  ok(html.includes('<th scope="row">before ci</th><td>1, 2</td>'));
  equal(
    (html.match(/<figure class="pl-drift-chart"/g) ?? []).length,
    1,
    "one series has two points",
  );
  ok(html.includes("f · k (1/s)"));
  ok(!html.includes('<details class="pl-drift" open'), "closed in the page");
  const record = renderToString(<ChangesPanel changes={{ report: report(), notes: [] }} open />);
  ok(record.includes('<details class="pl-drift" open'), "open in the record");
});

Deno.test("the panel shows what the history could not do, even without a report", () => {
  const note = "The run history a.history.jsonl could not be written: the folder is read-only";
  const html = renderToString(<ChangesPanel changes={{ report: null, notes: [note] }} />);
  ok(html.includes(note));
});

Deno.test("the store keeps the latest changes message", () => {
  const s = new LiveStore(() => 0);
  equal(s.changes.value, null);
  ok(s.apply({ type: "changes", report: report(), notes: [] }));
  const latest = () => s.changes.peek() as { report: ChangeReport | null } | null;
  equal(latest()?.report?.cells.length, 2);
  ok(s.apply({ type: "changes", report: null, notes: ["x"] }));
  equal(latest()?.report, null);
});
