/**
 * Running a compare cell: fits → {@link Comparison}.
 *
 * ```
 *  inputs[fits] ─originalScale─▶ candidates ─checkComparable─▶ (refuse, or go on)
 *     ├─ candidateCriteria (log L on the original scale, AIC/AICc/BIC)
 *     ├─ looRmse (PRESS for linear fits, seeded k-fold for nonlinear fits)
 *     ├─ rankBy(by) ─▶ Δ, Akaike weights, preferred
 *     ├─ nestedTests (linear fits, column-space inclusion, F tests), among fits of equal weights
 *     └─ verdict (with the basis of the comparison when the weights differ)
 * ```
 *
 * Fits that differ only in their relative weights are ranked by AIC, AICc
 * or BIC (comparable.ts); an F test needs one variance model, so nested
 * pairs are tested only among fits of the same weights, and the
 * leave-one-out RMSE, weighted by each fit's own weights, cannot rank them.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import type { RunContext } from "../../kernel/contract/mod.ts";
import type { Fit } from "../fit/mod.ts";
import type { CompareSpec } from "./spec.ts";
import { type Candidate, checkComparable, sameWeights } from "./comparable.ts";
import { originalScale } from "./original_scale.ts";
import { candidateCriteria, type Criteria } from "./criteria.ts";
import { type LooResult, looRmse } from "./loo.ts";
import { rankBy } from "./akaike_weights.ts";
import { type NestedTest, nestedTests } from "./nested_tests.ts";
import { EVIDENCE_SCALES, LABELS, verdict, weightingBasis } from "./verdict.ts";
import type { CompareRow, Comparison } from "./result.ts";

/**
 * Compares the spec's fits.
 *
 * @param spec The normalised options.
 * @param ctx Inputs (the fits by name), settings (seed) and the warning sink.
 * @returns The comparison.
 * @throws {CellError} At `fits` for an input that is not a fit, fits that are
 *   not comparable (`comparable.ts`) or a transform with no original scale
 *   (`original_scale.ts`); at `by` for `loo` over fits weighted differently.
 */
export function runCompare(spec: CompareSpec, ctx: RunContext): Comparison {
  const candidates = spec.fits.map((name, j): Candidate => {
    const fit = fitInput(ctx, name, j);
    return { name, fit, scale: originalScale(fit, ctx.name, ["fits", j]) };
  });
  checkComparable(ctx.name, candidates);
  const weights = differentWeights(ctx.name, candidates, spec.by);
  const criteria = candidates.map(candidateCriteria);
  const loo = candidates.map((c) => looRmse(c, spec.folds, ctx.settings.seed));
  for (const l of loo) if (l.warning !== null) ctx.warn(l.warning);
  const by = spec.by;
  const scores = by === "loo" ? loo.map((l) => l.rmse) : criteria.map((c) => c[by]);
  const ranking = rankBy(scores, spec.by !== "loo");
  const rows = candidates.map((c, j) =>
    row(c, criteria[j], loo[j], ranking.delta[j], ranking.weight[j], ranking.rank[j])
  );
  const unranked = rows.filter((r) => r.rank === null).map((r) => r.fit);
  if (unranked.length > 0) {
    ctx.warn(
      `${unranked.map((f) => `"${f}"`).join(", ")} ${unranked.length === 1 ? "has" : "have"} no ${
        LABELS[spec.by]
      } and ${unranked.length === 1 ? "is" : "are"} not ranked`,
    );
  }
  const nested = nestedWithinWeights(candidates);
  const ranked = rows.filter((r) => r.rank !== null).sort((a, b) => a.rank! - b.rank!)
    .map((r) => ({
      fit: r.fit,
      value: scores[rows.indexOf(r)]!,
      delta: r.delta!,
      weight: r.weight,
    }));
  const transformed = candidates.filter((c) => c.scale.transformed).map((c) => c.fit.responseText);
  return {
    type: "Comparison",
    result: {
      by: spec.by,
      rows,
      preferred: ranking.best < 0 ? null : spec.fits[ranking.best],
      nested_tests: nested,
      verdict: verdict({
        by: spec.by,
        ranked,
        unranked,
        nested,
        significance: spec.significance,
        ...(weights ? { weights } : {}),
      }),
      criterion: LABELS[spec.by],
      k_convention: candidates[0].fit.statistics.kConvention,
      evidence_scale: EVIDENCE_SCALES[spec.by],
      criteria_scale: criteriaScale(candidates[0].fit.model.responseColumn, transformed),
      significance: spec.significance,
      weighting_basis: weights ? weightingBasis(weights) : null,
    },
  };
}

/**
 * Each fit's weights as written when they differ between the fits (null
 * when all are weighted alike); refuses `by: loo` then.
 */
function differentWeights(
  cell: string,
  all: readonly Candidate[],
  by: CompareSpec["by"],
): { fit: string; weights: string | null }[] | null {
  const first = all[0].fit.weights;
  const odd = all.find((c) => !sameWeights(first, c.fit.weights));
  if (odd === undefined) return null;
  if (by === "loo") {
    throw new CellError(
      `Cannot compare "${cell}" by leave-one-out RMSE: fits "${
        all[0].name
      }" and "${odd.name}" are weighted differently, and each RMSE is weighted by its own fit's weights: rank them by aic, aicc or bic`,
      ["by"],
    );
  }
  return all.map((c) => ({ fit: c.name, weights: c.fit.weightsText ?? null }));
}

/** Nested F tests among fits of equal weights (an F test compares RSS of one variance model). */
function nestedWithinWeights(all: readonly Candidate[]): NestedTest[] {
  const groups: Candidate[][] = [];
  for (const c of all) {
    const g = groups.find((g) => sameWeights(g[0].fit.weights, c.fit.weights));
    if (g) g.push(c);
    else groups.push([c]);
  }
  if (groups.length === 1) return nestedTests(all);
  const at = new Map(all.map((c, j) => [c.name, j]));
  return groups.flatMap((g) => nestedTests(g)).sort((s, t) =>
    at.get(s.smaller)! - at.get(t.smaller)! || at.get(s.larger)! - at.get(t.larger)!
  );
}

function fitInput(ctx: RunContext, name: string, j: number): Fit {
  const out = ctx.inputs[name];
  if (out === undefined || out.type !== "Fit") {
    throw new CellError(`Cannot compare "${ctx.name}": cell "${name}" gives no fit`, ["fits", j]);
  }
  const robust = (out as Fit).robust;
  if (robust !== undefined) {
    // An M-estimate has no Gaussian likelihood and minimises no sum of squares (cells/fit/_robust.ts).
    throw new CellError(
      `Cannot compare "${ctx.name}": fit "${name}" is a robust M-estimate (loss ${robust.loss}), and the comparison's log-likelihood, AIC, AICc, BIC, F tests and leave-one-out RMSE belong to least-squares fits; judge it beside the least-squares fit in a check or a chart instead`,
      ["fits", j],
    );
  }
  const censoring = (out as Fit).censoring;
  if (censoring !== undefined && censoring.method === "maximum likelihood") {
    // A censored-normal likelihood is not the Gaussian one the comparison's criteria use.
    throw new CellError(
      `Cannot compare "${ctx.name}": fit "${name}" has ${censoring.rows_below} rows below a detection limit, fitted by censored maximum likelihood, and the comparison's F tests and leave-one-out RMSE belong to least-squares fits; read each such fit's own log-likelihood and AIC (same table, same limits) instead`,
      ["fits", j],
    );
  }
  return out as Fit;
}

function row(
  c: Candidate,
  cr: Criteria,
  loo: LooResult,
  delta: number | null,
  weight: number | null,
  rank: number | null,
): CompareRow {
  const st = c.fit.statistics;
  return {
    fit: c.name,
    n: cr.n,
    k: cr.k,
    rss: st.rss,
    r2: st.r2,
    adj_r2: st.adjR2,
    sigma: st.sigma,
    log_likelihood: cr.logLikelihood,
    log_likelihood_original_scale: cr.logLikelihoodOriginal,
    aic: cr.aic,
    aicc: cr.aicc,
    bic: cr.bic,
    delta,
    weight,
    loo_rmse: loo.rmse,
    rank,
    response: c.fit.responseText,
    method: c.fit.method,
    log_jacobian: c.scale.logJacobian,
    loo_method: loo.method,
    loo_folds: loo.folds,
    weights_option: c.fit.weighting === "relative" ? c.fit.weightsText ?? null : null,
  };
}

function criteriaScale(column: string, transformed: string[]): string {
  const base =
    `log-likelihood, AIC, AICc, BIC and leave-one-out RMSE are on the scale of column "${column}"`;
  if (transformed.length === 0) return base;
  const list = [...new Set(transformed)].map((t) => `"${t}"`).join(", ");
  return `${base}: for ${list} log L includes the log-Jacobian Σ ln |g′(y)| of the transform`;
}
