/**
 * An appender for the history suites, run as its own process: appends
 * records of invented content to a history file, one after another, and
 * prints one JSON line per append once `appendRecord` has returned
 * (`{"id":…,"records":…,"dropped":…,"repaired":…}`), or `{"error":…}` and
 * exits with 1 when it throws. It prints `ready` first.
 *
 * Usage: `deno run --allow-read --allow-write=<file>,<temp> _append_child.ts <file> <keep> <count> <cells> <cell bytes> <seed>`
 * (`count` 0: until killed). Each cell keeps `{ seq, cell, size, fill }`
 * with `fill` exactly `size` characters, so a reader can check every record
 * it gets is whole.
 *
 * @module
 */
import { appendRecord, recordId } from "../../kernel/history/history_file.ts";
import type { HistoryRecord, RecordedCell } from "../../kernel/history/types.ts";
import { mulberry32 } from "../../kernel/random.ts";

const [path, keepText, countText, cellsText, sizeText, seedText] = Deno.args;
const keep = Number(keepText), count = Number(countText), size = Number(sizeText);
const random = mulberry32(Number(seedText));
const enc = new TextEncoder();
const say = (value: unknown) => Deno.stdout.write(enc.encode(JSON.stringify(value) + "\n"));

await say("ready");
for (let seq = 0; count === 0 || seq < count; seq++) {
  const cells: RecordedCell[] = Array.from({ length: Number(cellsText) }, (_, i) => ({
    name: `cell ${i}`,
    kind: "table",
    state: "current",
    kept: {
      seq,
      cell: i,
      size,
      fill: String.fromCharCode(97 + Math.floor(random() * 26)).repeat(size),
    },
  }));
  const time = new Date().toISOString();
  const body = JSON.stringify(cells);
  const record: HistoryRecord = {
    record: await recordId(time, `${seedText} ${seq} ${body}`),
    time,
    plumb: "test",
    document: { path: "fade.md", sha256: "0".repeat(64) },
    files: [],
    level: 0.95,
    cells,
  };
  try {
    const done = await appendRecord(path, record, { keep });
    await say({ id: record.record, ...done });
  } catch (err) {
    await say({ error: (err as Error).message });
    Deno.exit(1);
  }
}
