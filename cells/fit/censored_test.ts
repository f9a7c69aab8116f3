/**
 * The censored-normal maximum likelihood of _censored.ts against an
 * independent computation of the same estimate: the EM algorithm for a
 * normal linear model with left-censored responses (Dempster, Laird & Rubin
 * 1977, JRSS B 39, §4.1.2 on censored normal data; the E-step's moments of a
 * normal truncated above, Johnson, Kotz & Balakrishnan, *Continuous
 * Univariate Distributions* vol. 1, 2nd ed. (1994), §13.10 — from memory for
 * the sections). EM converges to the same maximum by another route.
 */
import assert from "node:assert/strict";
import { parseModel } from "../../kernel/expr/mod.ts";
import { modelFunctions } from "../../kernel/optim/mod.ts";
import { standardNormal } from "../../kernel/stats/mod.ts";
import { fitCensored } from "./_censored.ts";
import { fitResult, makeTable, parseContext, runContext, SETTINGS } from "./_fixtures_test.ts";
import { fitKind } from "./mod.ts";
import type { Fit } from "./fit.ts";
import { compareKind } from "../compare/mod.ts";
import { tableKind } from "../table/mod.ts";
import type { ParseContext, Table } from "../../kernel/contract/mod.ts";

/** EM for y = a + b·x with responses below Lᵢ where flagged: (a, b, σ). */
function emLine(x: number[], y: number[], below: number[]): [number, number, number] {
  const n = x.length;
  let a = 0, b = 0, s = 1;
  // Start: least squares on the values as written.
  [a, b] = ols(x, y);
  s = Math.sqrt(y.reduce((t, v, i) => t + (v - a - b * x[i]) ** 2, 0) / (n - 2));
  for (let it = 0; it < 20000; it++) {
    const ey: number[] = [], ey2: number[] = [];
    for (let i = 0; i < n; i++) {
      const mu = a + b * x[i];
      if (!below[i]) {
        ey.push(y[i]);
        ey2.push(y[i] * y[i]);
        continue;
      }
      // Y | Y < L for Y ~ N(mu, s²): E = mu − s·λ, E[Y²] = mu² + s² − s·(L + mu)·λ, λ = φ(c)/Φ(c).
      const c = (y[i] - mu) / s;
      const lam = standardNormal.density(c) / standardNormal.cdf(c);
      ey.push(mu - s * lam);
      ey2.push(mu * mu + s * s - s * (y[i] + mu) * lam);
    }
    const [na, nb] = ols(x, ey);
    let rss = 0;
    for (let i = 0; i < n; i++) {
      const m = na + nb * x[i];
      rss += ey2[i] - 2 * m * ey[i] + m * m;
    }
    const ns = Math.sqrt(rss / n);
    const done = Math.abs(na - a) + Math.abs(nb - b) + Math.abs(ns - s) < 1e-13;
    a = na;
    b = nb;
    s = ns;
    if (done) break;
  }
  return [a, b, s];
}

function ols(x: number[], y: number[]): [number, number] {
  const n = x.length;
  const mx = x.reduce((t, v) => t + v, 0) / n, my = y.reduce((t, v) => t + v, 0) / n;
  let sxy = 0, sxx = 0;
  for (let i = 0; i < n; i++) {
    sxy += (x[i] - mx) * (y[i] - my);
    sxx += (x[i] - mx) ** 2;
  }
  const b = sxy / sxx;
  return [my - b * mx, b];
}

Deno.test("censored ML of a line equals the EM algorithm's estimate (an independent route to the same maximum)", () => {
  // Invented: a decline through a detection limit of 1.0 (rows below it are recorded as 1.0).
  const x = Array.from({ length: 24 }, (_, i) => i);
  const raw = x.map((v) => 5 - 0.25 * v + 0.6 * Math.sin(2.7 * v + 1));
  const below: number[] = raw.map((v) => (v < 1 ? 1 : 0));
  const y = raw.map((v) => Math.max(v, 1));
  assert.ok(below.reduce((t, v) => t + v, 0) >= 5, "several rows below the limit");
  const model = parseModel("y = a + b*x", ["x", "y"]);
  const fns = modelFunctions({
    model,
    n: x.length,
    columns: [Float64Array.from(x)],
    y: Float64Array.from(y),
  });
  const fit = fitCensored({
    fns,
    y: Float64Array.from(y),
    below: Uint8Array.from(below),
    start: Float64Array.from(ols(x, y)),
  });
  assert.ok(fit.converged);
  const [a, b, s] = emLine(x, y, below);
  assert.ok(Math.abs(fit.estimates[0] - a) < 1e-7 * Math.abs(a), `a ${fit.estimates[0]} vs ${a}`);
  assert.ok(Math.abs(fit.estimates[1] - b) < 1e-7 * Math.abs(b), `b ${fit.estimates[1]} vs ${b}`);
  assert.ok(Math.abs(fit.sigma - s) < 1e-7 * s, `σ ${fit.sigma} vs ${s}`);
  // Least squares on the limits as if measured is biased: the slope is flattened.
  assert.ok(Math.abs(ols(x, y)[1]) < Math.abs(fit.estimates[1]));
  assert.ok(fit.stdErrors.every((v) => v > 0 && Number.isFinite(v)));
});

Deno.test("with nothing below a limit, the censored ML is least squares (σ by n, not n − p: exact)", () => {
  const x = [1, 2, 3, 4, 5, 6, 7, 8];
  const y = x.map((v) => 2 + 0.5 * v + 0.1 * Math.cos(3 * v));
  const model = parseModel("y = a + b*x", ["x", "y"]);
  const fns = modelFunctions({
    model,
    n: 8,
    columns: [Float64Array.from(x)],
    y: Float64Array.from(y),
  });
  const fit = fitCensored({
    fns,
    y: Float64Array.from(y),
    below: new Uint8Array(8),
    start: Float64Array.from([0, 0]),
  });
  const [a, b] = ols(x, y);
  assert.ok(Math.abs(fit.estimates[0] - a) < 1e-9 && Math.abs(fit.estimates[1] - b) < 1e-9);
  const rss = y.reduce((t, v, i) => t + (v - a - b * x[i]) ** 2, 0);
  assert.ok(Math.abs(fit.sigma - Math.sqrt(rss / 8)) < 1e-9);
});

Deno.test("a fit on a table with cells written <L is the censored ML fit (equal to EM); substitute is warned and compared; refusals at their options", () => {
  // Invented nitrate decline through a limit of 1 (cells below it written "<1").
  const day = Array.from({ length: 16 }, (_, i) => i + 1);
  const raw = day.map((d) => 4.6 - 0.45 * d + 0.25 * Math.sin(2.1 * d));
  const cells = raw.map((v) => (v < 1 ? "<1" : String(Number(v.toFixed(4)))));
  const table = tableKind.run(
    tableKind.parse(
      parseContext("water", {
        columns: ["day", "nitrate"],
        rows: day.map((d, i) => [d, cells[i]]),
        below_limit: ["nitrate"],
      }) as unknown as ParseContext,
    ),
    runContext("water", "x", makeTable({ x: [1] })),
  ) as Table;
  const y = cells.map((c) => (c === "<1" ? 1 : Number(c)));
  const below: number[] = cells.map((c) => (c === "<1" ? 1 : 0));
  assert.ok(below.reduce((t, v) => t + v, 0) >= 4);
  const { result, warnings } = fitResult("trend", "nitrate = a + b*day", table);
  const r = result as unknown as {
    parameters: { estimate: number }[];
    sigma: number;
    r2: number | null;
    censoring: { rows_below: number; method: string; substitutions: { label: string }[] };
  };
  const [a, b, s] = emLine(day, y, below);
  assert.ok(Math.abs(r.parameters[0].estimate - a) < 1e-6 * Math.abs(a));
  assert.ok(Math.abs(r.parameters[1].estimate - b) < 1e-6 * Math.abs(b));
  assert.ok(Math.abs(r.sigma - s) < 1e-6 * s);
  assert.equal(r.r2, null);
  assert.equal(r.censoring.method, "maximum likelihood");
  assert.deepEqual(r.censoring.substitutions.map((x) => x.label), ["0", "L/2", "L/√2", "L"]);
  assert.match(warnings.join("\n"), /lie below their detection limit/);
  const half = fitResult("halved", "nitrate = a + b*day", table, { substitute: 0.5 });
  assert.match(half.warnings.join("\n"), /were given 0.5·L \(substitute\)/);
  assert.throws(
    () => fitResult("t", "nitrate = a + b*day", table, { weights: "1/day" }),
    /below a detection limit and weights/,
  );
  assert.throws(
    () => fitResult("t", "1/nitrate = a + b*day", table),
    /only under an increasing transform/,
  );
  assert.throws(
    () => fitResult("t", "nitrate = a + b*day", table, { intervals: ["profile"] }),
    /profile or bootstrap intervals/,
  );
});

Deno.test("compare refuses a censored fit at its place, saying what to read instead", () => {
  const table = tableKind.run(
    tableKind.parse(
      parseContext("water", {
        columns: ["day", "nitrate"],
        rows: [[1, "3.1"], [2, "2.6"], [3, "2.2"], [4, "1.5"], [5, "<1"], [6, "<1"], [7, "1.2"]],
        below_limit: ["nitrate"],
      }) as unknown as ParseContext,
    ),
    runContext("water", "x", makeTable({ x: [1] })),
  ) as Table;
  const spec = fitKind.parse(parseContext("ml", { on: "data", model: "nitrate = a + b*day" }));
  const fit = fitKind.run(spec, runContext("ml", "data", table)) as Fit;
  const cspec = compareKind.parse({
    name: "cmp",
    kind: "compare",
    options: { fits: ["ml", "ml2"] },
    body: "",
    settings: SETTINGS,
    warn() {},
  });
  assert.throws(
    () =>
      compareKind.run(cspec, {
        ...runContext("cmp", "x", table),
        inputs: { ml: fit, ml2: fit },
      }),
    (e: Error & { path?: unknown[] }) =>
      /below a detection limit, fitted by censored maximum likelihood/.test(e.message) &&
      JSON.stringify(e.path) === '["fits",0]',
  );
});

Deno.test("a predictor with values below a detection limit is refused at its place in the model", () => {
  const table = tableKind.run(
    tableKind.parse(
      parseContext("water", {
        columns: ["nitrate", "flow"],
        rows: [["3.1", 10], ["2.6", 12], ["<1", 15], ["1.5", 18], ["1.2", 20]],
        below_limit: ["nitrate"],
      }) as unknown as ParseContext,
    ),
    runContext("water", "x", makeTable({ x: [1] })),
  ) as Table;
  assert.throws(
    () => fitResult("f", "flow = a + b*nitrate", table),
    (e: Error & { path?: unknown[]; offset?: number }) =>
      /predictor "nitrate" has values below a detection limit \(row 3/.test(e.message) &&
      JSON.stringify(e.path) === '["model"]' && e.offset === "flow = a + b*".length,
  );
});
