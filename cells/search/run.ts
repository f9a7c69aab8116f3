/**
 * Running a search cell: table → every subset of the candidates ranked.
 *
 * ```
 *  inputs[on] ─searchData─▶ columns on complete rows
 *     ─crossProducts─▶ correlation-scale matrix [always…, candidates…, response]
 *     ─eliminate each always column─▶ the root of the tree
 *     ─walkSubsets─▶ per size, the subsets of smallest RSS (one sweep step each)
 *  columns on complete rows ─reduceRows─▶ R of [1, always…, candidates…, response]
 *     ─rankSizes─▶ the kept subsets refitted by QR from R (exact_fit.ts), ranked by the
 *                  criterion ─▶ SearchResult
 * ```
 *
 * Progress: the tree walk reports the share of subsets visited (90 % of the
 * bar), the refits the rest.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { ExprError, parseModel } from "../../kernel/expr/mod.ts";
import type { RunContext, Table } from "../../kernel/contract/mod.ts";
import type { SearchSpec } from "./spec.ts";
import { type SearchData, searchData } from "./_data.ts";
import { crossProducts, eliminate } from "./cross_products.ts";
import { PIVOT_TOLERANCE, walkSubsets } from "./subset_tree.ts";
import { LOO_POOL, overallExact, rankSizes, type SizeRanking } from "./rank_sizes.ts";
import {
  better,
  criterionOf,
  fitBasis,
  kConvention,
  LOO_ROWS,
  type SubsetFit,
} from "./exact_fit.ts";
import { subsetModel } from "./model_text.ts";
import {
  CRITERION_NAMES,
  type SearchModel,
  type SearchOutput,
  type SearchResult,
} from "./result.ts";

/** Share of the progress bar for the tree walk; the refits take the rest. */
const WALK_SHARE = 0.9;

/**
 * Ranks every subset of the spec's candidates.
 *
 * @param spec The normalised options.
 * @param ctx The table under `spec.on`, the warning sink and progress.
 * @returns The ranked subsets.
 * @throws {CellError} For a missing table, unknown or text columns, a column
 *   a model cannot name, too few rows, or `always` columns that are collinear.
 */
export function runSearch(spec: SearchSpec, ctx: RunContext): SearchOutput {
  const table = ctx.inputs[spec.on] as Table | undefined;
  if (table === undefined || table.type !== "Table") {
    throw new CellError(`Cannot search "${ctx.name}": cell "${spec.on}" gives no table`, ["on"]);
  }
  const data = searchData(ctx.name, spec, table, ctx.warn);
  const columns = table.columns.map((c) => c.name);
  checkWritable(ctx.name, spec, data, columns);
  const f = data.forced.length, c = data.candidates.length, m = f + c + 1;
  const base = (spec.intercept ? 1 : 0) + f;
  const largest = sizeLimit(ctx, spec, data, base);
  const cp = crossProducts([...data.forced, ...data.columns, data.y], spec.intercept);
  for (let l = 0; l < f; l++) {
    if (!(cp.a[l * m + l] > PIVOT_TOLERANCE)) throw collinearAlways(ctx.name, spec, data, l);
    eliminate(cp.a, cp.a, m, l);
  }
  const tree = walkSubsets({
    a: cp.a,
    m,
    first: f,
    c,
    largest,
    withEmpty: base > 0,
    keep: spec.by === "loo" ? Math.max(LOO_POOL, spec.keep) : spec.keep,
    progress: (share, visited, total) =>
      ctx.progress(
        WALK_SHARE * share,
        `${visited.toLocaleString("en-US")} of ${total.toLocaleString("en-US")} subsets`,
      ),
  });
  // Leave-one-out errors cost a pass over the rows per model: given up to LOO_ROWS rows.
  const loo = spec.by === "loo" || data.n <= LOO_ROWS;
  const countVariance = spec.countVariance !== false;
  const basis = fitBasis(data, spec.intercept, countVariance, cp.sumOfSquares[m - 1], loo);
  const sizes = rankSizes(
    tree,
    basis,
    spec.by,
    spec.keep,
    (share) => ctx.progress(WALK_SHARE + (1 - WALK_SHARE) * share, "refitting the best subsets"),
  );
  warnAliased(ctx, tree.aliased, tree.aliasedExamples, data);
  const result = resultOf(spec, data, sizes, tree, largest, columns, loo);
  warnInexact(ctx, sizes, result.exact);
  return { type: "Ranked", result };
}

/** Every column the models name must read as a column in a model. */
function checkWritable(name: string, spec: SearchSpec, d: SearchData, columns: string[]): void {
  const terms = [...d.always, ...d.candidates];
  const tryModel = (t: string[]) =>
    parseModel(subsetModel(d.response, t, spec.intercept, columns), columns);
  try {
    tryModel(terms);
  } catch (e) {
    if (!(e instanceof ExprError)) throw e;
    const bad = terms.find((t) => {
      try {
        tryModel([t]);
        return false;
      } catch {
        return true;
      }
    });
    const at = bad === undefined
      ? []
      : d.always.includes(bad)
      ? ["always", d.always.indexOf(bad)]
      : spec.candidates === null
      ? []
      : ["candidates", d.candidates.indexOf(bad)];
    throw new CellError(
      `Cannot search "${name}": ${
        bad === undefined ? "the model" : `column "${bad}"`
      } cannot be written in a model (${e.message}); rename the column with derive`,
      at,
    );
  }
}

/** The largest subset size: the spec's, the number of candidates, and what the rows allow. */
function sizeLimit(ctx: RunContext, spec: SearchSpec, d: SearchData, base: number): number {
  const c = d.candidates.length;
  const byRows = d.n - 1 - base;
  const wanted = Math.min(spec.largest ?? c, c);
  if (byRows < wanted) {
    ctx.warn(
      `Search "${ctx.name}" stops at ${byRows} ${byRows === 1 ? "candidate" : "candidates"} a ` +
        `subset: ${d.n} rows leave no residual degree of freedom for larger models`,
    );
  }
  return Math.min(wanted, byRows);
}

function collinearAlways(name: string, spec: SearchSpec, d: SearchData, l: number): CellError {
  const before = [...(spec.intercept ? ["the intercept"] : []), ...d.always.slice(0, l)];
  const column = d.always[l];
  return new CellError(
    `Cannot search "${name}": column "${column}" in "always" ${
      before.length === 0
        ? "is zero on every row used"
        : `is a linear combination of ${
          before.map((b) => b === "the intercept" ? b : `"${b}"`).join(", ")
        }`
    }, so every subset would be aliased`,
    ["always", spec.always.indexOf(column)],
  );
}

function warnAliased(ctx: RunContext, aliased: number[], examples: number[], d: SearchData): void {
  const count = aliased.reduce((s, x) => s + x, 0);
  if (count === 0) return;
  const sets = examples.map((mask) => `{${chosenOf(mask, d).join(", ")}}`).join(", ");
  ctx.warn(
    `${count.toLocaleString("en-US")} ${
      count === 1 ? "subset" : "subsets"
    } of search "${ctx.name}" ` +
      `${count === 1 ? "is" : "are"} aliased and ranked last: in each, a candidate is a linear ` +
      `combination of the other columns (1 − R² ≤ ${PIVOT_TOLERANCE}); the smallest found: ${sets}`,
  );
}

function warnInexact(ctx: RunContext, sizes: SizeRanking[], overall: boolean): void {
  const inexact = sizes.filter((s) => !s.exact).map((s) => s.size);
  if (inexact.length === 0) return;
  ctx.warn(
    `Leave-one-out lists of search "${ctx.name}" for ${inexact.length === 1 ? "size" : "sizes"} ${
      inexact.join(", ")
    } rank the ${LOO_POOL} subsets of smallest RSS of each size, not all of them: many fit ` +
      `almost equally well there; the best overall ${
        overall ? "is exact (PRESS ≥ RSS rules out the rest)" : "is exact only among those fitted"
      }`,
  );
}

/** The candidates in a mask, in candidate order. */
function chosenOf(mask: number, d: SearchData): string[] {
  return d.candidates.filter((_, j) => (mask >>> j) & 1);
}

function resultOf(
  spec: SearchSpec,
  d: SearchData,
  sizes: SizeRanking[],
  tree: { subsets: number[]; aliased: number[]; aliasedExamples: number[] },
  largest: number,
  columns: string[],
  loo: boolean,
): SearchResult {
  const order = better(spec.by);
  const overall = sizes.flatMap((s) => s.best).sort(order).slice(0, spec.keep);
  const top = overall.length > 0 ? criterionOf(overall[0], spec.by) : null;
  const exact = spec.by !== "loo" || overallExact(sizes, overall, spec.keep, d.n);
  const model = (f: SubsetFit): SearchModel => {
    const chosen = chosenOf(f.mask, d);
    const predictors = [...d.always, ...chosen];
    const value = criterionOf(f, spec.by);
    return {
      predictors,
      chosen,
      size: chosen.length,
      p: f.p,
      k: f.k,
      criterion: value,
      delta: value === null || top === null
        ? null
        : spec.by === "adj_r2"
        ? top - value
        : value - top,
      rss: f.rss,
      r2: f.r2,
      adj_r2: f.adjR2,
      log_likelihood: f.logLikelihood,
      aic: f.aic,
      aicc: f.aicc,
      bic: f.bic,
      loo_rmse: f.looRmse,
      model: subsetModel(d.response, predictors, spec.intercept, columns),
    };
  };
  const evaluated = tree.subsets.reduce((s, x) => s + x, 0);
  return {
    on: spec.on,
    response: d.response,
    response_unit: d.unit,
    by: spec.by,
    criterion: CRITERION_NAMES[spec.by],
    larger_is_better: spec.by === "adj_r2",
    candidates: d.candidates,
    always: d.always,
    intercept: spec.intercept,
    n: d.n,
    keep: spec.keep,
    largest,
    subsets_evaluated: evaluated,
    aliased: tree.aliased.reduce((s, x) => s + x, 0),
    aliased_examples: tree.aliasedExamples.map((mask) => chosenOf(mask, d)),
    k_convention: kConvention(spec.countVariance !== false),
    count_variance: spec.countVariance !== false,
    best: overall.map(model),
    exact,
    sizes: sizes.map((s) => ({
      size: s.size,
      subsets: s.subsets,
      aliased: s.aliased,
      best: s.best.map(model),
      exact: s.exact,
    })),
    loo_given: loo,
    method: methodSentence(spec.by, evaluated, loo),
  };
}

function methodSentence(by: SearchSpec["by"], evaluated: number, loo: boolean): string {
  const walk = `All ${evaluated.toLocaleString("en-US")} subsets were reached by one sweep step ` +
    "each from their parent in Furnival's tree (1971; Furnival & Wilson 1974) and ranked by " +
    "residual sum of squares within each size";
  return by === "loo"
    ? `${walk}; leave-one-out error was then computed by QR for the subsets of smallest RSS of ` +
      "each size until PRESS ≥ RSS ruled out the rest, and every number shown comes from a QR fit"
    : `${walk}, which orders ${CRITERION_NAMES[by]} within a size; the models kept were then ` +
      `fitted by QR, and every number shown comes from that fit${
        loo ? "" : ` (leave-one-out errors only up to ${LOO_ROWS.toLocaleString("en-US")} rows)`
      }`;
}
