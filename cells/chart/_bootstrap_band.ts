/**
 * The multiplier of a simultaneous bootstrap band of the mean: the sup-t
 * (max-t) band.
 *
 * Method (Davison & Hinkley, *Bootstrap Methods and their Application*,
 * 1997, §6.3 and §4.2 on simultaneous confidence sets; Efron & Tibshirani,
 * *An Introduction to the Bootstrap*, 1993, ch. 12 on bootstrap-t; from
 * memory for the sections): for each of the fit's B bootstrap replicates θ*_r
 *
 *     M_r = max over the grid of |f(x; θ*_r) − f(x; θ̂)| / se_fit(x)
 *
 * with se_fit the delta method's standard error at θ̂ (not recomputed per
 * replicate: the studentising scale is fixed, which keeps the band's shape
 * that of the delta band and its width set by the replicates). The band is
 * f̂ ± q·se_fit with q the order statistic M₍⌈(B+1)c⌉₎ (the same rank rule
 * as the fit's percentile limits, D&H eq. 5.18). Grid points where se_fit is
 * zero or not finite are left out of the max. A replicate whose curve is not
 * finite somewhere on the grid counts as M_r = ∞ (it widens, never narrows,
 * the band) and is said.
 *
 * The replicates are the fit's own (`Fit.bootstrap`, B×p row-major in the
 * order of `fit.parameters`), read structurally here: this module does not
 * depend on how the fit made them.
 *
 * @module
 */
import { compile } from "../../kernel/expr/mod.ts";
import type { Fit } from "../fit/fit.ts";
import type { Multiplier } from "./_band_quantiles.ts";

/** The bootstrap replicates a fit may carry, as the chart reads them. */
export interface BootstrapReplicates {
  /** B×p, row-major, in the order of `fit.parameters`. */
  replicates: Float64Array;
  /** B, the replicates kept. */
  b: number;
  resample: "residuals" | "cases";
  seed: number;
}

/**
 * The fit's bootstrap replicates when it carries a usable set, else null.
 *
 * @param fit The fit.
 * @returns The replicates, or null when absent or not B×p.
 */
export function bootstrapOf(fit: Fit): BootstrapReplicates | null {
  const b = (fit as { bootstrap?: Partial<BootstrapReplicates> }).bootstrap;
  if (b === undefined || b === null || !(b.replicates instanceof Float64Array)) return null;
  const count = b.b ?? 0;
  if (!(count >= 1) || b.replicates.length !== count * fit.parameters.length) return null;
  return b as BootstrapReplicates;
}

/** A sup-t multiplier and the replicates whose curve was not finite on the grid. */
export interface SupT extends Multiplier {
  /** ⌈(B+1)c⌉, the rank taken. */
  rank: number;
  /** Replicates counted as M = ∞. */
  nonFinite: number;
}

/**
 * The smallest B for which a level has a rank within the replicates: ⌈(B+1)c⌉ ≤ B.
 *
 * @param level c in (0, 1).
 * @returns The least B.
 * @example
 * ```ts
 * import { leastReplicates } from "./_bootstrap_band.ts";
 * if (leastReplicates(0.95) !== 19) throw new Error("⌈20·0.95⌉ = 19 ≤ 19");
 * ```
 */
export function leastReplicates(level: number): number {
  return Math.max(1, Math.ceil(level / (1 - level) - 1e-9));
}

/**
 * The sup-t multiplier from the replicates.
 *
 * @param fit The fit (its model and parameters).
 * @param boot Its replicates.
 * @param grid x values.
 * @param mean f(x; θ̂) on the grid, fitted scale.
 * @param se se_fit on the grid.
 * @param level c in (0, 1); needs B ≥ {@link leastReplicates}(c).
 * @returns q, its name, the rank taken and the replicates counted as ∞.
 */
export function supTMultiplier(
  fit: Fit,
  boot: BootstrapReplicates,
  grid: Float64Array,
  mean: Float64Array,
  se: Float64Array,
  level: number,
): SupT {
  const f = compile(fit.model.rhs, fit.model.columns, fit.parameters);
  const cols = fit.model.columns.map(() => grid);
  const p = fit.parameters.length, n = grid.length, B = boot.b;
  const used: number[] = [];
  for (let i = 0; i < n; i++) {
    if (se[i] > 0 && se[i] < Infinity && Number.isFinite(mean[i])) used.push(i);
  }
  const sup = new Float64Array(B);
  let nonFinite = 0;
  for (let r = 0; r < B; r++) {
    const star = f(cols, boot.replicates.subarray(r * p, (r + 1) * p), n);
    let m = 0;
    for (const i of used) {
      const t = Math.abs(star[i] - mean[i]) / se[i];
      if (!Number.isFinite(t)) {
        m = Infinity;
        break;
      }
      if (t > m) m = t;
    }
    if (m === Infinity) nonFinite++;
    sup[r] = m;
  }
  sup.sort();
  const rank = Math.ceil((B + 1) * level - 1e-9);
  return {
    q: sup[Math.min(rank, B) - 1],
    of: `order statistic ${rank} of ${B} of max |f* − f̂|/se_fit over the grid`,
    rank,
    nonFinite,
  };
}
