/**
 * Start values of a joint fit and the ranges of its parameters, in the
 * global layout. Values given in `start` are used as written (a number for
 * every group's copy, or one per group); any copy left without one starts
 * from a fit of the pooled rows with every parameter shared (fewest
 * parameters, most rows: the easiest problem of the family), found by the fit
 * kind's seeded multi-start (kernel/optim `multiStart`) where that fit lacks
 * start values itself.
 *
 * @module
 */
import { CellError } from "../../kernel/errors.ts";
import { didYouMean } from "../../kernel/suggest.ts";
import { isLinearIn, type Model } from "../../kernel/expr/mod.ts";
import { lmder, type ModelFunctions, modelFunctions, multiStart } from "../../kernel/optim/mod.ts";
import type { Group } from "./_groups.ts";
import type { Layout } from "./_stacked.ts";
import type { JointSpec } from "./spec.ts";

const quoted = (xs: readonly string[]) => xs.map((x) => `"${x}"`).join(", ");

/**
 * Lower and upper ends per global parameter from `within` (every copy of a
 * parameter gets its range).
 *
 * @throws {CellError} At `within` for a name that is not a parameter.
 */
export function rangeVectors(
  name: string,
  spec: JointSpec,
  model: Model,
  layout: Layout,
): { lower: Float64Array; upper: Float64Array } {
  const P = layout.names.length;
  const lower = new Float64Array(P).fill(-Infinity), upper = new Float64Array(P).fill(Infinity);
  for (const [k, [lo, hi]] of Object.entries(spec.within)) {
    const j = model.parameters.indexOf(k);
    if (j < 0) throw notParameter(name, "Range", k, model, ["within", k]);
    layout.parameter.forEach((pj, g) => {
      if (pj !== j) return;
      if (lo !== null) lower[g] = lo;
      if (hi !== null) upper[g] = hi;
    });
  }
  return { lower, upper };
}

/**
 * The start in the global layout.
 *
 * @throws {CellError} At `start` for a name that is not a parameter, a group
 *   that does not exist, one value per group for a shared parameter, a value
 *   outside its range, or when no start can be found for what is missing.
 */
export function startVector(
  name: string,
  spec: JointSpec,
  model: Model,
  groups: readonly Group[],
  layout: Layout,
  range: { lower: Float64Array; upper: Float64Array },
  seed: number,
  warn: (m: string) => void,
): Float64Array {
  const linear = isLinearIn(model.rhs, model.parameters);
  const params = model.parameters, labels = groups.map((g) => g.label);
  const shared = new Set(spec.shared);
  for (const [k, v] of Object.entries(spec.start)) {
    if (!params.includes(k)) throw notParameter(name, "Start value", k, model, ["start", k]);
    if (typeof v === "number") continue;
    if (shared.has(k)) {
      throw new CellError(
        `Start value of "${k}" in joint "${name}": "${k}" is shared, so it takes one number, not one per group`,
        ["start", k],
      );
    }
    for (const g of Object.keys(v)) {
      if (!labels.includes(g)) {
        throw new CellError(
          `Start value of "${k}" in joint "${name}" names group "${g}", which is not one of the groups${
            didYouMean(g, labels) || `: they are ${quoted(labels)}`
          }`,
          ["start", k, g],
        );
      }
    }
  }
  const x0 = Float64Array.from(layout.names, (_, i) => {
    const k = params[layout.parameter[i]], g = layout.group[i];
    const v = spec.start[k];
    return v === undefined
      ? NaN
      : typeof v === "number"
      ? v
      : g === null
      ? NaN
      : v[labels[g]] ?? NaN;
  });
  x0.forEach((v, i) => {
    if (v < range.lower[i] || v > range.upper[i]) {
      const k = params[layout.parameter[i]];
      throw new CellError(
        `Start value of "${layout.names[i]}" in joint "${name}" is ${v}: outside its range [${
          range.lower[i]
        }, ${range.upper[i]}]`,
        ["start", k],
      );
    }
  });
  const missing = layout.names.filter((_, i) => Number.isNaN(x0[i]));
  if (missing.length === 0) return x0;
  const pooled = pooledStart(name, spec, model, groups, range, layout, seed);
  x0.forEach((v, i) => {
    if (Number.isNaN(v)) x0[i] = pooled[layout.parameter[i]];
  });
  // A model linear in its parameters needs no start: the solution is unique whatever it is.
  if (linear) return x0;
  warn(
    `Start values of "${name}" for ${
      quoted(missing.length > 6 ? [...missing.slice(0, 5), "…"] : missing)
    } came from a fit of the pooled rows with every parameter shared (multi-start, seed ${seed}): give "start" values to choose the solution yourself`,
  );
  return x0;
}

function notParameter(
  name: string,
  what: string,
  k: string,
  model: Model,
  path: (string | number)[],
): CellError {
  return new CellError(
    `${what} of "${k}" in joint "${name}": "${k}" is not a parameter of the model${
      didYouMean(k, model.parameters) || `: its parameters are ${quoted(model.parameters)}`
    }`,
    path,
  );
}

/** Model-order estimates of the pooled fit (every parameter shared). */
function pooledStart(
  name: string,
  spec: JointSpec,
  model: Model,
  groups: readonly Group[],
  range: { lower: Float64Array; upper: Float64Array },
  layout: Layout,
  seed: number,
): Float64Array {
  const params = model.parameters;
  const n = groups.reduce((s, g) => s + g.data.n, 0);
  const columns = model.columns.map((_, c) => {
    const out = new Float64Array(n);
    let off = 0;
    for (const g of groups) (out.set(g.data.columns[c], off), off += g.data.n);
    return out;
  });
  const y = new Float64Array(n);
  let off = 0;
  for (const g of groups) (y.set(g.data.y, off), off += g.data.n);
  const fns = modelFunctions({ model, n, columns, y });
  // One range per model parameter: the first copy's (every copy has the same).
  const first = (j: number) => layout.parameter.indexOf(j);
  const lower = Float64Array.from(params, (_, j) => range.lower[first(j)]);
  const upper = Float64Array.from(params, (_, j) => range.upper[first(j)]);
  const given = Float64Array.from(params, (k) => {
    const v = spec.start[k];
    if (v === undefined) return NaN;
    if (typeof v === "number") return v;
    const xs = Object.values(v);
    return xs.reduce((s, x) => s + x, 0) / xs.length;
  });
  const complete = given.every((v) => !Number.isNaN(v));
  const run = complete
    ? lmder(fns.problem, given, { lower, upper })
    : multiStartOf(fns, given, { seed, lower, upper });
  if (run === null || !run.x.every(Number.isFinite)) {
    const missing = params.filter((_, j) => Number.isNaN(given[j]));
    throw new CellError(
      `Cannot fit "${name}": no start values found for ${
        quoted(missing.length > 0 ? missing : params)
      }: the model fitted to the pooled rows is not finite at any of the multi-start samples; give "start" values`,
      ["start"],
    );
  }
  return run.x;
}

function multiStartOf(
  fns: ModelFunctions,
  given: Float64Array,
  o: { seed: number; lower: Float64Array; upper: Float64Array },
) {
  return multiStart(fns.problem, given, { ...o, project: fns.project });
}
