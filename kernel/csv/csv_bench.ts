/**
 * Ingest benchmark: our byte-level reader against csv-parse (sync API), on a
 * seeded 1,000,000-row × 11-column numeric CSV (about 100 MB).
 *
 * Run: `deno bench --allow-read kernel/csv/csv_bench.ts`. The issue's
 * question — a library parser or our own for 100 MB of numbers — is decided
 * by these figures; both produce numbers (csv-parse with `cast: true`, and
 * with strings converted by `Number()`), ours into Float64Array columns.
 *
 * @module
 */
import { parse } from "csv-parse/sync";
import { makeNumericCsv } from "./make_numeric_csv.ts";
import { readDelimited } from "./read_delimited.ts";

const ROWS = 1_000_000, COLS = 11, SEED = 20261201;
const bytes = makeNumericCsv(ROWS, COLS, SEED);

Deno.bench({
  name: `readDelimited ${ROWS} × ${COLS} (${(bytes.length / 1e6).toFixed(0)} MB)`,
  group: "ingest 100 MB of numbers",
  baseline: true,
  n: 3,
  warmup: 1,
  fn() {
    const data = readDelimited(bytes, { name: "bench.csv" });
    if (data.rowCount !== ROWS) throw new Error("wrong row count");
  },
});

Deno.bench({
  name: "csv-parse sync, cast: true",
  group: "ingest 100 MB of numbers",
  n: 3,
  warmup: 1,
  fn() {
    const records = parse(bytes, { cast: true, from_line: 2 }) as unknown as number[][];
    if (records.length !== ROWS) throw new Error("wrong row count");
  },
});

Deno.bench({
  name: "csv-parse sync, strings then Number() into Float64Array columns",
  group: "ingest 100 MB of numbers",
  n: 3,
  warmup: 1,
  fn() {
    const records: string[][] = parse(bytes, { from_line: 2 });
    const cols = Array.from({ length: COLS }, () => new Float64Array(records.length));
    for (let r = 0; r < records.length; r++) {
      const rec = records[r];
      for (let c = 0; c < COLS; c++) cols[c][r] = Number(rec[c]);
    }
    if (records.length !== ROWS) throw new Error("wrong row count");
  },
});

const small = makeNumericCsv(100_000, COLS, SEED);

Deno.bench({
  name: "readDelimited 100,000 × 11 with decimal corrections kept",
  group: "decimal corrections",
  baseline: true,
  fn() {
    readDelimited(small, { loLimit: Infinity });
  },
});

Deno.bench({
  name: "readDelimited 100,000 × 11 without decimal corrections",
  group: "decimal corrections",
  fn() {
    readDelimited(small, { loLimit: 0 });
  },
});
