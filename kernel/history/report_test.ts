import { deepEqual, equal, ok, throws } from "node:assert/strict";
import type { CellKind, ChangeContext, Registry } from "../contract/mod.ts";
import { changeReport, ChoiceError } from "./report.ts";
import { makeRecord, sameData, sameInputs } from "./record.ts";
import { DEFAULT_SETTINGS } from "../document/read_settings.ts";
import type { CellReport, RunReport } from "../session/types.ts";
import type { HistoryRecord } from "./types.ts";

/**
 * Two made-up kinds with history faces: `rows` keeps a row count and says how
 * many were added (passing them on as row changes), `value` keeps a number and
 * says when it moved, noting the rows its context reports.
 */
const seen: ChangeContext[] = [];
const rowsKind = {
  kind: "rows",
  history: {
    keep: () => null,
    changes: (a: { n: number }, b: { n: number }) =>
      b.n === a.n ? [] : [{
        code: "rows-added",
        weight: "notable" as const,
        sentence: `${b.n - a.n} rows added`,
        numbers: { count: b.n - a.n },
        rows: { added: b.n - a.n, removed: 0, changed: 0 },
      }],
  },
} as unknown as CellKind;
const valueKind = {
  kind: "value",
  history: {
    keep: () => null,
    changes: (a: { v: number }, b: { v: number }, ctx: ChangeContext) => {
      seen.push(ctx);
      if (b.v === 13) throw new Error("unreadable");
      return a.v === b.v ? [] : [{
        code: "value-moved",
        weight: "minor" as const,
        sentence: `${ctx.cell} moved`,
        numbers: { from: a.v, to: b.v },
      }];
    },
    trend: (
      k: { v: number },
    ) => [{ series: "v", unit: "mm", value: k.v, lower: null, upper: null, n: null }],
  },
} as unknown as CellKind;
const registry: Registry = new Map([["rows", rowsKind], ["value", valueKind]]);

/** A run's report with the given cells (name, kind, state, kept) and data files. */
function runReport(
  cells: [string, string, CellReport["state"], unknown][],
  files: RunReport["files"],
): RunReport {
  return {
    settings: DEFAULT_SETTINGS,
    cells: cells.map(([name, kind, state, kept]) => ({
      name,
      kind,
      line: 1,
      state,
      error: null,
      warnings: [],
      result: null,
      summaryLine: null,
      ms: 0,
      cached: false,
      kept,
    })),
    errors: [],
    files,
    ran: [],
    superseded: false,
  };
}

/** A record at minute `m` with data hash `data`, the given cells (name, kind, state, kept). */
function rec(
  m: number,
  data: string,
  cells: [string, string, CellReport["state"], unknown][],
  doc = "d0",
): HistoryRecord {
  const report = runReport(cells, [{ path: "a.csv", sha256: data, bytes: 10, lines: 2 }]);
  return makeRecord({
    documentPath: "a.md",
    documentSha256: doc,
    report,
    time: new Date(Date.UTC(2026, 11, 4, 8, m)),
  });
}

const read = (records: HistoryRecord[]) => ({ records, problems: [] });

Deno.test("makeRecord: same inputs are recognised, ids differ by content", () => {
  const a = rec(0, "aa", [["t", "rows", "current", { n: 1 }]]);
  const b = rec(0, "aa", [["t", "rows", "current", { n: 2 }]]);
  ok(sameInputs(a, b) && sameData(a, b));
  ok(a.record !== b.record, "same time, other content: other id");
  ok(!sameInputs(a, rec(0, "aa", [], "d1")), "the document's hash counts");
  ok(sameData(a, rec(0, "aa", [], "d1")), "…but not for the data");
  ok(!sameData(a, rec(0, "bb", [])));
  equal(
    rec(0, "aa", [["t", "rows", "failed", { n: 1 }]]).cells[0].kept,
    null,
    "kept only when current",
  );
});

Deno.test("changeReport: the previous data revision, skipping records of document edits", () => {
  const cells = (n: number, v: number): [string, string, CellReport["state"], unknown][] => [
    ["t", "rows", "current", { n }],
    ["f", "value", "current", { v }],
  ];
  const records = [
    rec(0, "d-old", cells(10, 1)),
    rec(1, "d-new", cells(14, 2)),
    rec(2, "d-new", cells(14, 3), "d1"), // only the document changed
  ];
  seen.length = 0;
  const r = changeReport(read(records), registry, "h", {}, (c) => (c === "f" ? ["t"] : []))!;
  equal(r.baseline, "previous data revision");
  equal(r.from.record, records[0].record);
  equal(r.to.record, records[2].record);
  ok(r.document_changed);
  deepEqual(r.sentences, ["4 rows added", "f moved"], "notable first");
  deepEqual(seen.map((c) => c.rows), [{ added: 4, removed: 0, changed: 0 }], "rows through inputs");
  equal(seen[0].level, 0.95);
  deepEqual(r.trends.map((t) => [t.cell, t.series, t.points.map((p) => p.value)]), [["f", "v", [
    1,
    2,
    3,
  ]]]);
  // Only document edits since the last data change: the record before.
  const docOnly = changeReport(read(records.slice(1)), registry, "h")!;
  equal(docOnly.baseline, "previous record");
  equal(docOnly.from.record, records[1].record);
});

Deno.test("changeReport: a cell that reads no table is told of no rows", () => {
  seen.length = 0;
  changeReport(
    read([
      rec(0, "x", [["t", "rows", "current", { n: 1 }], ["f", "value", "current", { v: 1 }]]),
      rec(1, "y", [["t", "rows", "current", { n: 2 }], ["f", "value", "current", { v: 2 }]]),
    ]),
    registry,
    "h",
    {},
    () => [],
  );
  deepEqual(seen.map((c) => c.rows), [null]);
});

Deno.test("changeReport: states, added and removed cells, and a face that throws", () => {
  const r = changeReport(
    read([
      rec(0, "x", [["f", "value", "current", { v: 1 }], ["g", "value", "current", { v: 1 }], [
        "old",
        "rows",
        "current",
        { n: 1 },
      ]]),
      rec(1, "y", [["f", "value", "failed", null], ["g", "value", "current", { v: 13 }], [
        "new",
        "rows",
        "current",
        { n: 1 },
      ]]),
    ]),
    registry,
    "h",
  )!;
  deepEqual(r.cells_added, ["new"]);
  deepEqual(r.cells_removed, ["old"]);
  const codes = r.cells.map((c) => [c.name, c.changes.map((x) => x.code)]);
  deepEqual(codes, [
    ["f", ["cell-stopped"]],
    ["g", ["not-compared"]],
    ["new", ["cell-added"]],
    ["old", ["cell-removed"]],
  ]);
  equal(r.sentences[0], "value f is now failed; in the earlier run it was computed.");
  ok(r.sentences.some((s) => s.includes("could not be compared") && s.includes("unreadable")));
});

Deno.test("changeReport: records picked by time, id and hash; fewer than two records: null", () => {
  const records = [rec(0, "aaaaaa01", []), rec(10, "bbbbbb02", []), rec(20, "cccccc03", [])];
  const r = (since: string, until?: string) =>
    changeReport(read(records), registry, "h", { since, until })!.from.record;
  equal(r("2026-12-04T08:15Z"), records[1].record, "the newest at or before the time");
  equal(r(records[0].record.slice(0, 26)), records[0].record, "an id's start");
  equal(r("bbbbbb"), records[1].record, "a data file's hash start");
  equal(
    changeReport(read(records), registry, "h", { since: "aaaaaa", until: "bbbbbb" })!.to.record,
    records[1].record,
  );
  throws(() => r("2026-12-03"), (e) => e instanceof ChoiceError && /begins after/.test(e.message));
  throws(() => r("eeeeeeee"), (e) => e instanceof ChoiceError && /hash starting/.test(e.message));
  throws(() => r("yesterday"), (e) => e instanceof ChoiceError && /neither a time/.test(e.message));
  equal(changeReport(read(records.slice(0, 1)), registry, "h"), null);
  equal(changeReport(read([]), registry, "h"), null);
});

Deno.test("recordRun with a cache: the file is read again only when someone else wrote it", async () => {
  const { recordRun } = await import("./mod.ts");
  const dir = await Deno.makeTempDir({ prefix: "plumb-history-cache-" });
  try {
    const doc = `${dir}/a.md`;
    const cache = { state: null };
    const run = (data: string) => {
      const r = rec(0, data, [["t", "rows", "current", { n: data.length }]]);
      const report = runReport(
        r.cells.map((c) =>
          [c.name, c.kind, c.state, c.kept] as [string, string, CellReport["state"], unknown]
        ),
        r.files,
      );
      return recordRun({ document: doc, documentSha256: "d", report, registry, cache });
    };
    equal((await run("a"))!.records, 1);
    equal((await run("bb"))!.records, 2);
    ok((cache as { state: unknown }).state !== null);
    // Another process appends behind our back: its record is seen.
    const other = await import("./history_file.ts");
    await other.appendRecord(`${dir}/a.history.jsonl`, rec(5, "ccc", []), {});
    const r = (await run("dddd"))!;
    equal(r.records, 4, "the other process's record was read");
    equal(r.report!.history.records, 4);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});
