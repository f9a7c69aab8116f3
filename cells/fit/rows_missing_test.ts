import assert from "node:assert/strict";
import { fitResult as fit, makeTable } from "./_fixtures_test.ts";

Deno.test("fitKind.summary() lists every row left out for a missing value in rows_missing", () => {
  // Seven rows lack y; the warning names five, rows_missing all seven (source row numbers,
  // here with gaps where the table excluded rows 3 and 4).
  const y = [1, NaN, NaN, NaN, NaN, NaN, NaN, NaN, 2, 3.5, 4, 5];
  const rows = [1, 2, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14];
  const { result, warnings } = fit(
    "line",
    "y = a + b*x",
    makeTable({ x: y.map((_, i) => i), y }, rows),
  );
  assert.deepEqual(result.rows_missing, [2, 5, 6, 7, 8, 9, 10]);
  assert.equal(
    warnings[0],
    '7 rows left out for missing values in "y": rows 2, 5, 6, 7, 8 and 2 more',
  );
  assert.equal(result.n + result.rows_missing.length, rows.length);
});

Deno.test("fitKind.summary() rows_missing joins the model's and the weights' missing rows in order", () => {
  const x = [0, 1, 2, NaN, 4, 5, 6, 7], y = [1, 3, 2, 5, 4, 6, 8, 7];
  const sd = [1, 1, NaN, 1, 1, 2, NaN, 1];
  const { result, warnings } = fit("w", "y = a + b*x", makeTable({ x, y, sd }), {
    known_sigma: "sd",
  });
  assert.deepEqual(result.rows_missing, [3, 4, 7]);
  assert.deepEqual(result.rows, [1, 2, 5, 6, 8]);
  assert.deepEqual(warnings.slice(0, 2), [
    '1 row left out for missing values in "x": row 4',
    '2 rows left out for missing values in "sd" of "known_sigma": rows 3, 7',
  ]);
});

Deno.test("fitKind.summary() gives an empty rows_missing without missing values; weight 0 is not missing", () => {
  const t = makeTable({
    x: [0, 1, 2, 3, 4],
    y: [1, 3, 2, 5, 4],
    u: [NaN, 1, 1, 1, 1],
    w: [1, 0, 1, 1, 1],
  });
  // Column u is missing in row 1 but no part of the model: the row is used.
  assert.deepEqual(fit("plain", "y = a + b*x", t).result.rows_missing, []);
  const weighted = fit("zero", "y = a + b*x", t, { weights: "w" }).result;
  assert.deepEqual(weighted.rows_missing, []);
  assert.deepEqual(weighted.rows, [1, 3, 4, 5]);
});
