/**
 * The "Since the last data" panel rendered to a string from a hand-made
 * report (ui/testdata/changes_report.ts, invented numbers) and read back
 * with linkedom: nothing when there is nothing to say; the notable sentences
 * first and in view, the others behind a closed disclosure (open in the
 * record); the numbers behind a sentence; the runs and inputs compared;
 * notes; drift charts grouped by cell, only for series with two points or
 * more.
 */
import { equal, ok } from "node:assert/strict";
import { parseHTML } from "linkedom";
import { renderToString } from "preact-render-to-string";
import { changeLines, ChangesPanel, timeSpan } from "./changes_panel.tsx";
import { changesReport, SENTENCES } from "./testdata/changes_report.ts";

function panel(open = false, notes: string[] = [], report = changesReport()) {
  const html = renderToString(<ChangesPanel changes={{ report, notes }} open={open} />);
  return { html, document: parseHTML(`<!doctype html><html><body>${html}</body></html>`).document };
}

const texts = (els: Iterable<Element>) => [...els].map((e) => e.textContent ?? "");

Deno.test("ChangesPanel renders nothing when there is nothing to say", () => {
  equal(renderToString(<ChangesPanel changes={null} />), "");
  equal(renderToString(<ChangesPanel changes={{ report: null, notes: [] }} />), "");
  const quiet = { ...changesReport(), sentences: [], cells: [] };
  equal(renderToString(<ChangesPanel changes={{ report: quiet, notes: [] }} />), "");
});

Deno.test("ChangesPanel shows the notable sentences first, the others behind a closed disclosure", () => {
  const { document } = panel();
  const lists = document.querySelectorAll(".pl-changes-list");
  equal(lists.length, 2);
  // In view: the notable ones, in the report's order (the preferred model leads).
  const shown = texts(lists[0].querySelectorAll(".pl-change-text"));
  equal(shown.join("|"), [SENTENCES.preferred, SENTENCES.moved].join("|"));
  equal(lists[0].querySelector(".pl-change")!.getAttribute("data-code"), "preferred-changed");
  // Behind the disclosure: the minor ones.
  const more = document.querySelector("details.pl-changes-more")!;
  equal(more.hasAttribute("open"), false);
  equal(more.querySelector("summary")!.textContent, "2 more changes");
  equal(
    texts(more.querySelectorAll(".pl-change-text")).join("|"),
    [SENTENCES.rows, SENTENCES.fitted].join("|"),
  );
  ok(more.querySelectorAll(".pl-change-minor").length === 2);
});

Deno.test("ChangesPanel puts the numbers behind a sentence in a table on request", () => {
  const { document } = panel();
  const moved = document.querySelector('[data-code="parameter-moved"]')!;
  const numbers = moved.querySelector("details.pl-change-numbers")!;
  equal(numbers.hasAttribute("open"), false);
  const rows = [...numbers.querySelectorAll("tr")].map((tr) =>
    `${tr.querySelector("th")!.textContent}=${tr.querySelector("td")!.textContent}`
  );
  equal(rows.join(" "), "before=1.5 after=2.6 before ci=1, 2 z=3.4");
});

Deno.test("ChangesPanel says which runs it compares and what differs in their inputs", () => {
  const { document } = panel();
  equal(document.querySelector("h2")!.textContent, "Since the last data");
  const dd = texts(document.querySelectorAll(".pl-changes-compared dd"));
  equal(dd[0].trim(), "2026-11-27 08:00 → 2026-11-28 09:30 UTC");
  equal(dd[1], "data/a.csv: 11 → 15 lines (+4)");
  const edited = { ...changesReport(), document_changed: true, files: [] };
  const other = texts(
    panel(false, [], edited).document.querySelectorAll(".pl-changes-compared dd"),
  );
  equal(other[1], "the document was edited");
});

Deno.test("ChangesPanel draws one chart per series with two points, grouped by cell", () => {
  const { document } = panel();
  const drift = document.querySelector("details.pl-drift")!;
  equal(drift.hasAttribute("open"), false, "closed in the page");
  equal(
    drift.querySelector("summary")!.textContent,
    "How the estimates moved over 3 recorded revisions",
  );
  const groups = drift.querySelectorAll(".pl-drift-group");
  equal(groups.length, 1);
  equal(groups[0].querySelector("h3")!.textContent, "slowfit");
  const names = texts(groups[0].querySelectorAll(".pl-drift-name"));
  equal(names.join("|"), "k(1/s)|c", "the series recorded once draws no chart");
  equal(groups[0].querySelectorAll(".pl-drift-chart svg.plumb-chart").length, 2);
});

Deno.test("ChangesPanel in the record: every disclosure of changes and drift open", () => {
  const { document } = panel(true);
  ok(document.querySelector("details.pl-changes-more")!.hasAttribute("open"));
  ok(document.querySelector("details.pl-drift")!.hasAttribute("open"));
});

Deno.test("ChangesPanel shows what the history could not do, with or without a report", () => {
  const note = "The run history a.history.jsonl could not be written: the folder is read-only";
  const alone = renderToString(<ChangesPanel changes={{ report: null, notes: [note] }} />);
  ok(alone.includes(note));
  ok(!alone.includes("Runs compared"));
  const { document } = panel(false, [note]);
  equal(document.querySelector(".pl-changes-notes li")!.textContent, note);
});

Deno.test("ChangesPanel with only minor changes shows them open under their count", () => {
  const r = changesReport();
  r.sentences = [SENTENCES.rows, SENTENCES.fitted];
  r.cells = r.cells.map((c) => ({ ...c, changes: c.changes.filter((x) => x.weight === "minor") }));
  const { document } = panel(false, [], r);
  const more = document.querySelector("details.pl-changes-more")!;
  ok(more.hasAttribute("open"));
  equal(more.querySelector("summary")!.textContent, "2 minor changes");
});

Deno.test("changeLines keeps the report's order and weighs a sentence no change carries by its place", () => {
  const r = changesReport();
  r.sentences = ["The cell gone was removed.", ...r.sentences];
  const lines = changeLines(r);
  equal(lines.length, 5);
  equal(lines[0].change, null);
  equal(lines[0].weight, "notable");
  equal(lines.map((l) => l.weight).join(" "), "notable notable notable minor minor");
});

Deno.test("timeSpan gives the date once and the seconds only within one minute", () => {
  equal(
    timeSpan("2026-11-27T08:00:00.000Z", "2026-11-28T09:30:00.000Z"),
    "2026-11-27 08:00 → 2026-11-28 09:30 UTC",
  );
  equal(
    timeSpan("2026-11-27T08:00:00.000Z", "2026-11-27T09:30:00.000Z"),
    "2026-11-27 08:00 → 09:30 UTC",
  );
  equal(
    timeSpan("2026-11-27T08:00:03.000Z", "2026-11-27T08:00:41.000Z"),
    "2026-11-27 08:00:03 → 08:00:41 UTC",
  );
});
