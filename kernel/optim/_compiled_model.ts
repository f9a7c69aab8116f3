/**
 * What a model compiles to, made once per model text and kept.
 *
 * Why: a nonlinear fit of 100 rows takes about a fifth of a millisecond,
 * and differentiating the model, generating the code of the model and of
 * its Jacobian and finding the parameters that enter linearly took about as
 * long again, every time the same model was fitted (every live update, every
 * run of a document). Everything kept here is a pure function of the model
 * (its text, the columns it uses, its parameters); no data is kept, so one
 * entry per model is safe to share between fits.
 *
 * ```
 *  key = [text, response column, columns, parameters]
 *     └▶ f (row loop), ∂f/∂θ (trees, and one row loop writing all p columns),
 *        the linear parameters, f and the response in double-double (on first use)
 * ```
 *
 * @module
 */
import {
  compile,
  compileColumns,
  type Compiled,
  type CompiledColumns,
  compileDD,
  type CompiledDD,
  derivative,
  type Expr,
  freeNames,
  isLinearIn,
  type Model,
} from "../expr/mod.ts";

/** Compiled models kept at most (the least recently used is dropped first). */
const LIMIT = 64;

/** A model's compiled forms (see the module doc). */
export interface CompiledModel {
  /** f(θ) per row. */
  f: Compiled;
  /** ∂f/∂θ_j per row into column j (n×p, column-major). */
  jac: CompiledColumns;
  /** The trees of ∂f/∂θ_j, in parameter order. */
  trees: Expr[];
  /** Indexes of the largest set of parameters the model is jointly linear in (may be empty). */
  linear: number[];
  /** f in double-double (compiled on first use). */
  fDD(): CompiledDD;
  /** The response's transform in double-double (compiled on first use). */
  responseDD(): CompiledDD;
}

const kept = new Map<string, CompiledModel>();

/**
 * The compiled forms of `model`, made on the first call for its text and kept.
 *
 * @param model The parsed model.
 * @returns Its compiled forms.
 * @example
 * ```ts
 * import { parseModel } from "../expr/mod.ts";
 * import { compiledModel } from "./_compiled_model.ts";
 * const a = compiledModel(parseModel("y = a*exp(-b*x)", ["x", "y"]));
 * const b = compiledModel(parseModel("y = a*exp(-b*x)", ["x", "y"]));
 * if (a !== b || a.linear.join() !== "0") throw new Error("one entry per model text");
 * ```
 */
export function compiledModel(model: Model): CompiledModel {
  const key = JSON.stringify([model.text, model.responseColumn, model.columns, model.parameters]);
  let c = kept.get(key);
  if (c !== undefined) {
    kept.delete(key); // most recently used goes last
    kept.set(key, c);
    return c;
  }
  c = compileModel(model);
  kept.set(key, c);
  if (kept.size > LIMIT) kept.delete(kept.keys().next().value!);
  return c;
}

function compileModel(model: Model): CompiledModel {
  const { rhs, columns, parameters: params } = model;
  const trees = params.map((k) => derivative(rhs, k));
  let fd: CompiledDD | undefined, yd: CompiledDD | undefined;
  return {
    f: compile(rhs, columns, params),
    jac: compileColumns(trees, columns, params),
    trees,
    linear: linearParameters(model, trees),
    fDD: () => fd ??= compileDD(rhs, columns, params),
    responseDD: () => yd ??= compileDD(model.response, [model.responseColumn], []),
  };
}

/**
 * The largest set L of parameters the model is jointly linear in (greedy:
 * those linear alone, dropping from the end until jointly linear).
 */
function linearParameters(model: Model, trees: Expr[]): number[] {
  const params = model.parameters;
  let L = params.filter((k, j) => !freeNames(trees[j]).has(k));
  while (L.length > 0 && !isLinearIn(model.rhs, L)) L = L.slice(0, -1);
  return L.map((k) => params.indexOf(k));
}
