/**
 * The check of a fit whose response has rows below a detection limit
 * (censored.ts): randomized quantile residuals (Dunn & Smyth 1996, J. Comput.
 * Graph. Stat. 5:236–244), whose defining property is that under the model
 * each is distributed as a measured row's residual, N(0, σ²).
 *
 * @module
 */
import assert from "node:assert/strict";
import { standardNormal } from "../../kernel/stats/mod.ts";
import { seededRandom } from "../../kernel/random.ts";
import type { ParseContext, Table } from "../../kernel/contract/mod.ts";
import { makeTable, parseContext, runContext } from "../fit/_fixtures_test.ts";
import { fitKind } from "../fit/mod.ts";
import type { Fit } from "../fit/fit.ts";
import { tableKind } from "../table/mod.ts";
import { checkKind } from "./mod.ts";
import { quantileResiduals } from "./censored.ts";
import { check } from "./_fixtures_test.ts";

Deno.test("randomized quantile residuals: measured rows keep y − ŷ, each censored row lies below its limit, and together they are N(0, σ²) under the model", () => {
  // Simulated from the model itself (μ = 0, σ = 2) and censored at L = −0.5: the residuals
  // must then be N(0, 4) whatever the censoring (Dunn & Smyth 1996, §2).
  const n = 20000, sigma = 2, limit = -0.5;
  const rnd = seededRandom(11);
  const y = new Float64Array(n), fitted = new Float64Array(n), below = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    const v = sigma * rnd.normal();
    below[i] = v < limit ? 1 : 0;
    y[i] = below[i] ? limit : v;
  }
  const r = quantileResiduals(y, fitted, below, sigma, 5);
  let k = 0, sum = 0, sq = 0, under = 0;
  for (let i = 0; i < n; i++) {
    if (below[i]) {
      k++;
      assert.ok(r[i] <= limit, `row ${i}: ${r[i]} above its limit`);
    } else assert.equal(r[i], y[i]);
    sum += r[i];
    sq += r[i] * r[i];
    if (r[i] < -sigma) under++;
  }
  assert.ok(k > 0.3 * n && k < 0.5 * n, `${k} rows censored`);
  // Monte Carlo limits (common practice, no source): mean within 4 SE (σ/√n), variance within
  // 4 SE (σ²·√(2/n)), and P(r < −σ) = Φ(−1) within 4 binomial SEs.
  const mean = sum / n, variance = sq / n - mean * mean;
  assert.ok(Math.abs(mean) < 4 * sigma / Math.sqrt(n), `mean ${mean}`);
  assert.ok(Math.abs(variance - 4) < 4 * 4 * Math.sqrt(2 / n), `variance ${variance}`);
  const p = standardNormal.cdf(-1);
  assert.ok(Math.abs(under / n - p) < 4 * Math.sqrt(p * (1 - p) / n), `${under / n} vs ${p}`);
  // The same seed draws the same residuals (a rerun judges the same numbers).
  assert.deepEqual(quantileResiduals(y, fitted, below, sigma, 5), r);
});

/** An invented decline through a limit of 1 (cells below it written "<1"). */
function censoredTable(): Table {
  const day = Array.from({ length: 24 }, (_, i) => i + 1);
  const rnd = seededRandom(3);
  const cells = day.map((d) => {
    const v = 5.2 - 0.3 * d + 0.4 * rnd.normal();
    return v < 1 ? "<1" : String(Number(v.toFixed(3)));
  });
  return tableKind.run(
    tableKind.parse(
      parseContext("water", {
        columns: ["day", "nitrate"],
        rows: day.map((d, i) => [d, cells[i]]),
        below_limit: ["nitrate"],
      }) as unknown as ParseContext,
    ),
    runContext("water", "x", makeTable({ x: [1] })),
  ) as Table;
}

function fitOn(table: Table, options: Record<string, unknown> = {}): Fit {
  const spec = fitKind.parse(
    parseContext("model", { on: "data", model: "nitrate = a + b*day", ...options }),
  );
  return fitKind.run(spec, runContext("model", "data", table)) as Fit;
}

Deno.test("the check of a censored ML fit judges randomized quantile residuals below each limit, says so, and records how", () => {
  const table = censoredTable();
  const fit = fitOn(table);
  assert.ok(fit.below !== undefined && fit.censoring!.rows_below >= 4);
  const warnings: string[] = [];
  const spec = checkKind.parse({ ...parseContext("judge", { fit: "model" }), kind: "check" });
  checkKind.run(spec, {
    ...runContext("judge", "x", table),
    inputs: { model: fit },
    warn: (m) => warnings.push(m),
  });
  assert.match(
    warnings.join("\n"),
    /censored fit \(\d+ rows below a detection limit\): those rows enter with randomized quantile residuals/,
  );
  const r = check(fit) as unknown as {
    residuals: (number | null)[];
    censored: { rows_below: number; residuals: string; seed: number };
  };
  assert.deepEqual(r.censored, {
    rows_below: fit.censoring!.rows_below,
    residuals: "randomized quantile",
    seed: r.censored.seed,
  });
  // Measured rows keep their residuals; each censored row's lies below L − ŷ (exact property).
  for (let i = 0; i < fit.residuals.length; i++) {
    if (fit.below![i]) assert.ok(r.residuals[i]! <= fit.residuals[i], `row ${i}`);
    else {assert.ok(
        Math.abs(r.residuals[i]! - fit.residuals[i]) <= 1e-12 * (1 + Math.abs(fit.residuals[i])),
      );}
  }
  // The same document seed judges the same residuals; another seed others.
  assert.deepEqual(check(fit).residuals, r.residuals);
  assert.notDeepEqual((check(fit, {}, { seed: 99 }) as unknown as typeof r).residuals, r.residuals);
});

Deno.test("the check of a fit that substituted a fraction of the limit warns that those values are judged as if measured", () => {
  const table = censoredTable();
  const fit = fitOn(table, { substitute: 0.5 });
  const warnings: string[] = [];
  const spec = checkKind.parse({ ...parseContext("judge", { fit: "model" }), kind: "check" });
  checkKind.run(spec, {
    ...runContext("judge", "x", table),
    inputs: { model: fit },
    warn: (m) => warnings.push(m),
  });
  assert.match(
    warnings.join("\n"),
    /substituted a fraction of the limit .* judged here as if they had been measured/,
  );
  const r = check(fit) as unknown as {
    residuals: number[];
    censored: { residuals: string; seed: null };
  };
  assert.equal(r.censored.residuals, "substituted");
  assert.equal(r.censored.seed, null);
  for (let i = 0; i < fit.residuals.length; i++) assert.equal(r.residuals[i], fit.residuals[i]);
});
