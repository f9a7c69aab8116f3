/**
 * The value a `joint` cell gives: one model fitted to several groups of rows
 * at once, some parameters shared and the others per group.
 *
 * @module
 */
import type { CellOutput } from "../../kernel/contract/mod.ts";
import type { Model } from "../../kernel/expr/mod.ts";
import type { Likelihood } from "../fit/mod.ts";
import type { Layout } from "./_stacked.ts";
import type { SharingTest } from "./_sharing.ts";

/** One group as the result reports it. */
export interface JointGroup {
  /** The group's name: its table cell, or the grouping column's value. */
  label: string;
  /** The table cell its rows come from. */
  table: string;
  n: number;
  /** Σ residuals² over the group's rows at the joint estimates. */
  rss: number;
}

/** The statistics of the joint fit (pooled residuals). */
export interface JointStatistics extends Likelihood {
  n: number;
  p: number;
  dfResidual: number;
  rss: number;
  /** √(RSS/df). */
  sigma: number | null;
  stdErrors: (number | null)[];
  t: (number | null)[];
  pValues: (number | null)[];
  /** Wald t intervals at `confidence`. */
  intervals: ([number, number] | null)[];
  confidence: number;
  /** s²·(JᵀJ)⁻¹, P×P column-major (NaN rows and columns for a parameter at a range's end). */
  covariance: Float64Array;
  correlation: Float64Array;
}

/** Output of `joint`. */
export interface JointFit extends CellOutput {
  type: "JointFit";
  model: Model;
  /** The response as written (`log(y)`). */
  responseText: string;
  groups: JointGroup[];
  /** Each model parameter's unit (null: none or unknown), and the response's. */
  units: { parameters: (string | null)[]; response: string | null };
  /** The grouping column, when the groups are one table's rows split by it. */
  groupedBy: string | null;
  /** The shared parameters, in model order. */
  shared: string[];
  layout: Layout;
  estimates: Float64Array;
  atBound: boolean[];
  statistics: JointStatistics;
  sharing: SharingTest[];
  /** Per used row, groups in order. */
  fitted: Float64Array;
  residuals: Float64Array;
  /** Source row number of each used row. */
  rows: Int32Array;
  /** Where each group's rows start in `fitted`, `residuals`, `rows` (N at the end). */
  offsets: number[];
  iterations: number;
}
