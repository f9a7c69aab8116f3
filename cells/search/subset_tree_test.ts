import { deepEqual, equal, ok } from "node:assert/strict";
import { leastSquares } from "../../kernel/linalg/mod.ts";
import { crossProducts, eliminate } from "./cross_products.ts";
import { walkSubsets } from "./subset_tree.ts";
import { invented } from "./_testing.ts";

/** The tree over `columns` (candidates) and `y`, keeping every subset. */
function walkAll(columns: Float64Array[], y: Float64Array, centred = true) {
  const cp = crossProducts([...columns, y], centred);
  const c = columns.length;
  const tree = walkSubsets({
    a: cp.a,
    m: c + 1,
    first: 0,
    c,
    largest: c,
    withEmpty: centred,
    keep: 2 ** c,
  });
  return { tree, tss: cp.sumOfSquares[c] };
}

Deno.test("walkSubsets() reaches every subset with the RSS of its own QR fit", () => {
  const cols = invented(60, 6, 21);
  const x = [cols.x1, cols.x2, cols.x3, cols.x4, cols.x5, cols.x6];
  const { tree, tss } = walkAll(x, cols.y);
  const one = new Float64Array(60).fill(1);
  let seen = 0;
  tree.kept.forEach((list, size) => {
    for (const { mask, rss } of list) {
      seen++;
      equal(popcount(mask), size);
      const design = [one, ...x.filter((_, j) => (mask >> j) & 1)];
      const ls = leastSquares(design, cols.y, design.map(String));
      ok(ls.fullRank);
      // Source: kernel/linalg's QR least squares of the subset (an independent route).
      ok(Math.abs(rss * tss - ls.rss) <= 1e-10 * ls.rss, `mask ${mask}: ${rss * tss} vs ${ls.rss}`);
    }
  });
  equal(seen, 64, "2^6 subsets (exact arithmetic)");
  deepEqual(tree.subsets, [1, 6, 15, 20, 15, 6, 1], "C(6, k) (exact arithmetic)");
  deepEqual(tree.aliased, [0, 0, 0, 0, 0, 0, 0]);
});

Deno.test("walkSubsets() marks every subset holding a constant candidate aliased, no division by 0", () => {
  const cols = invented(30, 4, 2);
  const constant = new Float64Array(30).fill(7);
  const { tree } = walkAll([cols.x1, constant, cols.x3, cols.x4], cols.y);
  deepEqual(
    tree.aliased,
    [0, 1, 3, 3, 1],
    "C(3, k − 1) subsets hold the constant (exact arithmetic)",
  );
  deepEqual(tree.aliasedExamples, [0b10]);
  const listed = tree.kept.flat();
  equal(listed.length, 8, "the 2^3 subsets without it");
  ok(listed.every((s) => (s.mask & 0b10) === 0 && Number.isFinite(s.rss)));
});

Deno.test("walkSubsets() keeps the smallest RSS of each size, smallest first", () => {
  const cols = invented(50, 8, 13);
  const x = [cols.x1, cols.x2, cols.x3, cols.x4, cols.x5, cols.x6, cols.x7, cols.x8];
  const all = walkAll(x, cols.y).tree;
  const cp = crossProducts([...x, cols.y], true);
  const two = walkSubsets({ a: cp.a, m: 9, first: 0, c: 8, largest: 8, withEmpty: true, keep: 2 });
  two.kept.forEach((list, size) => {
    deepEqual(list, all.kept[size].slice(0, 2), `size ${size}`);
    ok(list.length <= 1 || list[0].rss <= list[1].rss);
  });
});

Deno.test("crossProducts() gives unit diagonals and survives an offset and a huge scale", () => {
  // x = 2024 + small steps, z = 1e200·(1, 2, 3, 4): the correlation of x and z is that of their
  // deviations, 0.98270…; hand computation: r = Sxz/√(Sxx·Szz) with deviations (−1.5, −0.5, …)
  // of z and (−0.01, −0.02, 0.01, 0.02)… of x below.
  const x = Float64Array.of(2024.0, 2023.99, 2024.02, 2024.03);
  const z = Float64Array.of(1e200, 2e200, 3e200, 4e200);
  const cp = crossProducts([x, z], true);
  equal(cp.a[0], 1);
  equal(cp.a[3], 1);
  const dx = [-0.01, -0.02, 0.01, 0.02], dz = [-1.5, -0.5, 0.5, 1.5];
  const sxz = dx.reduce((s, v, i) => s + v * dz[i], 0);
  const r = sxz / Math.sqrt(dx.reduce((s, v) => s + v * v, 0) * dz.reduce((s, v) => s + v * v, 0));
  // The doubles nearest 2023.99 … lie up to 2.3e-13 off, 2e-11 of a deviation: hence 1e-9.
  ok(Math.abs(cp.a[1] - r) < 1e-9, `${cp.a[1]} vs ${r}`);
  const plain = crossProducts([x], false);
  equal(plain.a[0], 1);
  ok(Math.abs(plain.sumOfSquares[0] - x.reduce((s, v) => s + v * v, 0)) < 1e-9);
});

Deno.test("eliminate() in place equals elimination into another matrix", () => {
  const cols = invented(20, 4, 4);
  const cp = crossProducts([cols.x1, cols.x2, cols.x3, cols.y], true);
  const other = new Float64Array(16);
  eliminate(cp.a, other, 4, 0);
  eliminate(cp.a, cp.a, 4, 0);
  for (let i = 1; i < 4; i++) for (let j = i; j < 4; j++) equal(cp.a[i * 4 + j], other[i * 4 + j]);
});

function popcount(mask: number): number {
  let n = 0;
  for (let m = mask; m; m &= m - 1) n++;
  return n;
}
