import { deepEqual, equal, match, ok } from "node:assert/strict";
import type { Change, ChangeContext } from "../../kernel/contract/mod.ts";
import { tableKind } from "./mod.ts";
import {
  BLOCK_ROWS,
  LISTED_ROWS,
  ROW_HASHES_UP_TO,
  tableHistory,
  type TableKept,
} from "./history.ts";
import { parseCtx, runCtx } from "./_testing.ts";

/** Invented readings: `n` rows of cycle, capacity and a text column. */
function csv(n: number, edit: (row: number, line: string) => string | null = (_, l) => l): string {
  const lines = ["cycle,capacity,operator"];
  for (let r = 1; r <= n; r++) {
    const line = edit(r, `${5 * r},${(2500 - 0.5 * r).toFixed(1)},${r % 3 === 0 ? "" : "kim"}`);
    if (line !== null) lines.push(line);
  }
  return lines.join("\n") + "\n";
}

/** Runs the real table kind on `text` and keeps what the history keeps. */
async function kept(text: string, options: Record<string, unknown> = {}): Promise<TableKept> {
  const spec = tableKind.parse(parseCtx({ from: "d.csv", units: { capacity: "mAh" }, ...options }));
  const ctx = runCtx({ "d.csv": text });
  // A distinct SHA-256 stand-in a content, as the server's would be.
  ctx.files["d.csv"].sha256 = `sha-${text.length}-${text.slice(-20)}`;
  const out = await tableKind.run(spec, ctx);
  return tableHistory.keep(out, spec, tableKind.summary(out, spec)) as TableKept;
}

const NO_UNITS = { units: {} };
const ctx: ChangeContext = { cell: "cycles", level: 0.95, rows: null };
const changes = (a: unknown, b: unknown) =>
  tableHistory.changes(a as TableKept, b as TableKept, ctx);
const codes = (cs: Change[]) => cs.map((c) => c.code);

Deno.test("table history: rows appended are named with their source rows", async () => {
  const a = await kept(csv(120));
  const b = await kept(csv(160));
  const c = changes(a, b);
  deepEqual(codes(c), ["rows-added"]);
  equal(c[0].weight, "notable");
  equal(c[0].sentence, "cycles: 40 rows added (rows 121–160).");
  deepEqual(c[0].rows, { added: 40, removed: 0, changed: 0 });
  equal(c[0].numbers.count, 40);
  deepEqual(c[0].numbers.rows, Array.from({ length: 40 }, (_, i) => 121 + i));
  equal(c[0].numbers.more, 0);
  deepEqual(changes(b, b), [], "the same content says nothing");
});

Deno.test("table history: a value changed, a row deleted, a row inserted", async () => {
  const a = await kept(csv(30));
  const edited = changes(a, await kept(csv(30, (r, l) => (r === 7 ? "35,2496.6,kim" : l))));
  deepEqual(codes(edited), ["rows-changed"]);
  deepEqual(edited[0].numbers.rows, [7]);
  deepEqual(edited[0].rows, { added: 0, removed: 0, changed: 1 });
  equal(edited[0].sentence, "cycles: 1 row changed in place (row 7).");

  // Deleting row 3 renumbers the rows after it; their content is unchanged.
  const deleted = changes(a, await kept(csv(30, (r, l) => (r === 3 ? null : l))));
  deepEqual(codes(deleted), ["rows-removed"]);
  deepEqual(deleted[0].numbers.rows, [3]);
  deepEqual(deleted[0].rows, { added: 0, removed: 1, changed: 0 });

  const inserted = changes(
    a,
    await kept(csv(30, (r, l) => (r === 10 ? `${l}\n51,2495.1,lee` : l))),
  );
  deepEqual(codes(inserted), ["rows-added"]);
  deepEqual(inserted[0].numbers.rows, [11], "the new line is source row 11");
});

Deno.test("table history: more than 50 rows are listed as 50 and a count of the rest", async () => {
  const c = changes(await kept(csv(10)), await kept(csv(100)));
  equal(c[0].numbers.count, 90);
  equal((c[0].numbers.rows as number[]).length, LISTED_ROWS);
  equal(c[0].numbers.more, 40);
  equal(c[0].sentence, "cycles: 90 rows added (rows 11–100).");
});

Deno.test("table history: a value in an earlier column counts when a later text is missing", async () => {
  // Row 3 has an empty operator (missing text): its capacity must still reach its hash.
  const a = await kept(csv(6));
  const c = changes(a, await kept(csv(6, (r, l) => (r === 3 ? "15,2400.0," : l))));
  deepEqual(codes(c), ["rows-changed"]);
  deepEqual(c[0].numbers.rows, [3]);
});

Deno.test("table history: rows of equal content are paired at their own row number first", async () => {
  const twice = "x,y\n1,2\n1,2\n1,2\n";
  const c = changes(await kept(twice, NO_UNITS), await kept("x,y\n9,9\n1,2\n1,2\n", NO_UNITS));
  deepEqual(codes(c), ["rows-changed"]);
  deepEqual(c[0].numbers.rows, [1]);
});

Deno.test("table history: an exclusion, a unit and a derived column", async () => {
  const a = await kept(csv(50));
  const why = "thermocouple came loose";
  const b = await kept(csv(50), {
    exclude: [{ rows: [41], why }],
    units: { capacity: "Ah" },
    derive: { fade: "2500 - capacity" },
  });
  const c = changes(a, b);
  deepEqual(codes(c), ["rows-removed", "exclusions-added", "columns-changed", "unit-changed"]);
  equal(c[0].sentence, "cycles: 1 row removed (row 41 of the earlier table, now excluded).");
  deepEqual(c[0].rows, { added: 0, removed: 1, changed: 0 });
  equal(c[1].sentence, `cycles: row 41 now excluded (${why}).`);
  deepEqual(c[1].numbers, { rows: [41], why: [why] });
  ok(!("rows" in c[1]), "the removal already carries the row");
  deepEqual(c[2].numbers, { added: ["fade"], removed: [] });
  deepEqual(c[3].numbers, { column: "capacity", before: "mAh", after: "Ah" });
  const back = changes(b, a);
  deepEqual(codes(back), ["rows-added", "exclusions-removed", "columns-changed", "unit-changed"]);
  deepEqual(back[0].numbers.rows, [41]);
});

Deno.test("table history: a new source column makes rows comparable by count only", async () => {
  const a = await kept("x,y\n1,2\n3,4\n", NO_UNITS);
  const c = changes(a, await kept("x,y,z\n1,2,0\n3,4,0\n5,6,0\n", NO_UNITS));
  deepEqual(codes(c), ["rows-added", "columns-changed"]);
  equal(c[0].numbers.compared, "count");
  match(
    c[0].sentence,
    /1 more row than in the earlier run \(2 → 3; compared by count only: the columns read from the source changed\)/,
  );
  deepEqual(c[0].rows, { added: 1, removed: 0, changed: 0 });
  const same = changes(a, await kept("x,y,z\n1,2,0\n3,4,0\n", NO_UNITS));
  deepEqual(codes(same), ["rows-not-compared", "columns-changed"]);
  equal(same[0].weight, "minor");
});

/** `n` rows of invented data, row `r` written by `line`. */
function big(n: number, line = (r: number) => `${r},${(r * 0.25).toFixed(2)}`): string {
  const out = ["cycle,capacity"];
  for (let r = 1; r <= n; r++) out.push(line(r));
  return out.join("\n") + "\n";
}

Deno.test("table history: above 20,000 rows, an append is recognised by blocks and said so", async () => {
  const n = ROW_HASHES_UP_TO + 5 * BLOCK_ROWS; // 25,000: whole blocks
  const a = await kept(big(n));
  equal(a.row_hashes, null);
  equal(a.block_hashes!.length, 8 * 25, "one hash of 8 hex digits a block");
  const c = changes(a, await kept(big(n + 300)));
  deepEqual(codes(c), ["rows-added"]);
  deepEqual(c[0].numbers, { count: 300, after: n, compared: "blocks", unverified: 0 });
  deepEqual(c[0].rows, { added: 300, removed: 0, changed: 0 });
  equal(
    c[0].sentence,
    "cycles: 300 rows added after the first 25,000 (content compared by blocks of 1,000 rows, not row by row).",
  );
  // A table that ended inside a block: its last rows cannot be checked, and the sentence says so.
  const partial = changes(await kept(big(n + 500)), await kept(big(n + 800)));
  equal(partial[0].numbers.unverified, 500);
  match(partial[0].sentence, /the last 500 earlier rows could not be compared/);
});

Deno.test("table history: above 20,000 rows, an edit is placed to its block", async () => {
  const n = ROW_HASHES_UP_TO + 5 * BLOCK_ROWS;
  const a = await kept(big(n));
  const edit = (r: number) => (r === 3_500 ? "3500,0" : `${r},${(r * 0.25).toFixed(2)}`);
  const c = changes(a, await kept(big(n, edit)));
  deepEqual(codes(c), ["rows-changed"]);
  equal(c[0].numbers.from_row, 3_001);
  equal(c[0].numbers.blocks_differing, 1);
  deepEqual(c[0].rows, { added: 0, removed: 0, changed: BLOCK_ROWS }, "at most the block");
  match(c[0].sentence, /compared by blocks of 1,000 rows, not row by row/);
});

Deno.test("table history: a table that grows past 20,000 rows is compared by blocks from its row hashes", async () => {
  const n = ROW_HASHES_UP_TO - 1_000; // 19,000: row hashes
  const a = await kept(big(n));
  ok(a.row_hashes !== null && a.block_hashes === null);
  const c = changes(a, await kept(big(n + 2_000)));
  deepEqual(codes(c), ["rows-added"]);
  deepEqual(c[0].numbers, { count: 2_000, after: n, compared: "blocks", unverified: 0 });
});

Deno.test("table history: the kept value stays small", async () => {
  // 20,000 rows: 8 hex digits a row and one run of row numbers; above: a block hash a 1,000 rows.
  const at = JSON.stringify(await kept(big(ROW_HASHES_UP_TO))).length;
  ok(at < 8 * ROW_HASHES_UP_TO + 1_000, `${at}`);
  const above = JSON.stringify(await kept(big(ROW_HASHES_UP_TO + 1))).length;
  ok(above < 1_000, `${above}`);
});

Deno.test("table history: kept values of older versions, missing fields, never throw", async () => {
  const now = await kept(csv(20));
  // The first version: no fingerprint name, no content hash, hashes of another kind.
  const { hash: _h, hashed: _c, content: _x, ...first } = now;
  const older = { ...first, row_hashes: "0123abcd".repeat(15), rows_used: 15, row_runs: [[1, 15]] };
  const c = changes(older, now);
  deepEqual(codes(c), ["rows-added"]);
  equal(c[0].numbers.compared, "count");
  match(c[0].sentence, /fingerprinted rows another way/);
  // Fields missing one by one: only that comparison is left out.
  for (const field of Object.keys(now)) {
    const partial: Record<string, unknown> = { ...now };
    delete partial[field];
    ok(Array.isArray(changes(partial, now)), field);
    ok(Array.isArray(changes(now, partial)), field);
  }
  const noRows: Record<string, unknown> = { ...now, rows_used: undefined };
  const unit = {
    ...now,
    columns: now.columns.map((col) => (col.name === "capacity" ? { ...col, unit: "Ah" } : col)),
  };
  deepEqual(codes(changes(noRows, unit)), ["unit-changed"], "columns still compared");
  for (const junk of [null, 3, "x", [], { rows_used: 5, row_runs: [[1, 1e12]], row_hashes: "" }]) {
    deepEqual(changes(junk, now).filter((x) => x.code !== "rows-added"), [], String(junk));
  }
  deepEqual(
    changes({ ...now, excluded: [null, { row: "x" }] }, now),
    [],
    "damaged exclusions are skipped",
  );
});
