import { deepEqual, equal, match, ok, rejects } from "node:assert/strict";
import { join } from "node:path";
import { chmodStopsWrites } from "../../test/_chmod_stops_writes.ts";
import { mulberry32 } from "../random.ts";
import {
  appendRecord,
  HistoryFileError,
  historyPath,
  historyTempPath,
  lastRecord,
  readHistory,
  recordId,
  serialiseRecord,
} from "./history_file.ts";
import type { HistoryRecord, RecordedCell } from "./types.ts";

/** A record at `2026-12-0<day>T…` with `n` cells of invented content. */
async function record(time: string, n = 3, cells?: RecordedCell[]): Promise<HistoryRecord> {
  const body: RecordedCell[] = cells ?? Array.from({ length: n }, (_, i) => ({
    name: `c${i}`,
    kind: i === 0 ? "table" : "fit",
    state: "current",
    kept: { i, time, values: [i * 1.5, -0, 1e-300, null] },
  }));
  return {
    record: await recordId(time, JSON.stringify(body)),
    time,
    plumb: "0.1.0",
    document: { path: "fade.md", sha256: "ab".repeat(32) },
    files: [{ path: "data/batch7.csv", sha256: "cd".repeat(32), bytes: 2419, lines: 121 }],
    level: 0.95,
    cells: body,
  };
}

/** What appendRecord() returns when it wrote. */
const wrote = (records: number, dropped: number, repaired: number) => ({
  written: true,
  records,
  dropped,
  repaired,
});

const at = (minute: number) => `2026-12-04T18:${String(minute).padStart(2, "0")}:02.000Z`;

async function scratch(): Promise<{ dir: string; path: string; done: () => Promise<void> }> {
  const dir = await Deno.makeTempDir({ prefix: "plumb-history-" });
  return {
    dir,
    path: join(dir, "fade.history.jsonl"),
    done: () => Deno.remove(dir, { recursive: true }),
  };
}

async function namesIn(dir: string): Promise<string[]> {
  const out: string[] = [];
  for await (const e of Deno.readDir(dir)) out.push(e.name);
  return out.sort();
}

Deno.test("historyPath() and historyTempPath() sit beside the document", () => {
  equal(historyPath("/lab/fade.md"), "/lab/fade.history.jsonl");
  equal(historyPath("fade.md"), "fade.history.jsonl");
  equal(historyPath("/lab/notes"), "/lab/notes.history.jsonl");
  equal(historyTempPath("/lab/fade.history.jsonl"), "/lab/.fade.history.jsonl.tmp");
});

Deno.test("recordId() is the time and 8 hex digits of the SHA-256 of the body", async () => {
  // SHA-256("abc") = ba7816bf… (FIPS 180-4, appendix B.1).
  equal(await recordId("2026-12-04T18:55:02.000Z", "abc"), "2026-12-04T18:55:02.000Z-ba7816bf");
});

Deno.test("serialiseRecord() writes head, cells and end with keys in a fixed order", async () => {
  const r = await record(at(1), 2);
  const lines = serialiseRecord(r).split("\n");
  equal(lines.length, 5, "head, 2 cells, end, and the empty string after the last line break");
  equal(lines[4], "");
  deepEqual(Object.keys(JSON.parse(lines[0])), [
    "history",
    "record",
    "time",
    "plumb",
    "document",
    "files",
    "level",
    "cells",
  ]);
  deepEqual(Object.keys(JSON.parse(lines[1])), ["record", "cell", "kind", "state", "kept"]);
  equal(lines[3], `{"record":"${r.record}","end":4}`);
  // The same record with its keys in another order gives the same bytes.
  const shuffled = {
    cells: r.cells.map((c) => ({ kept: c.kept, state: c.state, kind: c.kind, name: c.name })),
    level: r.level,
    files: r.files.map((f) => ({ lines: f.lines, bytes: f.bytes, sha256: f.sha256, path: f.path })),
    document: { sha256: r.document.sha256, path: r.document.path },
    plumb: r.plumb,
    time: r.time,
    record: r.record,
  };
  equal(serialiseRecord(shuffled), serialiseRecord(r));
});

Deno.test("appendRecord() and readHistory() round-trip odd cell names and unicode", async () => {
  const { path, done } = await scratch();
  try {
    const odd: RecordedCell[] = [
      {
        name: 'say "hi"',
        kind: "fit",
        state: "current",
        kept: { unit: "mA·h", σ: 0.5, note: "a\nb\tc\\d" },
      },
      { name: "σ-fit ∆ 電池", kind: "fit", state: "failed", kept: null },
      {
        name: "line\u2028sep",
        kind: "table",
        state: "held",
        kept: { emoji: "🔋", rows: [1, 2, 3] },
      },
      { name: '{"record":"x","end":3}', kind: "calc", state: "current", kept: [] },
    ];
    const a = await record(at(1), 0, odd);
    const b = await record(at(2), 2);
    deepEqual(await appendRecord(path, a), wrote(1, 0, 0));
    deepEqual(await appendRecord(path, b), wrote(2, 0, 0));
    const read = await readHistory(path);
    deepEqual(read, { records: [a, b], problems: [] });
    equal(await Deno.readTextFile(path), serialiseRecord(a) + serialiseRecord(b), "byte-identical");
    deepEqual(await lastRecord(path), b);
    // The same record again is not written twice.
    deepEqual(await appendRecord(path, b), { written: false, records: 2, dropped: 0, repaired: 0 });
  } finally {
    await done();
  }
});

Deno.test("readHistory() of a missing file is an empty history", async () => {
  const { path, done } = await scratch();
  try {
    deepEqual(await readHistory(path), { records: [], problems: [] });
    equal(await lastRecord(path), null);
  } finally {
    await done();
  }
});

Deno.test("readHistory() leaves out a record cut short, at a line break, in a line, in its first line", async () => {
  const { path, done } = await scratch();
  try {
    const rs = [await record(at(1)), await record(at(2)), await record(at(55), 9)];
    const whole = new TextEncoder().encode(rs.map(serialiseRecord).join(""));
    const third = whole.length - new TextEncoder().encode(serialiseRecord(rs[2])).length;
    const lineEnds = [...whole.keys()].filter((i) => i >= third && whole[i] === 10);
    const cuts: [string, number, RegExp][] = [
      // After the head and two cells: 3 of 11 lines (9 cells + head + end).
      [
        "at a line break",
        lineEnds[2] + 1,
        /^The last record \(2026-12-04 18:55:02 UTC\) was cut short: 3 of 11 lines; it is left out\.$/,
      ],
      [
        "in a line",
        lineEnds[2] + 20,
        /^The last record \(2026-12-04 18:55:02 UTC\) was cut short: 3 of 11 lines; it is left out\.$/,
      ],
      [
        "in its end line",
        whole.length - 4,
        /^The last record \(2026-12-04 18:55:02 UTC\) was cut short: 10 of 11 lines; it is left out\.$/,
      ],
      [
        "in its first line",
        third + 60,
        /^The last record \(2026-12-04 18:55:02 UTC\) was cut short in its first line; it is left out\.$/,
      ],
      [
        "before its id ends",
        third + 25,
        /^The last line \(line 11\) was cut short; it is left out\.$/,
      ],
    ];
    for (const [where, length, sentence] of cuts) {
      await Deno.writeFile(path, whole.subarray(0, length));
      const read = await readHistory(path);
      deepEqual(read.records, rs.slice(0, 2), where);
      equal(read.problems.length, 1, where);
      match(read.problems[0], sentence, where);
      deepEqual(await lastRecord(path), rs[1], where);
      // The next append repairs the file: the fragment goes, the new record reads back.
      const next = await record(at(56));
      deepEqual(await appendRecord(path, next), wrote(3, 0, 1), where);
      deepEqual(
        await readHistory(path),
        { records: [...rs.slice(0, 2), next], problems: [] },
        where,
      );
    }
  } finally {
    await done();
  }
});

Deno.test("appendRecord() after a last line without its line break starts on a new line", async () => {
  const { path, done } = await scratch();
  try {
    const a = await record(at(1)), b = await record(at(2));
    await Deno.writeTextFile(path, serialiseRecord(a).slice(0, -1)); // whole, only the final \n missing
    deepEqual(await readHistory(path), { records: [a], problems: [] });
    deepEqual(await appendRecord(path, b), wrote(2, 0, 0));
    equal(await Deno.readTextFile(path), serialiseRecord(a) + serialiseRecord(b));
  } finally {
    await done();
  }
});

Deno.test("readHistory() skips lines that are not JSON or not of the format, naming their line", async () => {
  const { path, done } = await scratch();
  try {
    const a = await record(at(1), 1), b = await record(at(2), 1), c = await record(at(3), 1);
    const [aHead, aCell, aEnd] = serialiseRecord(a).split("\n");
    const cLines = serialiseRecord(c).split("\n");
    const text = [
      aHead,
      aCell,
      aEnd,
      "<<<<<<< HEAD", // line 4
      '{"note":"not ours"}', // line 5
      serialiseRecord(b).trimEnd(), // lines 6-8
      cLines[0],
      `{"record":"${c.record}","cell":"c0","kind":"fit","state":"lost","kept":null}`, // line 10
      cLines[2],
      "",
    ].join("\n");
    await Deno.writeTextFile(path, text);
    const read = await readHistory(path);
    deepEqual(read.records, [a, b]);
    deepEqual(read.problems, [
      "Line 4 is not JSON; it is skipped.",
      "Line 5 is not a line of a run history record; it is skipped.",
      'Line 10 is not a cell line: "state" is not one of current, failed, held; ' +
      "the record of 2026-12-04 18:03:02 UTC is left out.",
    ]);
  } finally {
    await done();
  }
});

Deno.test("readHistory() reads a history checked out with CRLF line breaks and a byte order mark", async () => {
  const { path, done } = await scratch();
  try {
    const a = await record(at(1)), b = await record(at(2));
    await Deno.writeTextFile(
      path,
      "\ufeff" + (serialiseRecord(a) + serialiseRecord(b)).replaceAll("\n", "\r\n"),
    );
    deepEqual(await readHistory(path), { records: [a, b], problems: [] });
  } finally {
    await done();
  }
});

Deno.test("a record of a newer history format is not read, and a rewrite keeps it", async () => {
  const { path, done } = await scratch();
  try {
    const a = await record(at(1)), b = await record(at(3));
    const id = "2026-12-04T18:02:02.000Z-0f0f0f0f";
    const newer = `{"history":2,"record":"${id}","time":"2026-12-04T18:02:02.000Z","parts":[]}\n` +
      `{"record":"${id}","end":2}\n`;
    const cut = serialiseRecord(await record(at(4))).slice(0, 150);
    await Deno.writeTextFile(path, serialiseRecord(a) + newer + cut);
    deepEqual(await readHistory(path), {
      records: [a],
      problems: [
        "The record of 2026-12-04 18:02:02 UTC is in a newer history format (2); it is not read.",
        "The last record (2026-12-04 18:04:02 UTC) was cut short in its first line; it is left out.",
      ],
    });
    deepEqual(await appendRecord(path, b), wrote(2, 0, 1));
    equal(await Deno.readTextFile(path), serialiseRecord(a) + newer + serialiseRecord(b));
  } finally {
    await done();
  }
});

/** Interleaves two lists at random, each keeping its own order. */
function interleave<T>(a: T[], b: T[], random: () => number): T[] {
  const out: T[] = [];
  let i = 0, j = 0;
  while (i < a.length || j < b.length) {
    out.push(j >= b.length || (i < a.length && random() < 0.5) ? a[i++] : b[j++]);
  }
  return out;
}

Deno.test("readHistory() of two branches' histories merged line by line reads every record once, in time order", async () => {
  const base = [await record(at(1)), await record(at(2))];
  const ours = [await record(at(3)), await record(at(6), 5)];
  const theirs = [await record(at(4), 1), await record(at(5), 0), await record(at(7))];
  const linesOf = (rs: HistoryRecord[]) => rs.map(serialiseRecord).join("").trimEnd().split("\n");
  const random = mulberry32(15);
  const want = [...base, ...ours, ...theirs].sort((x, y) => x.time < y.time ? -1 : 1);
  const { path, done } = await scratch();
  try {
    for (let trial = 0; trial < 20; trial++) {
      // A union merge: the common start, then both sides' new lines interleaved.
      let lines = [...linesOf(base), ...interleave(linesOf(ours), linesOf(theirs), random)];
      // Every third trial: the two files one after the other, the common start twice (a careless merge).
      if (trial % 3 === 2) {
        lines = [...linesOf([...base, ...theirs]), ...linesOf([...base, ...ours])];
      }
      await Deno.writeTextFile(path, lines.join("\n") + "\n");
      deepEqual(await readHistory(path), { records: want, problems: [] }, `trial ${trial}`);
      // Appending to the merged file rewrites nothing and keeps every record.
      const next = await record(at(8));
      deepEqual(await appendRecord(path, next), wrote(8, 0, 0));
      deepEqual((await readHistory(path)).records, [...want, next]);
    }
  } finally {
    await done();
  }
});

Deno.test("appendRecord() keeping 3 of 5 records leaves the newest 3 and no temporary file", async () => {
  const { dir, path, done } = await scratch();
  try {
    const rs = await Promise.all([1, 2, 3, 4, 5].map((m) => record(at(m))));
    const seen = [];
    for (const r of rs) seen.push(await appendRecord(path, r, { keep: 3 }));
    deepEqual(seen.map((s) => [s.records, s.dropped]), [[1, 0], [2, 0], [3, 0], [3, 1], [3, 1]]);
    deepEqual(await readHistory(path), { records: rs.slice(2), problems: [] });
    equal(await Deno.readTextFile(path), rs.slice(2).map(serialiseRecord).join(""));
    deepEqual(await namesIn(dir), ["fade.history.jsonl"]);
    // A stale temporary file from a crash is overwritten, and goes.
    await Deno.writeTextFile(historyTempPath(path), "stale");
    deepEqual(await appendRecord(path, await record(at(6)), { keep: 2 }), wrote(2, 2, 0));
    deepEqual(await namesIn(dir), ["fade.history.jsonl"]);
  } finally {
    await done();
  }
});

Deno.test("appendRecord() that cannot write says so in one sentence and changes nothing", async () => {
  const { dir, path, done } = await scratch();
  try {
    // A folder where the file should be (no write can succeed, even as root).
    await Deno.mkdir(path);
    const r = await record(at(1));
    await rejects(appendRecord(path, r), (err: Error) => {
      ok(err instanceof HistoryFileError);
      equal(
        err.message,
        "The run history fade.history.jsonl could not be written: a folder of that name is in the way",
      );
      return true;
    });
    deepEqual(await namesIn(dir), ["fade.history.jsonl"]);
    deepEqual(await namesIn(path), []);
    await rejects(readHistory(path), {
      name: "HistoryFileError",
      message:
        "The run history fade.history.jsonl could not be read: a folder of that name is in the way",
    });
    // A file where its folder should be.
    await Deno.writeTextFile(join(dir, "plain"), "x");
    await rejects(appendRecord(join(dir, "plain", "fade.history.jsonl"), r), {
      name: "HistoryFileError",
      message:
        "The run history fade.history.jsonl could not be written: a file stands where a folder of its path should be",
    });
    equal(await Deno.readTextFile(join(dir, "plain")), "x");
  } finally {
    await done();
  }
});

const chmodBinds = await chmodStopsWrites();

Deno.test({
  name: "appendRecord() in a read-only folder or on a read-only file says which" +
    (chmodBinds ? "" : " (skipped: this user writes through permission bits, as root does)"),
  ignore: !chmodBinds,
  fn: async () => {
    const { dir, path, done } = await scratch();
    try {
      await Deno.chmod(dir, 0o555);
      await rejects(appendRecord(path, await record(at(1))), {
        message: "The run history fade.history.jsonl could not be written: the folder is read-only",
      });
      deepEqual(await namesIn(dir), []);
      await Deno.chmod(dir, 0o755);
      await appendRecord(path, await record(at(1)));
      const before = await Deno.readFile(path);
      await Deno.chmod(path, 0o444);
      for (const keep of [undefined, 1]) {
        await rejects(appendRecord(path, await record(at(2)), { keep }), {
          message: "The run history fade.history.jsonl could not be written: the file is read-only",
        });
      }
      deepEqual(await Deno.readFile(path), before);
      deepEqual(await namesIn(dir), ["fade.history.jsonl"]);
    } finally {
      await Deno.chmod(dir, 0o755);
      await done();
    }
  },
});
