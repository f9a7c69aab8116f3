/**
 * LiveStore: a `document` message for a data-only change (same text) keeps
 * the blocks array, so prose and the outline are not redrawn; a `changes`
 * message (the run history's report) is kept until the next one.
 *
 * @module
 */
import { equal, notEqual, ok } from "node:assert/strict";
import type { DocumentMessage } from "../kernel/server/protocol.ts";
import { LiveStore } from "./store.ts";
import { changesReport } from "./testdata/changes_report.ts";

const doc = (source: string, rows: number): DocumentMessage => ({
  type: "document",
  version: source === "a" ? "v1" : "v2",
  path: "a.md",
  title: "A",
  source,
  blocks: [{ type: "prose", line: 1, text: source }],
  data: [{ path: "d.csv", rows, bytes: 9, changed: "2026-01-01T00:00:00Z" }],
});

Deno.test("LiveStore.apply keeps the blocks of a document whose text is unchanged", () => {
  const s = new LiveStore(() => 0);
  s.apply(doc("a", 3));
  const blocks = s.doc.value!.blocks;
  s.apply(doc("a", 4));
  equal(s.doc.value!.blocks, blocks);
  equal(s.doc.value!.data[0].rows, 4);
  s.apply(doc("b", 4));
  notEqual(s.doc.value!.blocks, blocks);
  equal(s.doc.value!.version, "v2");
});

Deno.test("LiveStore.apply takes a data-only document message without its text", () => {
  const s = new LiveStore(() => 0);
  s.apply(doc("a", 3));
  const blocks = s.doc.value!.blocks;
  const { source: _s, blocks: _b, ...textless } = doc("a", 5);
  s.apply(textless as DocumentMessage);
  equal(s.doc.value!.blocks, blocks);
  equal(s.doc.value!.source, "a");
  equal(s.doc.value!.data[0].rows, 5);
  // Without the text, a message for a version the page does not have cannot be applied.
  const { source: _s2, blocks: _b2, ...other } = doc("b", 6);
  equal(s.apply(other as DocumentMessage), false);
  equal(s.doc.value!.version, "v1");
});

Deno.test("LiveStore.apply keeps the latest changes message, a later one replacing it", () => {
  const s = new LiveStore(() => 0);
  // Read through a function: an assertion on the signal's value would narrow its type to null.
  const latest = () => s.changes.peek();
  equal(latest(), null);
  ok(s.apply({ type: "changes", report: changesReport(), notes: [] }));
  equal(latest()?.report?.cells.length, 3);
  ok(s.apply({ type: "changes", report: null, notes: ["The run history could not be read"] }));
  equal(latest()?.report, null);
  equal(latest()?.notes[0], "The run history could not be read");
  equal(s.dropped, 0);
});
