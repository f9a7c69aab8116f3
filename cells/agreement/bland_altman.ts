/**
 * The agreement of two methods from their differences: the bias (mean
 * difference), the limits of agreement bias ± z·s that are to hold a share p
 * of the differences, and confidence intervals of all three.
 *
 * Sources:
 * - Bland & Altman 1986, "Statistical methods for assessing agreement
 *   between two methods of clinical measurement", Lancet i:307–310: the
 *   differences against the means, bias d̄, limits d̄ ± 1.96·s.
 * - Bland & Altman 1999, "Measuring agreement in method comparison
 *   studies", Stat. Methods Med. Res. 8:135–160 (section numbers from
 *   memory): the standard error of the bias s/√n and of a limit
 *   s·√(1/n + z²/(2(n − 1))), intervals ± t(n − 1) times it (§2); with
 *   replicates measured in pairs (§5), the variance of one difference is the
 *   between-sample component plus the within-sample one from a one-way
 *   analysis of variance of the differences by sample:
 *     s² = (MS_b − MS_w)/m₀ + MS_w,  m₀ = (N − Σmᵢ²/N)/(n − 1),
 *   the between part taken as 0 when MS_b < MS_w.
 * - With replicates the limits' intervals come from a bootstrap over samples
 *   (whole samples drawn with replacement, percentile limits, seeded from
 *   the document's seed), as Bland & Altman (2007, J. Biopharm. Stat.
 *   17:571–582) suggest for this case (from memory); the bias keeps its
 *   t interval with standard error √(MS_b/N).
 *
 * @module
 */
import { standardNormal, studentT } from "../../kernel/stats/mod.ts";
import { seededRandom } from "../../kernel/random.ts";

/** Resamples of the bootstrap over samples. */
export const RESAMPLES = 2000;

/** An interval as the agreement kind labels it. */
export interface Interval {
  method: string;
  level: number;
  lower: number | null;
  upper: number | null;
}

/** Bias and limits with their intervals. */
export interface BlandAltman {
  n: number;
  rows: number;
  replicated: boolean;
  bias: number;
  /** SD of one difference. */
  sd: number;
  /** z of the limits. */
  z: number;
  /** The share the limits are to hold. */
  share: number;
  lower: number;
  upper: number;
  biasCi: Interval;
  lowerCi: Interval;
  upperCi: Interval;
  /** With replicates: the within- and between-sample variances of the differences. */
  withinVariance: number | null;
  betweenVariance: number | null;
}

/** Bias and SD of one difference from rows grouped by sample. */
interface Spread {
  bias: number;
  variance: number;
  msBetween: number;
  msWithin: number;
  between: number;
}

/**
 * One-way analysis of variance of the differences by sample.
 *
 * @param d The differences, one per row.
 * @param groups The rows of each sample (indices into d).
 * @returns The bias, the variance of one difference and its parts.
 */
export function spreadOf(d: ArrayLike<number>, groups: readonly (readonly number[])[]): Spread {
  let N = 0, sum = 0, sumM2 = 0;
  for (const g of groups) {
    N += g.length;
    sumM2 += g.length * g.length;
    for (const r of g) sum += d[r];
  }
  const n = groups.length, bias = sum / N;
  let ssw = 0, ssb = 0;
  for (const g of groups) {
    let gs = 0;
    for (const r of g) gs += d[r];
    const gm = gs / g.length;
    for (const r of g) ssw += (d[r] - gm) ** 2;
    ssb += g.length * (gm - bias) ** 2;
  }
  const msWithin = N > n ? ssw / (N - n) : 0;
  const msBetween = ssb / (n - 1);
  const m0 = (N - sumM2 / N) / (n - 1);
  const between = Math.max(0, (msBetween - msWithin) / m0);
  return { bias, variance: between + msWithin, msBetween, msWithin, between };
}

/**
 * The agreement of two methods from their differences.
 *
 * @param d The differences, one per row (y − x, or percent of the pair's mean).
 * @param groups The rows of each sample; one row each without replicates.
 * @param share The share of differences the limits are to hold.
 * @param level The confidence level of the intervals.
 * @param seed The seed of the bootstrap over samples (replicates only).
 * @returns Bias, limits and their intervals.
 * @example
 * ```ts
 * import { blandAltman } from "./bland_altman.ts";
 * // d = 1, 2, 3, 4: bias 2.5, s = √(5/3) (exact arithmetic).
 * const r = blandAltman([1, 2, 3, 4], [[0], [1], [2], [3]], 0.95, 0.95, 1);
 * if (r.bias !== 2.5 || Math.abs(r.sd - Math.sqrt(5 / 3)) > 1e-15) throw new Error(JSON.stringify(r));
 * ```
 */
export function blandAltman(
  d: ArrayLike<number>,
  groups: readonly (readonly number[])[],
  share: number,
  level: number,
  seed: number,
): BlandAltman {
  const n = groups.length;
  const replicated = groups.some((g) => g.length > 1);
  const z = standardNormal.quantile((1 + share) / 2);
  const t = studentT(n - 1).quantile((1 + level) / 2);
  const sp = spreadOf(d, groups);
  const sd = Math.sqrt(sp.variance);
  const lower = sp.bias - z * sd, upper = sp.bias + z * sd;
  const rows = groups.reduce((s, g) => s + g.length, 0);
  if (!replicated) {
    const seBias = sd / Math.sqrt(n);
    const seLimit = sd * Math.sqrt(1 / n + (z * z) / (2 * (n - 1)));
    const tInterval = (centre: number, se: number): Interval => ({
      method: "t, Bland–Altman approximate standard error",
      level,
      lower: centre - t * se,
      upper: centre + t * se,
    });
    return {
      n,
      rows,
      replicated,
      bias: sp.bias,
      sd,
      z,
      share,
      lower,
      upper,
      biasCi: { ...tInterval(sp.bias, seBias), method: "t" },
      lowerCi: tInterval(lower, seLimit),
      upperCi: tInterval(upper, seLimit),
      withinVariance: null,
      betweenVariance: null,
    };
  }
  const seBias = Math.sqrt(sp.msBetween / rows);
  const boot = bootstrapLimits(d, groups, z, level, seed);
  return {
    n,
    rows,
    replicated,
    bias: sp.bias,
    sd,
    z,
    share,
    lower,
    upper,
    biasCi: {
      method: "t, between-sample mean square",
      level,
      lower: sp.bias - t * seBias,
      upper: sp.bias + t * seBias,
    },
    lowerCi: boot.lower,
    upperCi: boot.upper,
    withinVariance: sp.msWithin,
    betweenVariance: sp.between,
  };
}

/** Percentile intervals of both limits from whole samples drawn with replacement. */
function bootstrapLimits(
  d: ArrayLike<number>,
  groups: readonly (readonly number[])[],
  z: number,
  level: number,
  seed: number,
): { lower: Interval; upper: Interval } {
  const random = seededRandom(seed);
  const n = groups.length;
  const lo = new Float64Array(RESAMPLES), hi = new Float64Array(RESAMPLES);
  const drawn: (readonly number[])[] = new Array(n);
  for (let b = 0; b < RESAMPLES; b++) {
    for (let i = 0; i < n; i++) drawn[i] = groups[Math.floor(random() * n)];
    const sp = spreadOf(d, drawn);
    const s = Math.sqrt(sp.variance);
    lo[b] = sp.bias - z * s;
    hi[b] = sp.bias + z * s;
  }
  lo.sort();
  hi.sort();
  const method = `bootstrap over samples, percentile, ${RESAMPLES} resamples, seed ${seed}`;
  const q = (v: Float64Array, p: number) => v[Math.min(RESAMPLES - 1, Math.floor(p * RESAMPLES))];
  const a = (1 - level) / 2;
  return {
    lower: { method, level, lower: q(lo, a), upper: q(lo, 1 - a) },
    upper: { method, level, lower: q(hi, a), upper: q(hi, 1 - a) },
  };
}
