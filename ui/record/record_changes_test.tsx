/**
 * The record's "Since the last data" section, rendered from a hand-made
 * record input (no cells, invented report: ui/testdata/changes_report.ts):
 * present only when `changes` has something to say, placed after the
 * caution and before the document, with the sentences, the runs compared
 * and the drift charts as inline SVG behind open disclosures, and nothing
 * that runs.
 */
import { equal, ok } from "node:assert/strict";
import { parseHTML } from "linkedom";
import { DEFAULT_SETTINGS } from "../../kernel/document/mod.ts";
import { changesReport, SENTENCES } from "../testdata/changes_report.ts";
import { renderRecord } from "./record.tsx";
import type { RecordInput } from "./types.ts";

function input(changes: RecordInput["changes"]): RecordInput {
  return {
    title: "Decay of two samples",
    document: { path: "decay.md", sha256: "0".repeat(64), bytes: 10 },
    blocks: [{ type: "prose", line: 1, text: "Invented readings." }],
    cells: [],
    errors: [],
    files: [],
    settings: { ...DEFAULT_SETTINGS, extra: {} },
    versions: { plumb: "0.0.0", deno: "2", v8: "13", os: "linux x86_64" },
    run: { utc: "2026-11-28T09:30:00Z", ms: null, reproducible: true },
    changes,
  };
}

const read = (html: string) => parseHTML(html).document;

Deno.test("record: no section without changes, with none to say, or with an empty report", () => {
  for (const changes of [undefined, null, { report: null, notes: [] }]) {
    const html = renderRecord(input(changes));
    equal(read(html).querySelector(".pl-changes"), null, JSON.stringify(changes));
  }
  const quiet = { ...changesReport(), sentences: [], cells: [] };
  equal(read(renderRecord(input({ report: quiet, notes: [] }))).querySelector(".pl-changes"), null);
});

Deno.test("record: the section shows the sentences, the runs compared and the drift as inline SVG", () => {
  const html = renderRecord(input({ report: changesReport(), notes: [] }));
  const document = read(html);
  const section = document.querySelector("section.pl-changes")!;
  ok(section !== null);
  // After the caution, before the document's first block.
  const main = document.querySelector("main")!;
  const order = [...main.children].map((e) => e.className);
  ok(order.indexOf("pl-record-caution") < order.indexOf("pl-changes"));
  ok(order.indexOf("pl-changes") < order.indexOf("pl-record-prose"));
  const text = section.textContent ?? "";
  for (const s of Object.values(SENTENCES)) ok(text.includes(s), s);
  ok(text.indexOf(SENTENCES.preferred) < text.indexOf(SENTENCES.fitted), "notable first");
  ok(text.includes("2026-11-27 08:00 → 2026-11-28 09:30 UTC"));
  ok(text.includes("data/a.csv: 11 → 15 lines (+4)"));
  // Read without a click: the other changes and the drift stand open.
  ok(section.querySelector("details.pl-changes-more")!.hasAttribute("open"));
  ok(section.querySelector("details.pl-drift")!.hasAttribute("open"));
  equal(section.querySelectorAll(".pl-drift-chart svg.plumb-chart").length, 2);
  equal(document.querySelectorAll("script").length, 0);
  ok(!/\son[a-z]+=/i.test(html), "no event handler");
});

Deno.test("record: the section carries the history's notes", () => {
  const note = "The last record of decay.history.jsonl was cut short and is left out";
  const document = read(renderRecord(input({ report: null, notes: [note] })));
  equal(document.querySelector(".pl-changes-notes li")?.textContent, note);
});
