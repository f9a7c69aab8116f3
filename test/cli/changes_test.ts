/**
 * The run history through the command line, as a user meets it: `plumb run`
 * records each run whose inputs changed beside the document, says what changed
 * since the last data, and `plumb changes` reports it (issue 15). The data are
 * the fade example's (invented): its later file adds cycles 605–800, where
 * the fade speeds up, so the preferred law changes and the root law's rate
 * leaves its earlier interval.
 */
import { deepEqual, equal, match, ok } from "node:assert/strict";
import { join } from "node:path";
import { copyDir } from "../_copy_dir.ts";
import { inScratch, REPO, task } from "./_cli.ts";

/** The fade example copied into `dir`, and a function that appends its later rows. */
async function fadeIn(dir: string) {
  copyDir(join(REPO, "examples/fade"), dir);
  const later = await Deno.readTextFile(join(REPO, "examples/fade/data/batch7-later.csv"));
  const rows = later.split("\n").slice(1).join("\n"); // without the header line
  return () => Deno.writeTextFile(join(dir, "data/batch7.csv"), rows, { append: true });
}

type Report = {
  baseline: string;
  sentences: string[];
  files: { path: string; lines_before: number; lines_after: number }[];
  cells: {
    name: string;
    changes: { code: string; weight: string; numbers: Record<string, unknown> }[];
  }[];
  trends: { cell: string; series: string; points: unknown[] }[];
};

const changesOf = (r: Report, cell: string) => r.cells.find((c) => c.name === cell)?.changes ?? [];

Deno.test("plumb run records the run; after new rows the report names them, the moved parameter and the new preferred law", async () => {
  await inScratch(async (dir) => {
    const append = await fadeIn(dir);
    const first = await task(dir, "plumb", "run", "fade.md", "--json");
    equal(first.code, 0, first.stderr);
    const h1 = JSON.parse(first.stdout).history;
    equal(h1.written, true);
    equal(h1.records, 1);
    equal(h1.changes, null, "one record: nothing to compare");
    // The same inputs again: nothing appended.
    const again = JSON.parse((await task(dir, "plumb", "run", "fade.md", "--json")).stdout).history;
    deepEqual([again.written, again.records], [false, 1]);

    await append();
    const human = await task(dir, "plumb", "run", "fade.md");
    equal(human.code, 0, human.stderr);
    match(human.stdout, /changes +since the last data/);
    match(human.stdout, /preferred/i);

    const r = await task(dir, "plumb", "changes", "fade.md", "--json");
    equal(r.code, 0, r.stderr);
    const out = JSON.parse(r.stdout);
    equal(out.records, 2);
    const report: Report = out.report;
    equal(report.baseline, "previous data revision");
    deepEqual(
      report.files.map((f) => [f.path, f.lines_before, f.lines_after]),
      [["data/batch7.csv", 121, 161]],
      "40 rows appended to a 120-row file with a header (counted by wc -l, no source needed)",
    );
    // The table: 40 new rows, numbered 121–160 as source rows.
    const added = changesOf(report, "cycles").find((c) => c.code === "rows-added");
    ok(added, JSON.stringify(changesOf(report, "cycles")));
    equal(added.numbers.count ?? added.numbers.added, 40);
    // root's rate a: 9.882 [9.828, 9.936] before, 10.594 after (plumb run of both files).
    const moved = changesOf(report, "root").filter((c) => c.code === "parameter-moved");
    ok(moved.some((c) => JSON.stringify(c.numbers).includes('"a"')), JSON.stringify(moved));
    ok(moved.every((c) => c.weight === "notable"));
    // The comparison: root preferred before, root-linear after.
    const pref = changesOf(report, "fade").find((c) => c.code === "preferred-changed");
    ok(pref, JSON.stringify(changesOf(report, "fade")));
    match(JSON.stringify(pref.numbers), /root-linear/);
    ok(
      report.sentences.some((s) => /root-linear/.test(s) && /40 new rows/.test(s)),
      report.sentences.join("\n"),
    );
    // Drift: one series per parameter of each fit, two points each.
    const a = report.trends.find((t) => t.cell === "root" && t.series === "a");
    equal(a?.points.length, 2);

    // The static record carries the same report, its disclosures open (no script).
    const exported = await task(dir, "plumb", "export", "fade.md");
    equal(exported.code, 0, exported.stderr);
    const html = await Deno.readTextFile(join(dir, "fade.record.html"));
    match(html, /Since the last data/);
    match(html, /preferred model of fade changed from root to root-linear/);
    match(html, /<details class="pl-drift" open/);
    ok((html.match(/class="pl-drift-chart"/g) ?? []).length >= 7);

    const text = await task(dir, "plumb", "changes", "fade.md");
    equal(text.code, 0, text.stderr);
    match(text.stdout, /Notable:/);
    match(text.stdout, /data +data\/batch7\.csv: 121 → 161 lines/);
  });
});

Deno.test("a torn last record is left out and said; the next run still appends", async () => {
  await inScratch(async (dir) => {
    const append = await fadeIn(dir);
    equal((await task(dir, "plumb", "run", "fade.md")).code, 0);
    await append();
    equal((await task(dir, "plumb", "run", "fade.md")).code, 0);
    const hist = join(dir, "fade.history.jsonl");
    const bytes = await Deno.readFile(hist);
    // Cut the file in the middle of the last record's lines, as a crash during a write would.
    await Deno.writeFile(hist, bytes.subarray(0, bytes.length - 200));
    const r = await task(dir, "plumb", "changes", "fade.md", "--json");
    equal(r.code, 0, r.stderr);
    const out = JSON.parse(r.stdout);
    equal(out.records, 1, "the torn record is left out");
    equal(out.notes.length, 1);
    match(out.notes[0], /cut short/);
    const human = await task(dir, "plumb", "changes", "fade.md");
    match(human.stdout, /note: .*cut short/);
    // The next run appends after the torn line and reads back whole.
    const next = JSON.parse((await task(dir, "plumb", "run", "fade.md", "--json")).stdout).history;
    equal(next.written, true);
    const after = JSON.parse((await task(dir, "plumb", "changes", "fade.md", "--json")).stdout);
    equal(after.records, 2);
    ok(after.report.sentences.length > 0);
  });
});

Deno.test("a history that cannot be written: the run completes and says so", async () => {
  await inScratch(async (dir) => {
    await fadeIn(dir);
    // A folder where the file should be: no write can succeed, even as root.
    await Deno.mkdir(join(dir, "fade.history.jsonl"));
    const r = await task(dir, "plumb", "run", "fade.md");
    equal(r.code, 0, r.stderr);
    match(r.stdout, /history +The run history fade\.history\.jsonl could not be/);
    match(r.stdout, /\n\d+ current, 0 failed, 0 held/);
    const json = JSON.parse((await task(dir, "plumb", "run", "fade.md", "--json")).stdout);
    equal(json.ok, true);
    equal(json.history.written, false);
    ok(json.history.notes.some((n: string) => /could not be/.test(n)));
  });
});

Deno.test("history: off and --no-history write nothing", async () => {
  await inScratch(async (dir) => {
    await fadeIn(dir);
    const r = await task(dir, "plumb", "run", "fade.md", "--no-history", "--json");
    equal(r.code, 0, r.stderr);
    equal(JSON.parse(r.stdout).history, undefined);
    const src = await Deno.readTextFile(join(dir, "fade.md"));
    await Deno.writeTextFile(
      join(dir, "fade.md"),
      src.replace("confidence: 0.95", "confidence: 0.95\nhistory: off"),
    );
    equal((await task(dir, "plumb", "run", "fade.md")).code, 0);
    const names = [];
    for await (const e of Deno.readDir(dir)) names.push(e.name);
    ok(!names.some((n) => n.includes("history")), names.join(", "));
  });
});

Deno.test("plumb changes: usage errors and a record that does not exist are one line and exit 2", async () => {
  await inScratch(async (dir) => {
    await fadeIn(dir);
    equal((await task(dir, "plumb", "changes")).code, 2);
    const empty = await task(dir, "plumb", "changes", "fade.md");
    equal(empty.code, 0);
    match(empty.stdout, /The run history is empty/);
    equal((await task(dir, "plumb", "run", "fade.md")).code, 0);
    const none = await task(dir, "plumb", "changes", "fade.md", "--since", "1999-01-01");
    equal(none.code, 2);
    match(none.stderr, /begins after 1999-01-01/);
    const bad = await task(dir, "plumb", "changes", "fade.md", "--since", "last tuesday");
    equal(bad.code, 2);
    match(bad.stderr, /neither a time/);
  });
});
