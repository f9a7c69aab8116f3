import assert from "node:assert/strict";
import { summarizeTable } from "./summary.ts";
import type { TableOutput } from "./run.ts";

/** A table output over source rows `rows` with the given columns (NaN or null for missing). */
function table(rows: number[], cols: Record<string, number[] | (string | null)[]>): TableOutput {
  return {
    type: "Table",
    rows: Int32Array.from(rows),
    rowsRead: Math.max(...rows),
    excluded: [],
    sha256: null,
    source: null,
    rowsFiltered: 0,
    columns: Object.entries(cols).map(([name, v]) =>
      typeof v[0] === "number" || v.every((x) => typeof x === "number")
        ? {
          name,
          type: "number" as const,
          unit: null,
          values: Float64Array.from(v as number[]),
          lo: null,
          missing: (v as number[]).filter(Number.isNaN).length,
        }
        : {
          name,
          type: "text" as const,
          unit: null,
          values: v as (string | null)[],
          missing: v.filter((x) => x === null).length,
        }
    ),
  };
}

Deno.test("summarizeTable() lists every kept row with a missing value in any column", () => {
  // Source rows 1, 2, 4, 6, 7, 9 (3, 5, 8 excluded); holes in x (rows 2, 9), y (2, 6) and
  // site (7): each row once, ascending.
  const r = summarizeTable(table([1, 2, 4, 6, 7, 9], {
    x: [1, NaN, 3, 4, 5, NaN],
    y: [1, NaN, 3, NaN, 5, 6],
    site: ["a", "b", "c", "d", null, "f"],
  }));
  assert.deepEqual(r.rows_missing, [2, 6, 7, 9]);
  assert.deepEqual(r.columns.map((c) => c.missing), [2, 2, 1]);
});

Deno.test("summarizeTable() gives an empty rows_missing for a complete table", () => {
  const r = summarizeTable(table([1, 2, 3], { x: [1, 2, 3], site: ["a", "b", "c"] }));
  assert.deepEqual(r.rows_missing, []);
});
