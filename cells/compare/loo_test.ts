import assert from "node:assert/strict";
import { compile } from "../../kernel/expr/mod.ts";
import { refit } from "../fit/mod.ts";
import type { Fit } from "../fit/mod.ts";
import { compare, fitOf, makeTable, wiggle } from "./_fixtures_test.ts";

const n = 12;
const x = Float64Array.from({ length: n }, (_, i) => i + 1);
const noise = wiggle(n, 0.05);
const y = x.map((v, i) => 5 * Math.exp(-0.3 * v) + noise[i]);
const table = makeTable({ x, y });

/** √(mean (yᵢ − g⁻¹(ẑ₍ᵢ₎))²) by refitting without each row: the definition PRESS shortcuts. */
function bruteForceLoo(fit: Fit, back: (z: number) => number, raw: Float64Array): number {
  const f = compile(fit.model.rhs, fit.model.columns, fit.parameters);
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const keep = Array.from({ length: n }, (_, j) => j).filter((j) => j !== i);
    const est = refit(fit, keep).estimates;
    const z = f(fit.columns.map((c) => Float64Array.of(c[i])), est, 1)[0];
    const w = fit.weights?.[i] ?? 1;
    sum += w * (raw[i] - back(z)) ** 2;
  }
  return Math.sqrt(sum / n);
}

Deno.test("compare: PRESS leave-one-out RMSE equals refitting without each row (linear fits)", () => {
  // eᵢ/(1 − hᵢ) is the leave-one-out residual (Allen 1974): an identity, checked to 1e-10.
  const line = fitOf("line", "y = a + b*x", table);
  const weighted = fitOf("weighted", "y = a + b*x + c*x^2", table, { weights: "1/x" });
  const logged = fitOf("logged", "log(y) = a + b*x", table);
  const { result } = compare({ line, logged });
  assert.equal(result.rows[0].loo_method, "press");
  const want = [bruteForceLoo(line, (z) => z, y), bruteForceLoo(logged, Math.exp, y)];
  result.rows.forEach((r, i) => {
    assert.ok(Math.abs(r.loo_rmse! / want[i] - 1) < 1e-10, `${r.fit}: ${r.loo_rmse} vs ${want[i]}`);
  });
  const w = compare({
    weighted,
    w2: fitOf("w2", "y = a + b*x", table, { weights: "1/x" }),
  }).result;
  const bw = bruteForceLoo(weighted, (z) => z, y);
  assert.ok(Math.abs(w.rows[0].loo_rmse! / bw - 1) < 1e-10, `${w.rows[0].loo_rmse} vs ${bw}`);
});

Deno.test("compare: nonlinear fits get seeded k-fold RMSE, exactly leave-one-out when folds ≥ n", () => {
  const decay = fitOf("decay", "y = a*exp(-b*x)", table, { start: { a: 4, b: 0.2 } });
  const line = fitOf("line", "y = a + b*x", table);
  const tenfold = compare({ decay, line }, { by: "loo" }).result;
  const row = tenfold.rows[0];
  assert.equal(row.loo_method, "k-fold");
  assert.equal(row.loo_folds, 10);
  assert.equal(tenfold.preferred, "decay");
  // Same seed, same folds, same value (the cache relies on it).
  assert.equal(compare({ decay, line }, { by: "loo" }).result.rows[0].loo_rmse, row.loo_rmse);
  const other = compare({ decay, line }, { by: "loo" }, { seed: 7 }).result.rows[0].loo_rmse!;
  assert.ok(Number.isFinite(other));

  const all = compare({ decay, line }, { folds: 50 }).result.rows[0];
  assert.equal(all.loo_folds, n);
  const want = bruteForceLoo(decay, (z) => z, y);
  assert.ok(Math.abs(all.loo_rmse! / want - 1) < 1e-8, `${all.loo_rmse} vs ${want}`);
});

Deno.test("compare: a leverage of 1 leaves loo_rmse null with a warning", () => {
  // x = 0 except one row: that row alone fixes the slope, h = 1 (common practice, no source).
  const xs = Float64Array.from([0, 0, 0, 0, 0, 1]);
  const ys = Float64Array.from([1, 2, 1.5, 1.2, 1.8, 3]);
  const t = makeTable({ x: xs, y: ys });
  const { result, warnings } = compare({
    mean: fitOf("mean", "y = a", t),
    step: fitOf("step", "y = a + b*x", t),
  }, { by: "aic" });
  assert.equal(result.rows[1].loo_rmse, null);
  assert.ok(Number.isFinite(result.rows[0].loo_rmse!));
  assert.ok(
    warnings.includes(
      '"step" has leverage 1 in row 6: a fit without that row cannot predict it, so there is no leave-one-out RMSE',
    ),
    warnings.join("\n"),
  );
});
