/**
 * The sharing test: may a shared parameter be shared? For each shared
 * parameter (and, with two or more, for all of them together) the joint fit
 * is fitted again with that parameter per group (the larger model, started
 * from the joint estimates copied to every group, so it can only lower the
 * RSS), and the two are compared by the extra-sum-of-squares F test:
 *
 *   F = ((RSS_shared − RSS_separate) / Δdf) / (RSS_separate / df_separate)
 *
 * with Δdf = P_separate − P_shared (the groups less one, per parameter) and
 * df_separate = N − P_separate, referred to F(Δdf, df_separate). Sources:
 * Bates & Watts 1988, *Nonlinear Regression Analysis and Its Applications*,
 * §3.10 (the extra-sum-of-squares principle for nested models, exact for
 * linear models and approximate for nonlinear ones); Motulsky &
 * Christopoulos 2004, *Fitting Models to Biological Data Using Linear and
 * Nonlinear Regression*, the chapters on comparing models and on global
 * fits (testing whether a parameter differs between data sets). Both from
 * memory for the section and chapter numbers.
 *
 * The verdict reads the p-value at the document's confidence level c: below
 * 1 − c, sharing is rejected (the groups differ in that parameter); else the
 * data are consistent with one value (which does not prove the groups equal).
 *
 * @module
 */
import { fisherF } from "../../kernel/stats/mod.ts";
import type { ModelFunctions } from "../../kernel/optim/mod.ts";
import type { Group } from "./_groups.ts";
import { type Layout, makeLayout, stacked } from "./_stacked.ts";
import { failed, fitStacked, type StackedFit } from "./_solve.ts";
import { formatNumber, formatPPhrase } from "../shared/format.ts";

/** One sharing test. */
export interface SharingTest {
  /** The parameters made per group in the larger model. */
  parameters: string[];
  rssShared: number;
  /** RSS of the larger model; null when it could not be fitted. */
  rssSeparate: number | null;
  /** Δdf (numerator) and df_separate (denominator). */
  df1: number;
  df2: number;
  f: number | null;
  pValue: number | null;
  /** True: sharing holds at the level; false: rejected; null: no test. */
  shareable: boolean | null;
  /** Each group's own estimates of the tested parameters in the larger model, by parameter. */
  separate: { parameter: string; estimates: { group: string; estimate: number }[] }[];
  /** The plain-words verdict. */
  verdict: string;
}

/** What every test needs. */
export interface SharingInput {
  groups: readonly Group[];
  fns: readonly ModelFunctions[];
  params: readonly string[];
  shared: readonly string[];
  layout: Layout;
  fit: StackedFit;
  range: (layout: Layout) => { lower: Float64Array; upper: Float64Array };
  confidence: number;
}

/**
 * The sharing tests: one per shared parameter, then all together (with two or more).
 *
 * @param input The joint fit and what it was made of.
 * @returns The tests, in the order of `shared`, the joint test last.
 */
export function sharingTests(input: SharingInput): SharingTest[] {
  const tests = input.shared.map((s) => sharingTest(input, [s]));
  if (input.shared.length >= 2) tests.push(sharingTest(input, [...input.shared]));
  return tests;
}

function sharingTest(input: SharingInput, freed: string[]): SharingTest {
  const { groups, fns, params, layout, fit } = input;
  const labels = groups.map((g) => g.label);
  const larger = makeLayout(
    params,
    labels,
    new Set(input.shared.filter((s) => !freed.includes(s))),
  );
  const N = groups.reduce((s, g) => s + g.data.n, 0);
  const P = layout.names.length, Q = larger.names.length;
  const df1 = Q - P, df2 = N - Q;
  const base = { parameters: freed, rssShared: fit.rss, df1, df2, separate: [] };
  const what = freed.length === 1
    ? `"${freed[0]}"`
    : `${freed.map((f) => `"${f}"`).join(", ")} together`;
  if (df2 <= 0) {
    return {
      ...base,
      rssSeparate: null,
      f: null,
      pValue: null,
      shareable: null,
      verdict:
        `No test of sharing ${what}: with it per group the model has ${Q} parameters for ${N} rows, and no degrees of freedom are left`,
    };
  }
  // Start the larger model at the joint estimates: each group's copy from the shared value.
  const x0 = Float64Array.from(larger.names, (_, i) => {
    const j = larger.parameter[i], g = larger.group[i] ?? 0;
    return fit.x[layout.map[g][j]];
  });
  const { lower, upper } = input.range(larger);
  const sep = fitStacked(stacked(groups, fns, larger), x0, lower, upper);
  if (failed(sep)) {
    const why = sep.why === "unidentifiable"
      ? `${
        sep.parameters.map((k) => `"${larger.names[k]}"`).join(", ")
      } cannot be told apart from the others`
      : sep.why === "not-converged"
      ? `Levenberg–Marquardt did not converge (${sep.info}) after ${sep.iterations} steps`
      : "the model is not finite at the joint estimates";
    return {
      ...base,
      rssSeparate: null,
      f: null,
      pValue: null,
      shareable: null,
      verdict: `No test of sharing ${what}: the fit with it per group failed: ${why}`,
    };
  }
  // Rounding can leave RSS_separate a hair above RSS_shared at a shared optimum: F is then 0.
  const f = Math.max(0, (fit.rss - sep.rss) / df1) / (sep.rss / df2);
  const pValue = Number.isFinite(f) ? fisherF(df1, df2).upper(f) : 0;
  const alpha = 1 - input.confidence;
  const shareable = pValue >= alpha;
  const level = `${formatNumber(100 * input.confidence, 4)}% level`;
  const evidence = `F(${df1}, ${df2}) = ${formatNumber(f, 4)}, ${formatPPhrase(pValue)}`;
  const rss = `RSS ${formatNumber(fit.rss, 5)} shared, ${formatNumber(sep.rss, 5)} per group`;
  const verdict = shareable
    ? `Sharing ${what} holds at the ${level}: a value per group lowers the RSS no more than chance would (${evidence}; ${rss}); this does not show the groups equal, only that these data do not tell them apart`
    : `Sharing ${what} is rejected at the ${level}: the groups differ in ${
      freed.length === 1 ? "it" : "them"
    } (${evidence}; ${rss})`;
  const separate = freed.map((k) => {
    const j = params.indexOf(k);
    return {
      parameter: k,
      estimates: groups.map((g, gi) => ({ group: g.label, estimate: sep.x[larger.map[gi][j]] })),
    };
  });
  return { ...base, rssSeparate: sep.rss, f, pValue, shareable, separate, verdict };
}
