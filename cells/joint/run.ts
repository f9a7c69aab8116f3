/**
 * Running a joint cell: tables + model → {@link JointFit}.
 *
 * ```
 *  inputs ─groupRows─▶ model, groups ─makeLayout─▶ θ = shared once, the rest per group
 *     ─startVector─▶ θ₀ (given, else from the pooled fit) ─stacked─▶ F, J (block structured)
 *     ─fitStacked─▶ lmder → polish → covar ─jointStatistics─▶ s², Cov, SE, Wald, log L, criteria
 *     ─sharingTests─▶ each shared parameter per group, refitted: extra-sum-of-squares F
 * ```
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { didYouMean } from "../../kernel/suggest.ts";
import { type ModelFunctions, modelFunctions } from "../../kernel/optim/mod.ts";
import type { RunContext } from "../../kernel/contract/mod.ts";
import type { JointSpec } from "./spec.ts";
import type { JointFit } from "./joint.ts";
import { countRows, type Group, groupRows } from "./_groups.ts";
import { type Layout, makeLayout, MAX_JACOBIAN, stacked } from "./_stacked.ts";
import { rangeVectors, startVector } from "./_start.ts";
import { failed, fitStacked, type StackedFailure, type StackedFit } from "./_solve.ts";
import { jointStatistics } from "./_statistics.ts";
import { sharingTests } from "./_sharing.ts";
import { rowList } from "../shared/rows.ts";
import { modelUnits } from "../../kernel/units/mod.ts";

const quoted = (xs: readonly string[]) => xs.map((x) => `"${x}"`).join(", ");

/**
 * Fits the spec's model to its groups at once.
 *
 * @param spec The normalised options.
 * @param ctx Inputs (the tables), settings (confidence, seed) and the warning sink.
 * @returns The joint fit.
 * @throws {CellError} For bad tables or columns (see `_groups.ts`), a shared
 *   parameter that is not in the model, too few rows, a model not finite at
 *   the start, no convergence, or parameters the data do not determine.
 */
export function runJoint(spec: JointSpec, ctx: RunContext): JointFit {
  const { model, groups, units: columnUnits } = groupRows(spec, ctx);
  for (const w of model.warnings) ctx.warn(w.message);
  const units = modelUnits(model, columnUnits);
  for (const w of units.warnings) ctx.warn(`${w.message} (joint "${ctx.name}")`);
  const params = model.parameters;
  if (params.length === 0) {
    throw new CellError(
      `Cannot fit "${ctx.name}": the model has no parameters to estimate`,
      ["model"],
      model.rhs.start,
    );
  }
  spec.shared.forEach((s, i) => {
    if (params.includes(s)) return;
    throw new CellError(
      `Shared parameter "${s}" of joint "${ctx.name}" is not a parameter of the model${
        didYouMean(s, params) || `: its parameters are ${quoted(params)}`
      }`,
      ["shared", i],
    );
  });
  const sharedSet = new Set(spec.shared);
  if (sharedSet.size === 0) {
    ctx.warn(
      `Joint fit "${ctx.name}" shares no parameter: it is the separate fits of its groups side by side, with one pooled σ; name the parameters the groups share in "shared"`,
    );
  }
  const layout = makeLayout(params, groups.map((g) => g.label), sharedSet);
  checkSize(ctx.name, spec, groups, layout);
  const fns = groups.map((g) => modelFunctions(g.data));
  const rangeOf = (l: Layout) => rangeVectors(ctx.name, spec, model, l);
  const range = rangeOf(layout);
  const x0 = startVector(ctx.name, spec, model, groups, layout, range, ctx.settings.seed, ctx.warn);
  const st = stacked(groups, fns, layout);
  const solved = fitStacked(st, x0, range.lower, range.upper);
  if (failed(solved)) throw failure(ctx.name, solved, groups, fns, layout, x0);
  warnAtBound(ctx, layout, solved, range.lower);
  const N = st.m;
  const statistics = jointStatistics(
    ctx.name,
    solved,
    N,
    ctx.settings.confidence,
    spec.countVariance,
    ctx.warn,
  );
  const sharing = sharingTests({
    groups,
    fns,
    params,
    shared: params.filter((p) => sharedSet.has(p)),
    layout,
    fit: solved,
    range: rangeOf,
    confidence: ctx.settings.confidence,
  });
  const rows = new Int32Array(N);
  groups.forEach((g, k) => rows.set(g.rows, st.offsets[k]));
  return {
    type: "JointFit",
    model,
    responseText: model.text.slice(model.response.start, model.response.end),
    groups: groups.map((g, k) => {
      let rss = 0;
      for (let i = st.offsets[k]; i < st.offsets[k + 1]; i++) rss += solved.residuals[i] ** 2;
      return { label: g.label, table: g.table, n: g.data.n, rss };
    }),
    units: {
      parameters: params.map((k) => units.parameters.get(k)?.unit ?? null),
      response: units.response,
    },
    groupedBy: spec.by ?? null,
    shared: params.filter((p) => sharedSet.has(p)),
    layout,
    estimates: solved.x,
    atBound: solved.atBound,
    statistics,
    sharing,
    fitted: st.fitted(solved.x),
    residuals: solved.residuals,
    rows,
    offsets: st.offsets,
    iterations: solved.iterations,
  };
}

/** More rows than parameters overall, each group at least as many rows as its own parameters, J within bounds. */
function checkSize(name: string, spec: JointSpec, groups: readonly Group[], layout: Layout): void {
  const N = groups.reduce((s, g) => s + g.data.n, 0), P = layout.names.length;
  const own = layout.names.filter((_, i) => layout.group[i] === 0).length;
  const shared = P - own * groups.length;
  if (N <= P) {
    throw new CellError(
      `Cannot fit "${name}": ${
        countRows(N)
      } for ${P} parameters (${shared} shared, ${own} per group × ${groups.length} groups): a joint fit needs more rows than parameters`,
      ["model"],
    );
  }
  groups.forEach((g, k) => {
    if (g.data.n >= own) return;
    const names = layout.names.filter((_, i) => layout.group[i] === k);
    const where = g.label === g.table ? `table "${g.table}"` : `group "${g.label}"`;
    throw new CellError(
      `Cannot fit "${name}": ${where} has ${countRows(g.data.n)} for its ${own} own parameters ${
        quoted(names)
      }: share more of them, or give the group more rows`,
      spec.on === undefined ? ["tables", spec.tables.indexOf(g.table)] : ["by"],
    );
  });
  if (N * P > MAX_JACOBIAN) {
    throw new CellError(
      `Cannot fit "${name}": ${
        N.toLocaleString("en-US")
      } rows × ${P} parameters make a Jacobian of ${
        Math.round(N * P * 8 / 2 ** 20).toLocaleString("en-US")
      } MiB, more than the ${
        MAX_JACOBIAN * 8 / 2 ** 20
      } MiB a joint fit holds: share more parameters or fit fewer groups at once`,
      ["model"],
    );
  }
}

/** A located, worded error for a joint fit that has no solution. */
function failure(
  name: string,
  f: StackedFailure,
  groups: readonly Group[],
  fns: readonly ModelFunctions[],
  layout: Layout,
  x0: Float64Array,
): CellError {
  if (f.why === "not-finite") {
    for (let g = 0; g < groups.length; g++) {
      const theta = Float64Array.from(layout.map[g], (k) => x0[k]);
      const nf = fns[g].notFinite(theta);
      if (nf === null) continue;
      const grp = groups[g];
      const where = grp.label === grp.table ? `table "${grp.table}"` : `group "${grp.label}"`;
      return new CellError(
        `Cannot fit "${name}": at the start values the model is not finite in ${where}: ${nf.term} at ${
          rowList(nf.rows.map((i) => grp.rows[i]))
        }${nf.usesParameters ? '; try other "start" values' : ""}`,
        nf.usesParameters ? ["start"] : ["model"],
        nf.usesParameters ? undefined : nf.start,
      );
    }
    return new CellError(`Cannot fit "${name}": the model is not finite at the start values`, [
      "start",
    ]);
  }
  if (f.why === "unidentifiable") {
    return new CellError(
      `Cannot fit "${name}": the data do not determine ${
        quoted(f.parameters.map((k) => layout.names[k]))
      } (the Jacobian is singular at the solution): each group needs rows that tell its own parameters apart`,
      ["model"],
    );
  }
  return new CellError(
    `Cannot fit "${name}": no convergence after ${f.iterations} iterations (${f.info}); last RSS ${
      Number(f.rss.toPrecision(5))
    }: give "start" values nearer the solution`,
    ["start"],
  );
}

function warnAtBound(ctx: RunContext, layout: Layout, fit: StackedFit, lower: Float64Array): void {
  fit.atBound.forEach((b, j) => {
    if (!b) return;
    ctx.warn(
      `"${layout.names[j]}" of "${ctx.name}" ended at its ${
        fit.x[j] === lower[j] ? "lower" : "upper"
      } limit ${
        fit.x[j]
      }: its standard error, t and interval are not given, since (JᵀJ)⁻¹ does not describe the uncertainty of an estimate held on a bound`,
    );
  });
}
