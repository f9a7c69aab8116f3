/**
 * The RUN-JSON result of an `agreement` cell (docs/run-json.md,
 * "agreement"): plain JSON, every interval labelled with its method and
 * level as the fit labels its own, and the verdict in words.
 *
 * @module
 */
import { rowValues } from "../../kernel/arrays.ts";
import type { Agreement } from "./agreement.ts";
import type { Interval } from "./bland_altman.ts";
import { verdictOf } from "./verdict.ts";

/** An estimate with its labelled intervals. */
export interface Estimated {
  estimate: number;
  /** Standard error where the method gives one (Deming's jackknife, the bias's t). */
  std_error: number | null;
  intervals: Interval[];
}

/** The verdict: per question, what each regression's interval says. */
export interface AgreementVerdict {
  level: number;
  /** True: the intercept's interval excludes 0; null: no interval. */
  constant: { deming: boolean; passing_bablok: boolean | null };
  /** True: the slope's interval excludes 1. */
  proportional: { deming: boolean; passing_bablok: boolean | null };
  /** The cusum test: true when linearity holds, null when not tested. */
  linear: boolean | null;
  sentence: string;
}

/** The `agreement` result. */
export interface AgreementResult {
  x: string;
  y: string;
  sample: string | null;
  unit: string | null;
  y_unit: string | null;
  /** Samples compared (sample means with replicates) and rows read. */
  n: number;
  rows_used: number;
  replicated: boolean;
  confidence: number;
  errors: "constant" | "proportional";
  variance_ratio: {
    value: number;
    source: "given" | "replicates";
    /** With replicates: the pooled within-sample variances (relative with proportional errors). */
    x_variance: number | null;
    y_variance: number | null;
    df: number | null;
    replicated_samples: number | null;
  };
  deming: {
    weighted: boolean;
    iterations: number;
    df: number;
    intercept: Estimated;
    slope: Estimated;
  };
  passing_bablok: {
    intercept: Estimated;
    slope: Estimated;
    slopes: number;
    slopes_below_minus_one: number;
    ranks: [number, number];
    linearity: {
      method: "cusum";
      level: number;
      statistic: number;
      critical: number;
      p_value: number;
      above: number;
      below: number;
      linear: boolean;
    } | null;
  };
  agreement: {
    differences: "absolute" | "percent";
    unit: string | null;
    bias: Estimated;
    sd: number;
    share: number;
    z: number;
    lower: Estimated;
    upper: Estimated;
    within_variance: number | null;
    between_variance: number | null;
  };
  verdict: AgreementVerdict;
  /** Per used row: the pair's mean and difference, and the source row (the agreement plot). */
  means: number[];
  differences: number[];
  rows: number[];
  /** Per sample: the two methods' means (the regressions' points). */
  sample_x: number[];
  sample_y: number[];
}

const iv = (method: string, level: number, lo: number | null, hi: number | null): Interval => ({
  method,
  level,
  lower: lo,
  upper: hi,
});

/**
 * The RUN-JSON result.
 *
 * @param out The comparison.
 * @returns The result.
 */
export function summarizeAgreement(out: Agreement): AgreementResult {
  const d = out.deming, pb = out.passingBablok, ba = out.blandAltman, s = out.samples;
  const jack = `jackknife t (${d.df} df)`;
  const rank = "Passing–Bablok ranks";
  const unit = s.units.x ?? s.units.y;
  return {
    x: out.x,
    y: out.y,
    sample: out.sample,
    unit,
    y_unit: s.units.y,
    n: s.groups.length,
    rows_used: s.x.length,
    replicated: ba.replicated,
    confidence: out.level,
    errors: out.errors,
    variance_ratio: {
      value: out.ratio,
      source: out.replicates === null ? "given" : "replicates",
      x_variance: out.replicates?.xVariance ?? null,
      y_variance: out.replicates?.yVariance ?? null,
      df: out.replicates?.df ?? null,
      replicated_samples: out.replicates?.samples ?? null,
    },
    deming: {
      weighted: d.weighted,
      iterations: d.iterations,
      df: d.df,
      intercept: {
        estimate: d.intercept,
        std_error: d.seIntercept,
        intervals: [iv(jack, d.level, ...d.interceptCi)],
      },
      slope: {
        estimate: d.slope,
        std_error: d.seSlope,
        intervals: [iv(jack, d.level, ...d.slopeCi)],
      },
    },
    passing_bablok: {
      intercept: {
        estimate: pb.intercept,
        std_error: null,
        intervals: [iv(rank, pb.level, ...pb.interceptCi)],
      },
      slope: {
        estimate: pb.slope,
        std_error: null,
        intervals: [iv(rank, pb.level, ...pb.slopeCi)],
      },
      slopes: pb.slopes,
      slopes_below_minus_one: pb.below,
      ranks: pb.ranks,
      linearity: pb.cusum === null ? null : {
        method: "cusum",
        level: pb.level,
        statistic: pb.cusum.statistic,
        critical: pb.cusum.critical,
        p_value: pb.cusum.pValue,
        above: pb.cusum.above,
        below: pb.cusum.belowLine,
        linear: pb.cusum.linear,
      },
    },
    agreement: {
      differences: out.differences,
      unit: out.differences === "percent" ? "%" : unit,
      bias: {
        estimate: ba.bias,
        std_error: null,
        intervals: [ba.biasCi],
      },
      sd: ba.sd,
      share: ba.share,
      z: ba.z,
      lower: { estimate: ba.lower, std_error: null, intervals: [ba.lowerCi] },
      upper: { estimate: ba.upper, std_error: null, intervals: [ba.upperCi] },
      within_variance: ba.withinVariance,
      between_variance: ba.betweenVariance,
    },
    verdict: verdictOf(out),
    means: rowValues(out.means),
    differences: rowValues(out.diffs),
    rows: rowValues(s.rows),
    sample_x: rowValues(s.xMean),
    sample_y: rowValues(s.yMean),
  };
}
