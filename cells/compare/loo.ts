/**
 * Out-of-sample error of a fit: leave-one-out RMSE.
 *
 * - Linear fits: PRESS without refitting (Allen 1974, Technometrics 16;
 *   kernel/stats `hatValues` through cells/fit `fitLeverage`, once per fit, and `press`): the leave-one-out residual of row i
 *   is eᵢ/(1 − hᵢ), with weighted hat values for a weighted fit and the
 *   residual scaled by √wᵢ.
 * - Nonlinear fits: k-fold cross-validation (Hastie, Tibshirani & Friedman,
 *   *The Elements of Statistical Learning*, 2nd ed., §7.10): rows are dealt
 *   into k folds by a seeded shuffle (`_folds.ts`, the document's `seed`),
 *   each fold is predicted from a refit on the others (cells/fit `refit`,
 *   started from the full-data estimates); k is the `folds` option, or n
 *   when smaller (then it is exactly leave-one-out).
 *
 * Both are on the original scale of the response column: for a response
 * written as g(y), the held-out prediction ẑ is mapped back by g⁻¹ and the
 * error is yᵢ − g⁻¹(ẑᵢ) (g⁻¹ of a mean on the log scale is a median on the
 * original one), so fits of log(y) and of y are ranked on the same errors.
 * RMSE = √(Σ wᵢ·errorᵢ² / n), wᵢ = 1 for an unweighted fit.
 *
 * @module
 */
import { compile } from "../../kernel/expr/mod.ts";
import { CellError } from "../../kernel/errors.ts";
import { LEVERAGE_ONE_TOLERANCE, press } from "../../kernel/stats/leverage.ts";
import { fitLeverage, refit } from "../fit/mod.ts";
import type { Candidate } from "./comparable.ts";
import { assignFolds } from "./_folds.ts";
import { rowList } from "../shared/rows.ts";

/** A leave-one-out RMSE and how it was obtained. */
export interface LooResult {
  /** Null when it does not exist (see `warning`). */
  rmse: number | null;
  /** "press" (hat matrix) or "k-fold". */
  method: "press" | "k-fold";
  /** Folds used by "k-fold"; null for "press". */
  folds: number | null;
  /** Why `rmse` is null, when it is. */
  warning: string | null;
}

/**
 * The leave-one-out RMSE of a candidate.
 *
 * @param c The candidate (fit and original scale).
 * @param folds Fold count for nonlinear fits (n is used when smaller).
 * @param seed The document's seed, for the folds and any multi-start.
 * @returns The RMSE, the method and a warning when it could not be computed.
 * @throws {RangeError} Only for inconsistent fits (design and residual lengths differ).
 */
export function looRmse(c: Candidate, folds: number, seed: number): LooResult {
  return c.fit.method === "linear" ? pressRmse(c) : kFoldRmse(c, folds, seed);
}

function pressRmse(c: Candidate): LooResult {
  const { fit, scale } = c;
  const hat = fitLeverage(fit);
  const base = { method: "press" as const, folds: null };
  const one: number[] = [];
  for (let i = 0; i < hat.length; i++) {
    if (1 - hat[i] < LEVERAGE_ONE_TOLERANCE) one.push(fit.rows[i]);
  }
  if (one.length > 0) {
    return {
      ...base,
      rmse: null,
      warning: `"${c.name}" has leverage 1 in ${
        rowList(one)
      }: a fit without that row cannot predict it, so there is no leave-one-out RMSE`,
    };
  }
  if (!scale.transformed) {
    return { ...base, rmse: press(fit.residuals, hat, fit.weights).looRmse, warning: null };
  }
  const predicted = fit.y.map((z, i) => z - fit.residuals[i] / (1 - hat[i]));
  return { ...base, ...rmseOriginal(c, predicted, "leave-one-out") };
}

function kFoldRmse(c: Candidate, folds: number, seed: number): LooResult {
  const { fit } = c;
  const n = fit.y.length, k = Math.min(folds, n);
  const base = { method: "k-fold" as const, folds: k };
  const fold = assignFolds(n, k, seed);
  const predicted = new Float64Array(n);
  const f = compile(fit.model.rhs, fit.model.columns, fit.parameters);
  for (let j = 0; j < k; j++) {
    const test: number[] = [], train: number[] = [];
    fold.forEach((g, i) => (g === j ? test : train).push(i));
    let estimates: Float64Array;
    try {
      estimates = refit(fit, train, seed).estimates;
    } catch (e) {
      if (!(e instanceof CellError)) throw e;
      return {
        ...base,
        rmse: null,
        warning: `"${c.name}" could not be refitted without fold ${j + 1} of ${k} (${
          rowList(test.map((i) => fit.rows[i]))
        }): ${e.message}`,
      };
    }
    const cols = fit.columns.map((v) => Float64Array.from(test, (i) => v[i]));
    const z = f(cols, estimates, test.length);
    test.forEach((i, t) => (predicted[i] = z[t]));
  }
  return { ...base, ...rmseOriginal(c, predicted, `${k}-fold`) };
}

/** RMSE of yᵢ − g⁻¹(predictedᵢ), weighted by wᵢ. */
function rmseOriginal(
  c: Candidate,
  predicted: Float64Array,
  what: string,
): { rmse: number | null; warning: string | null } {
  const { fit, scale } = c;
  let sum = 0;
  const bad: number[] = [];
  predicted.forEach((z, i) => {
    const e = scale.values[i] - scale.inverse(z);
    if (Number.isFinite(e)) sum += (fit.weights?.[i] ?? 1) * e * e;
    else bad.push(fit.rows[i]);
  });
  if (bad.length > 0) {
    return {
      rmse: null,
      warning:
        `The ${what} prediction of "${c.name}" has no value on the scale of "${fit.model.responseColumn}" in ${
          rowList(bad)
        }: ${fit.responseText} cannot be undone there`,
    };
  }
  return { rmse: Math.sqrt(sum / predicted.length), warning: null };
}
