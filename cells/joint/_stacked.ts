/**
 * The joint least-squares problem: every group's residuals stacked into one
 * vector, with one parameter vector holding the shared parameters once and
 * the others once per group. Each group is evaluated with its own compiled
 * model and exact derivatives (kernel/optim `modelFunctions`, one per group,
 * the compiled code shared by text); the stacked Jacobian is filled block by
 * block from them, so a row's derivative by another group's parameter is an
 * exact zero.
 *
 * ```
 *  θ = [ k | a[g1] a[g2] a[g3] ]        (k shared, a per group)
 *
 *          k      a[g1]  a[g2]  a[g3]
 *  g1 ┌ ∂f/∂k   ∂f/∂a     0      0   ┐   rows of group 1 (n₁)
 *  g2 │ ∂f/∂k     0     ∂f/∂a    0   │   rows of group 2 (n₂)
 *  g3 └ ∂f/∂k     0       0    ∂f/∂a ┘   rows of group 3 (n₃)
 * ```
 *
 * Memory: the Levenberg–Marquardt driver (kernel/optim `lmder`, MINPACK's
 * dense QR) takes J as one N×P array, so storage is N·P doubles (P = shared
 * + groups × per-group parameters) plus one group's n_g×p block; linear in
 * the rows for a given set of groups. Problems beyond {@link MAX_JACOBIAN}
 * doubles are refused in words. The block-angular structure would allow
 * less (a QR per block, then the shared columns; Björck 1996, *Numerical
 * Methods for Least Squares Problems*, §6.3, from memory); not done here.
 *
 * @module
 */
import type { LeastSquaresProblem, ModelFunctions, PolishProblem } from "../../kernel/optim/mod.ts";
import type { Group } from "./_groups.ts";

/** The largest stacked Jacobian held, in doubles (400 MB; common practice, no source). */
export const MAX_JACOBIAN = 50_000_000;

/** Which global parameter each group's copy of each model parameter is. */
export interface Layout {
  /** Global parameter names: `k` for a shared parameter, `a[g1]` for a group's own. */
  names: string[];
  /** The model parameter behind each global one (index into `model.parameters`). */
  parameter: number[];
  /** The group each global parameter belongs to; null when shared. */
  group: (number | null)[];
  /** Per group: model parameter j → its global index. */
  map: Int32Array[];
}

/**
 * Lays the parameters out in model order: a shared parameter once, any other
 * once per group (in group order).
 *
 * @param params The model's parameters, in order.
 * @param labels The groups' names, in order.
 * @param shared The shared parameters.
 * @returns The layout.
 * @example
 * ```ts
 * import { makeLayout } from "./_stacked.ts";
 * const l = makeLayout(["a", "k"], ["g1", "g2"], new Set(["k"]));
 * if (l.names.join() !== "a[g1],a[g2],k" || l.map[1].join() !== "1,2") throw new Error(l.names.join());
 * ```
 */
export function makeLayout(
  params: readonly string[],
  labels: readonly string[],
  shared: ReadonlySet<string>,
): Layout {
  const names: string[] = [], parameter: number[] = [], group: (number | null)[] = [];
  const map = labels.map(() => new Int32Array(params.length));
  params.forEach((p, j) => {
    if (shared.has(p)) {
      for (const m of map) m[j] = names.length;
      names.push(p);
      parameter.push(j);
      group.push(null);
      return;
    }
    labels.forEach((label, g) => {
      map[g][j] = names.length;
      names.push(`${p}[${label}]`);
      parameter.push(j);
      group.push(g);
    });
  });
  return { names, parameter, group, map };
}

/** What the optimizer, the polishing and the statistics call. */
export interface Stacked {
  /** Rows N (all groups). */
  m: number;
  /** Parameters P. */
  n: number;
  /** F = f − y over the stacked rows and the block-structured J. */
  problem: LeastSquaresProblem;
  /** y − f in double-double from the data as printed, and J. */
  accurate: PolishProblem;
  /** f(θ) over the stacked rows. */
  fitted(x: Float64Array): Float64Array;
  /** Where each group's rows start in the stacked vector (and N at the end). */
  offsets: number[];
}

/**
 * Builds the stacked problem.
 *
 * @param groups The groups, in order.
 * @param fns Each group's model functions.
 * @param layout The parameter layout.
 * @returns The stacked problem.
 */
export function stacked(
  groups: readonly Group[],
  fns: readonly ModelFunctions[],
  layout: Layout,
): Stacked {
  const p = groups[0].data.model.parameters.length, P = layout.names.length;
  const offsets = [0];
  for (const g of groups) offsets.push(offsets[offsets.length - 1] + g.data.n);
  const N = offsets[groups.length];
  const largest = Math.max(...groups.map((g) => g.data.n));
  const local = new Float64Array(largest * p);
  const theta = groups.map(() => new Float64Array(p));
  const thetaLo = groups.map(() => new Float64Array(p));
  /** Group g's parameters (and their low parts) from the global vector. */
  const spread = (x: Float64Array, g: number, out: Float64Array) => {
    const m = layout.map[g];
    for (let j = 0; j < p; j++) out[j] = x[m[j]];
    return out;
  };
  const jac = (x: Float64Array, fjac: Float64Array) => {
    fjac.fill(0); // lmder's QR overwrites J in place: every zero block is written again
    groups.forEach((grp, g) => {
      const n = grp.data.n, off = offsets[g], m = layout.map[g];
      fns[g].problem.jac(spread(x, g, theta[g]), local);
      for (let j = 0; j < p; j++) {
        const col = m[j] * N + off, from = j * n;
        for (let i = 0; i < n; i++) fjac[col + i] = local[from + i];
      }
    });
  };
  const problem: LeastSquaresProblem = {
    m: N,
    n: P,
    fcn(x, fvec) {
      groups.forEach((_, g) => {
        fns[g].problem.fcn(spread(x, g, theta[g]), fvec.subarray(offsets[g], offsets[g + 1]));
      });
    },
    jac,
  };
  const accurate: PolishProblem = {
    m: N,
    n: P,
    residuals(x, r, xlo) {
      let noise = 0;
      groups.forEach((_, g) => {
        noise += fns[g].accurate.residuals(
          spread(x, g, theta[g]),
          r.subarray(offsets[g], offsets[g + 1]),
          spread(xlo, g, thetaLo[g]),
        );
      });
      return noise;
    },
    jac,
  };
  return {
    m: N,
    n: P,
    problem,
    accurate,
    offsets,
    fitted(x) {
      const out = new Float64Array(N);
      groups.forEach((_, g) => out.set(fns[g].f(spread(x, g, theta[g])), offsets[g]));
      return out;
    },
  };
}
