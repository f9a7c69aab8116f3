/**
 * The multipliers q of a band f̂ ± q·se: pointwise and Scheffé-type.
 *
 * - Pointwise: q = t(1 − α/2; ν), ν the fit's residual degrees of freedom;
 *   z(1 − α/2) with known standard deviations (the covariance is not
 *   estimated). Each x on its own is covered with probability c = 1 − α.
 * - Simultaneous, Scheffé's S-method (Scheffé, *The Analysis of Variance*,
 *   1959, §3.5; from memory): for d directions of an estimated vector whose
 *   covariance is σ² times a known matrix, every linear combination at once
 *   is covered with probability c when q = √(d·F(c; d, ν)); with σ known,
 *   q = √χ²(c; d). For the mean of a straight line (d = 2) this is the
 *   Working–Hotelling band, W = √(2·F(c; 2, n − 2)) (Working & Hotelling
 *   1929; Neter, Kutner, Nachtsheim & Wasserman, *Applied Linear Statistical
 *   Models*, 4th ed., §2.6; from memory). For a nonlinear model it is the
 *   linearised form, on the tangent plane at θ̂ (approximate, as the delta
 *   method is).
 *
 * @module
 */
import { chiSquared, fisherF, standardNormal, studentT } from "../../kernel/stats/mod.ts";

/** A band's multiplier and how it was had, in words for the result. */
export interface Multiplier {
  /** q in f̂ ± q·se. */
  q: number;
  /** The quantile named, e.g. `t(0.975; 8)` or `√(2·F(0.95; 2, 8))`. */
  of: string;
}

/** A probability as written in a quantile's name: up to 6 significant digits, no trailing zeros. */
function prob(p: number): string {
  return String(Number(p.toPrecision(6)));
}

/**
 * The pointwise multiplier: t(1 − α/2; ν), or z(1 − α/2) with known σ.
 *
 * @param inference The fit's reference distribution ("normal" with known standard deviations).
 * @param df ν, the residual degrees of freedom.
 * @param level c in (0, 1).
 * @returns q and its name.
 * @example
 * ```ts
 * import { pointwiseMultiplier } from "./_band_quantiles.ts";
 * const m = pointwiseMultiplier("normal", 10, 0.95);
 * // z(0.975) = 1.959964 (NIST/SEMATECH e-Handbook §1.3.6.7.1).
 * if (Math.abs(m.q - 1.959964) > 1e-6 || m.of !== "z(0.975)") throw new Error(m.of);
 * ```
 */
export function pointwiseMultiplier(
  inference: "t" | "normal",
  df: number,
  level: number,
): Multiplier {
  const upper = (1 - level) / 2, p = prob(1 - upper);
  if (inference === "normal") return { q: standardNormal.upperQuantile(upper), of: `z(${p})` };
  return { q: studentT(df).upperQuantile(upper), of: `t(${p}; ${df})` };
}

/**
 * Scheffé's multiplier over `dims` directions: √(d·F(c; d, ν)), or √χ²(c; d) with known σ.
 *
 * @param inference The fit's reference distribution.
 * @param dims d, the dimension of the directions covered at once.
 * @param df ν, the residual degrees of freedom.
 * @param level c in (0, 1).
 * @returns q and its name.
 * @example
 * ```ts
 * import { scheffeMultiplier } from "./_band_quantiles.ts";
 * // One direction: Scheffé's q is the t quantile (F(c; 1, ν) = t(1 − α/2; ν)²; exact identity).
 * const m = scheffeMultiplier("t", 1, 12, 0.9);
 * if (Math.abs(m.q - 1.782288) > 1e-6) throw new Error(String(m.q));
 * ```
 */
export function scheffeMultiplier(
  inference: "t" | "normal",
  dims: number,
  df: number,
  level: number,
): Multiplier {
  const p = prob(level);
  if (inference === "normal") {
    return { q: Math.sqrt(chiSquared(dims).upperQuantile(1 - level)), of: `√χ²(${p}; ${dims})` };
  }
  return {
    q: Math.sqrt(dims * fisherF(dims, df).upperQuantile(1 - level)),
    of: `√(${dims}·F(${p}; ${dims}, ${df}))`,
  };
}
