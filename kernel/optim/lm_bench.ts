/**
 * Nonlinear fits per second: y = a·exp(−b·x) + c with n = 100 seeded rows,
 * the whole solver path (compile the model and its derivatives, lmder from
 * a fixed start, polishing, covariance). Fits/s = 1 / (time per iteration).
 * The model's compiled forms are kept by its text (`_compiled_model.ts`), so
 * after the first iteration "compile" is that lookup, as in every run of a
 * document after its first. The polish here works on double residuals (no
 * decimal corrections given); the fit cell's path, with the double-double
 * polish and the statistics, is cells/fit/nonlinear_bench.ts.
 *
 * @module
 */
import { parseModel } from "../expr/mod.ts";
import { covar, lmder, modelFunctions, polish } from "./mod.ts";
import { mulberry32 } from "./_random.ts";

const rand = mulberry32(20261201);
const n = 100;
const x = Float64Array.from({ length: n }, (_, i) => (i * 10) / n);
const y = x.map((v) => 3 * Math.exp(-0.7 * v) + 0.5 + 0.02 * (rand() - 0.5));
const model = parseModel("y = a*exp(-b*x) + c", ["x", "y"]);

function fitOnce(): number {
  const fns = modelFunctions({ model, n, columns: [x], y });
  const run = lmder(fns.problem, [1, 1, 0]);
  const p = polish(fns.accurate, run.x);
  const J = new Float64Array(n * 3);
  fns.jac(p.x, J);
  covar(n, 3, J);
  return p.rss;
}

Deno.bench({
  name: "nonlinear fit, 3-parameter exponential, n = 100 (compile + lmder + polish + covar)",
  group: "nonlinear",
  baseline: true,
  fn: () => {
    fitOnce();
  },
});

Deno.bench({
  name: "lmder only, 3-parameter exponential, n = 100 (model compiled once)",
  group: "nonlinear",
  fn: (() => {
    const fns = modelFunctions({ model, n, columns: [x], y });
    return () => {
      lmder(fns.problem, [1, 1, 0]);
    };
  })(),
});
