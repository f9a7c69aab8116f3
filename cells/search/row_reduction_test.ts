import { equal, ok } from "node:assert/strict";
import { householderQR } from "../../kernel/linalg/mod.ts";
import { reduceRows, ROW_BLOCK } from "./row_reduction.ts";
import { invented } from "./_testing.ts";

Deno.test("reduceRows() by blocks gives the R of one QR of all the rows", () => {
  // Source: kernel/linalg's Householder QR of the whole matrix; R is unique up to the sign of
  // each row, so |R| is compared, to 1e-12 of the largest entry (both are backward stable).
  const n = 2 * ROW_BLOCK + 123;
  const cols = invented(n, 4, 8);
  const columns = [null, cols.x1, cols.x2, cols.x3, cols.y];
  const { r, rows } = reduceRows(columns, n);
  equal(rows, 5);
  const a = new Float64Array(n * 5);
  columns.forEach((c, j) => c === null ? a.fill(1, j * n, (j + 1) * n) : a.set(c, j * n));
  const whole = householderQR(a, n, 5, { pivot: false });
  const big = Math.abs(whole.qr[0]);
  for (let j = 0; j < 5; j++) {
    for (let i = 0; i <= j; i++) {
      const d = Math.abs(Math.abs(r[i + j * 5]) - Math.abs(whole.qr[i + j * n]));
      ok(d <= 1e-12 * big, `R[${i}][${j}]: ${r[i + j * 5]} vs ${whole.qr[i + j * n]}`);
    }
  }
});

Deno.test("reduceRows() of fewer rows than columns keeps the rows there are", () => {
  const { r, rows } = reduceRows([null, Float64Array.of(1, 2), Float64Array.of(3, 5)], 2);
  equal(rows, 2);
  equal(r.length, 6);
  equal(r[1], 0, "below the diagonal");
});
