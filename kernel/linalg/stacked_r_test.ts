import { equal, ok } from "node:assert/strict";
import { StackedR } from "./stacked_r.ts";
import { householderQR } from "./householder_qr.ts";

/** Invented rows: an intercept and three smooth columns of different scales. */
function rows(n: number): Float64Array[] {
  const cols = [new Float64Array(n), new Float64Array(n), new Float64Array(n), new Float64Array(n)];
  for (let i = 0; i < n; i++) {
    cols[0][i] = 1;
    cols[1][i] = Math.sin(i * 0.37) * 1e3;
    cols[2][i] = Math.cos(i * 0.011) + i / n;
    cols[3][i] = ((i * 7919) % 101) / 101 - 0.5;
  }
  return cols;
}

/** R with each row's sign set so its diagonal is positive (QR's R is unique up to these signs). */
function positive(r: Float64Array, k: number): Float64Array {
  const out = new Float64Array(k * k);
  for (let i = 0; i < k; i++) {
    const d = r[i * k + i];
    const s = Math.sign(d) || 1;
    for (let j = i; j < k; j++) out[i * k + j] = s * r[i * k + j];
  }
  return out;
}

Deno.test("StackedR over 10,000 rows (three blocks) gives the R of one Householder QR of all rows", () => {
  const n = 10_000, k = 4;
  const cols = rows(n);
  const s = new StackedR(k);
  s.addColumns(cols, n);
  equal(s.rows, n);
  const stacked = positive(s.finish(), k);
  const a = new Float64Array(n * k);
  cols.forEach((c, j) => a.set(c, j * n));
  const f = householderQR(a, n, k, { pivot: false });
  const whole = new Float64Array(k * k);
  for (let i = 0; i < k; i++) for (let j = i; j < k; j++) whole[i * k + j] = f.qr[j * n + i];
  const reference = positive(whole, k);
  // Exact arithmetic of QR: R of full column rank is unique once its diagonal is positive;
  // rounding leaves ~n·ε relative to R's largest entry.
  const scale = Math.max(...reference.map(Math.abs));
  for (let t = 0; t < k * k; t++) {
    ok(Math.abs(stacked[t] - reference[t]) <= 1e-11 * scale, `entry ${t}`);
  }
});

Deno.test("StackedR.add row by row equals addColumns, and fewer rows than columns still give RᵀR = XᵀX", () => {
  const cols = rows(5000);
  const a = new StackedR(4), b = new StackedR(4);
  a.addColumns(cols, 5000);
  for (let i = 0; i < 5000; i++) b.add([cols[0][i], cols[1][i], cols[2][i], cols[3][i]]);
  const ra = a.finish(), rb = b.finish();
  // The same reflections in the same order (exact arithmetic: the same operations).
  for (let t = 0; t < 16; t++) equal(ra[t], rb[t]);
  const few = new StackedR(3);
  few.add([1, 2, 3]);
  few.add([4, 5, 6]);
  const r = few.finish();
  equal(r[2 * 3 + 2], 0, "rank 2: the last diagonal entry is zero");
  // XᵀX of rows (1,2,3), (4,5,6): [[17, 22, 27], [22, 29, 36], [27, 36, 45]] (exact arithmetic).
  const xtx = [[17, 22, 27], [22, 29, 36], [27, 36, 45]];
  for (let i = 0; i < 3; i++) {
    for (let j = 0; j < 3; j++) {
      let v = 0;
      for (let m = 0; m < 3; m++) v += r[m * 3 + i] * r[m * 3 + j];
      ok(Math.abs(v - xtx[i][j]) < 1e-12, `(${i}, ${j}): ${v}`);
    }
  }
});
