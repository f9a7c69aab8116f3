import { deepEqual as assertEquals, ok } from "node:assert/strict";
import { mulberry32 } from "../../kernel/random.ts";
import { standardNormal } from "../../kernel/stats/mod.ts";
import { countCells } from "../shared/count_cells.ts";
import { cellEdges, cellOf, DENSITY_GRID } from "../shared/density.ts";
import { checkDensity, DENSE_ROWS, quantileDensity } from "./density.ts";

/** The quantile plot counted point by point over the sorted values (the way before ranks by row). */
function sortedReference(
  values: number[],
  q0: number,
  q1: number,
  position: (i: number) => number,
) {
  const s = [...values].sort((a, b) => a - b);
  const xEdges = cellEdges(q0, q1, DENSITY_GRID.nx);
  const yEdges = cellEdges(s[0], s[s.length - 1], DENSITY_GRID.ny);
  const pEdges = xEdges.map((e) => standardNormal.cdf(e));
  const xc: number[] = [], yc: number[] = [];
  let k = 0;
  for (let i = 0; i < s.length; i++) {
    while (k < DENSITY_GRID.nx - 1 && position(i) >= pEdges[k + 1]) k++;
    xc.push(k);
    yc.push(cellOf(s[i], yEdges));
  }
  return countCells(xc, yc, xEdges, yEdges);
}

function heavyTailed(n: number, seed: number): number[] {
  const u = mulberry32(seed);
  // Invented data: a t-like spread with ties (rounded to 0.01) and a few far values.
  return Array.from(
    { length: n },
    (_, i) =>
      i % 997 === 0
        ? 40 * (u() - 0.5)
        : Math.round(100 * Math.tan(Math.PI * (u() - 0.5) * 0.9)) / 100,
  );
}

Deno.test("quantileDensity() counts unsorted values as the sorted values point by point", () => {
  for (const n of [1, 2, 7, DENSE_ROWS + 1, 20_000]) {
    const v = heavyTailed(n, n);
    const position = (i: number) => (i + 1 - 0.375) / (n + 0.25);
    const q0 = standardNormal.quantile(position(0)), q1 = standardNormal.quantile(position(n - 1));
    // Exact: both count the same ranks into the same cells (integer counts).
    assertEquals(quantileDensity(v, q0, q1, position), sortedReference(v, q0, q1, position));
    assertEquals(
      quantileDensity(Float64Array.from(v).sort(), q0, q1, position),
      sortedReference(v, q0, q1, position),
    );
  }
});

Deno.test("quantileDensity() with all values equal puts every rank in one row", () => {
  const n = 50;
  const position = (i: number) => (i + 1 - 0.375) / (n + 0.25);
  const b = quantileDensity(new Float64Array(n).fill(2), -2, 2, position);
  assertEquals(b.cells.reduce((a, c) => a + c[2], 0), n); // exact: every value counted once
  assertEquals(new Set(b.cells.map((c) => c[1])).size, 1);
});

Deno.test("checkDensity() line spans the quantiles and the extreme studentized residuals", () => {
  const n = DENSE_ROWS + 500;
  const r = heavyTailed(n, 5);
  const nulls = (a: number[]) => a.map((v, i) => (i === 3 ? null : v));
  const d = checkDensity({
    fit: "f",
    fitted: nulls(r.map((_, i) => i)),
    residuals: nulls(r),
    studentized_internal: nulls(r),
    leverage: nulls(r.map(() => 2 / n)),
    cooks_distance: nulls(r.map(() => 0)),
  });
  const finite = r.filter((_, i) => i !== 3);
  const m = finite.length;
  const q = (i: number) => standardNormal.quantile((i + 1 - 0.375) / (m + 0.25));
  // Exact: min and max of the same doubles, and the same quantile calls.
  assertEquals(d?.line, [
    Math.min(q(0), Math.min(...finite)),
    Math.max(q(m - 1), Math.max(...finite)),
  ]);
  assertEquals(d?.quantiles.cells.reduce((a, c) => a + c[2], 0), m);
});

Deno.test("checkDensity() of typed arrays skips NaN (a value that does not exist) in the trace", () => {
  const n = DENSE_ROWS + 10;
  const r = Float64Array.from(heavyTailed(n, 9));
  const h = new Float64Array(n).fill(2 / n);
  h[0] = NaN; // leverage 1: no studentized residual, no value here
  const typed = {
    fit: "f",
    fitted: r.map((_, i) => i),
    residuals: r,
    studentized_internal: r,
    leverage: h,
    cooks_distance: r,
  };
  const d = checkDensity(typed as never);
  // Exact to rounding: (n − 1) terms of 2/n summed.
  ok(d !== null && Math.abs(d.trace - (2 / n) * (n - 1)) < 1e-12, String(d?.trace));
});

Deno.test("a large check's page stand-ins from its output equal those from its complete result", async () => {
  const { checkKind } = await import("./mod.ts");
  const { fitOf } = await import("./_fixtures_test.ts");
  const { parseContext, SETTINGS } = await import("../fit/_fixtures_test.ts");
  // Invented data: 6,000 rows of a line with seeded noise (inverse-normal of uniforms).
  const rnd = mulberry32(11);
  const n = 6000;
  const x = Float64Array.from({ length: n }, (_, i) => i / 100);
  const y = x.map((v) => 1 + 0.5 * v + standardNormal.quantile(0.001 + 0.998 * rnd()));
  const fit = fitOf({ x, y }, "y = a + b*x");
  const spec = checkKind.parse({ ...parseContext("judge", { fit: "model" }), kind: "check" });
  const out = checkKind.run(spec, {
    name: "judge",
    settings: SETTINGS,
    inputs: { model: fit },
    files: {},
    warn: () => {},
    progress: () => {},
  }) as Parameters<NonNullable<typeof checkKind.page>["condenseOutput"] & object>[0];
  const fromOutput = checkKind.page!.condenseOutput!(out);
  const fromResult = checkKind.page!.condense!(checkKind.summary(out, spec));
  ok(fromOutput !== null, "a 6,000-row check is condensed");
  assertEquals(fromOutput, fromResult);
});
