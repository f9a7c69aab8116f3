/**
 * Nonlinear fits per second through the whole `fit` cell (issue 16, item 4):
 * y = a·exp(−b·x) + c on the 100 seeded rows of kernel/optim/lm_bench.ts,
 * from start values a = 1, b = 1, c = 0. One iteration is what a run of the
 * cell does: parse the model, gather the rows, fit (lmder, then the
 * Gauss–Newton polish on double-double residuals from the data as printed,
 * which lm_bench leaves out), the covariance, the condition number and every
 * statistic of the result. A second bench starts without start values (the
 * seeded multi-start search).
 *
 * Run: deno bench cells/fit/nonlinear_bench.ts
 */
import { mulberry32 } from "../../kernel/optim/_random.ts";
import { fitKind } from "./mod.ts";
import { makeTable, parseContext, runContext } from "./_fixtures_test.ts";

const rand = mulberry32(20261201);
const n = 100;
const x = Float64Array.from({ length: n }, (_, i) => (i * 10) / n);
const y = x.map((v) => 3 * Math.exp(-0.7 * v) + 0.5 + 0.02 * (rand() - 0.5));
const table = makeTable({ x, y });
const model = "y = a*exp(-b*x) + c";
const given = fitKind.parse(
  parseContext("decay", { on: "data", model, start: { a: 1, b: 1, c: 0 } }),
);
const searched = fitKind.parse(parseContext("decay", { on: "data", model }));

Deno.bench({
  name: "fit cell, 3-parameter exponential, n = 100, start values given (parse, lmder, " +
    "double-double polish, covariance, statistics)",
  group: "fit cell, nonlinear",
  baseline: true,
  fn: () => {
    fitKind.run(given, runContext("decay", "data", table));
  },
});

Deno.bench({
  name: "fit cell, 3-parameter exponential, n = 100, no start values (multi-start search)",
  group: "fit cell, nonlinear",
  fn: () => {
    fitKind.run(searched, runContext("decay", "data", table));
  },
});
